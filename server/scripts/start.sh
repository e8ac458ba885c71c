#!/usr/bin/env bash
# npm start: install what is missing, start PostgreSQL, migrate, load the demo once, build, serve.
source "$(dirname "$0")/lib.sh"
load_env_file
ensure_node_modules
ensure_postgres
ensure_session_secret
migrate
export HOST="${HOST:-127.0.0.1}" PORT="${PORT:-5180}"
export PUBLIC_BASE_URL="${PUBLIC_BASE_URL:-http://$HOST:$PORT}"
export DEMO_MODE="${DEMO_MODE:-true}" NODE_ENV="${NODE_ENV:-production}"
if [[ "$DEMO_MODE" == "true" ]]; then node_modules/.bin/tsx server/scripts/seed.ts >&2; fi
say "Building the client..."
node_modules/.bin/vite build --logLevel warn >&2
exec node_modules/.bin/tsx server/index.ts
