#!/usr/bin/env bash
# npm test [unit|api|e2e|reliability]: the same set-up as npm start against a fresh test database per run,
# then every suite in one vitest run; ends with one line "N passed, N failed" (also when set-up fails).
cd "$(dirname "$0")/../.."
REPORT=.data/vitest-report.json

fail_setup() {
  echo "Set-up failed before any test ran: $1"
  echo "0 passed, 1 failed"
  exit 1
}

# `set -e` does not apply inside `if`/`||` contexts, so every step is checked explicitly.
source server/scripts/lib.sh || fail_setup "could not read server/scripts/lib.sh"
set +e
ensure_node_modules || fail_setup "npm ci failed"
PG_WAS_RUNNING=0
bash server/scripts/pg.sh status >/dev/null 2>&1 && PG_WAS_RUNNING=1
ensure_postgres || fail_setup "PostgreSQL did not start (see $(bash server/scripts/pg.sh root)/server.log)"
bash server/scripts/pg.sh status >/dev/null 2>&1 || fail_setup "PostgreSQL is not answering"
if [[ ! -x /usr/bin/chromium ]]; then
  say "Installing Debian's chromium for the browser tests (one time)..."
  { apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium; } >&2 || fail_setup "could not install chromium"
fi
if ! command -v pdftoppm >/dev/null; then
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq poppler-utils >&2 || fail_setup "could not install poppler-utils"
fi

case "${1:-all}" in
  unit) DIRS=(tests/unit) ;;
  api) DIRS=(tests/api) ;;
  e2e) DIRS=(tests/e2e) ;;
  reliability) DIRS=(tests/reliability) ;;
  *) DIRS=(tests) ;;
esac
mkdir -p .data
rm -f "$REPORT"
node_modules/.bin/vitest run "${DIRS[@]}" --reporter=default --reporter=json --outputFile.json="$REPORT"
code=$?

# Stop what this run started; a cluster that was already running (npm start) is left alone.
if (( ! PG_WAS_RUNNING )); then bash server/scripts/pg.sh stop >/dev/null 2>&1; fi

line="$(node -e '
  const r = require(process.argv[1]);
  const failed = r.numFailedTests + (r.numRuntimeErrorTests ?? 0);
  // A run that failed without a failing test (set-up error, unhandled error) still counts as one failure.
  console.log(`${r.numPassedTests} passed, ${failed || (Number(process.argv[2]) ? 1 : 0)} failed`);
' "$PWD/$REPORT" "$code" 2>/dev/null)"
[[ -n "$line" ]] || { line="0 passed, 1 failed"; code=1; }
echo "$line"
exit $code
