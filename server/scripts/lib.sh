#!/usr/bin/env bash
# Shared set-up for start, dev and test: dependencies, PostgreSQL, settings, migrations.
# Each step returns non-zero on failure, also where a caller has turned `set -e` off.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/../.."

say() { printf '\033[1m%s\033[0m\n' "$*" >&2; }

ensure_node_modules() {
  # Reinstall when node_modules is missing or older than the lockfile.
  if [[ ! -d node_modules || ! -f node_modules/.package-lock.json || package-lock.json -nt node_modules/.package-lock.json ]]; then
    say "Installing packages (npm ci)..."
    npm ci --no-audit --no-fund --loglevel=error >&2 || return 1
  fi
}

ensure_postgres() {
  say "Starting PostgreSQL on 127.0.0.1..."
  bash server/scripts/pg.sh start >&2 || return 1
  export MIGRATION_DATABASE_URL="$(bash server/scripts/pg.sh url)"
  export DATABASE_URL="${DATABASE_URL:-$(bash server/scripts/pg.sh runtime-url)}"
}

ensure_session_secret() {
  mkdir -p .data
  if [[ ! -s .data/session-secret ]]; then
    (umask 077; node -e 'process.stdout.write(require("crypto").randomBytes(48).toString("base64url"))' > .data/session-secret)
  fi
  export SESSION_SECRET="${SESSION_SECRET:-$(cat .data/session-secret)}"
}

load_env_file() {
  if [[ -f .env ]]; then set -a; source .env; set +a; fi
}

migrate() {
  say "Applying database migrations..."
  node_modules/.bin/tsx server/scripts/migrate.ts >&2 || return 1
}
