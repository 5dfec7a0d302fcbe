#!/bin/sh
# Regenerates docs/demo-report.png, the README's picture of the demo report:
#
#   sh report/screenshot.sh            (from the repository root)
#
# It builds the synthetic demo with `gapwise demo` into a temporary folder
# and captures the top of its report.html with headless Chromium
# (apt-get install -y chromium), with networking cut off.
set -eu
cd "$(dirname "$0")/.."
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
go run ./cmd/gapwise demo --out "$tmp/demo" >/dev/null
chromium=${GAPWISE_CHROMIUM:-$(command -v chromium || command -v chromium-browser || echo /usr/bin/chromium)}
mkdir -p docs
"$chromium" --headless --no-sandbox --disable-gpu --disable-background-networking \
  --no-first-run --disable-component-update --disable-sync --disable-extensions \
  --host-resolver-rules='MAP * ~NOTFOUND' --user-data-dir="$tmp/profile" \
  --virtual-time-budget=5000 --hide-scrollbars --window-size=1280,2750 \
  --screenshot="$PWD/docs/demo-report.png" "file://$tmp/demo/report.html" 2>/dev/null
echo "wrote docs/demo-report.png"
