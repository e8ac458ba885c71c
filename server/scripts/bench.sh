#!/usr/bin/env bash
# npm run bench: the same set-up as npm start (PostgreSQL via lib.sh), then the benchmark runner, which
# makes and drops its own database. With 2+ CPUs the load generator runs on CPU 1 and servers on CPU 0.
source "$(dirname "$0")/lib.sh"
ensure_node_modules
ensure_postgres
export BENCH_ADMIN_URL="$MIGRATION_DATABASE_URL"
if [[ "$(nproc)" -ge 2 ]] && command -v taskset >/dev/null; then
  exec taskset -c 1 node_modules/.bin/tsx tests/bench/run.ts "$@"
fi
exec node_modules/.bin/tsx tests/bench/run.ts "$@"
