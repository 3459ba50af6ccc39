#!/usr/bin/env bash
# Browser tests, screenshots and the in-browser benchmark, against the built
# site in dist/ served on 127.0.0.1 at a free port (started and stopped here).
# Usage: scripts/e2e.sh [screenshots|bench]   (make e2e / screenshots / bench-web)
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PWD/node_modules/.bin:$PATH"

mode="${1:-test}"
[ -f dist/index.html ] || { echo "e2e: dist/ is missing; run make dist" >&2; exit 1; }
[ -x /usr/bin/chromium ] || { echo "e2e: /usr/bin/chromium is missing; run scripts/setup.sh browser" >&2; exit 1; }

log="$(mktemp)"
node tests/e2e/serve.mjs dist >"$log" 2>&1 &
server=$!
trap 'kill "$server" 2>/dev/null || true; rm -f "$log"' EXIT
for _ in $(seq 1 50); do
  grep -q '^serving ' "$log" && break
  sleep 0.1
done
url="$(sed -n 's/^serving //p' "$log")/"
[ "$url" != "/" ] || { echo "e2e: the static server did not start:" >&2; cat "$log" >&2; exit 1; }
export KNEEPOINT_URL="$url"
echo "e2e: site at $url"

case "$mode" in
  test) node --test --test-concurrency=1 tests/e2e/ ;;
  screenshots) node tests/e2e/screenshots.mjs docs/screenshots ;;
  bench) node tests/e2e/bench.mjs ;;
  *) echo "e2e: unknown mode '$mode' (use: screenshots, bench)" >&2; exit 2 ;;
esac
