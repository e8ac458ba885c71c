#!/usr/bin/env bash
# npm run dev: API with reload on 5180 and Vite's dev server on 5173 (proxying /api).
source "$(dirname "$0")/lib.sh"
load_env_file
ensure_node_modules
ensure_postgres
ensure_session_secret
migrate
export HOST=127.0.0.1 PORT="${PORT:-5180}" PUBLIC_BASE_URL="${PUBLIC_BASE_URL:-http://127.0.0.1:5173}" DEMO_MODE="${DEMO_MODE:-true}"
if [[ "$DEMO_MODE" == "true" ]]; then node_modules/.bin/tsx server/scripts/seed.ts >&2; fi
node_modules/.bin/tsx watch server/index.ts &
API=$!
trap 'kill $API 2>/dev/null' EXIT
node_modules/.bin/vite
