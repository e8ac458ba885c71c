#!/usr/bin/env bash
# npm test [unit|api|e2e|reliability]: the same set-up as npm start against a fresh test database per run,
# then every suite in one vitest run; ends with one line "N passed, N failed".
cd "$(dirname "$0")/../.."
REPORT=.data/vitest-report.json
summary_from_report() {
  node -e 'const r=require(process.argv[1]);console.log(`${r.numPassedTests} passed, ${r.numFailedTests+(r.numRuntimeErrorTests??0)} failed`)' "$PWD/$REPORT" 2>/dev/null
}
setup() {
  source server/scripts/lib.sh
  ensure_node_modules
  ensure_postgres
  if [[ ! -x /usr/bin/chromium ]]; then
    say "Installing Debian's chromium for the browser tests (one time)..."
    apt-get update -qq >&2 && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >&2
  fi
  if ! command -v pdftoppm >/dev/null; then
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq poppler-utils >&2 || true
  fi
}
if ! ( setup ); then
  echo "Set-up failed before any test ran."
  echo "0 passed, 1 failed"
  exit 1
fi
export MIGRATION_DATABASE_URL="$(bash server/scripts/pg.sh url)"
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
line="$(summary_from_report)"
if [[ -z "$line" ]]; then line="0 passed, 1 failed"; code=1; fi
echo "$line"
exit $code
