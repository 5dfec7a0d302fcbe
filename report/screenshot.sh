#!/bin/sh
# Regenerates the pictures of the demo report under docs/:
#
#   sh report/screenshot.sh            (from the repository root)
#
#   docs/demo-report.png          the first screen at desktop width (1280 px):
#                                 the question, the overview, the warnings
#   docs/demo-report-phone.png    the top of the page at phone width (400 px)
#   docs/demo-print-*.png         printed pages (PDF from Chromium, pages
#                                 drawn by pdftoppm): the first page, the one
#                                 with the contribution chart, the one with
#                                 the diagnostics table
#
# It builds the synthetic demo with `gapwise demo` into a temporary folder
# and captures its report.html with headless Chromium (apt-get install -y
# chromium poppler-utils), with networking cut off. Chromium's window is at
# least 500 px wide, so the phone picture shows the page in a 400 px frame.
set -eu
cd "$(dirname "$0")/.."
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
go run ./cmd/gapwise demo --out "$tmp/demo" >/dev/null
chromium=${GAPWISE_CHROMIUM:-$(command -v chromium || command -v chromium-browser || echo /usr/bin/chromium)}
shoot() {
	"$chromium" --headless --no-sandbox --disable-gpu --disable-background-networking \
		--no-first-run --disable-component-update --disable-sync --disable-extensions \
		--host-resolver-rules='MAP * ~NOTFOUND' --user-data-dir="$tmp/profile" \
		--virtual-time-budget=8000 --hide-scrollbars "$@" 2>/dev/null
}
mkdir -p docs
rm -f docs/demo-print-*.png

shoot --window-size=1280,1500 --screenshot="$PWD/docs/demo-report.png" "file://$tmp/demo/report.html"

cat >"$tmp/phone.html" <<'EOF'
<!DOCTYPE html><html><body style="margin:0;background:#3a3d44">
<iframe src="demo/report.html" width="400" height="2400" style="display:block;margin:0 auto;border:0"></iframe>
</body></html>
EOF
shoot --window-size=500,2400 --screenshot="$PWD/docs/demo-report-phone.png" "file://$tmp/phone.html"

shoot --window-size=1280,900 --no-pdf-header-footer --print-to-pdf="$tmp/report.pdf" "file://$tmp/demo/report.html"
pages=$(pdfinfo "$tmp/report.pdf" | awk '/^Pages:/ {print $2}')
first_with() { # the first page whose text holds $1
	i=1
	while [ "$i" -le "$pages" ]; do
		if pdftotext -f "$i" -l "$i" "$tmp/report.pdf" - | grep -q "$1"; then
			echo "$i"
			return
		fi
		i=$((i + 1))
	done
	echo 1
}
page() { # page number, name
	pdftoppm -r 60 -png -singlefile -f "$1" -l "$1" "$tmp/report.pdf" "docs/demo-print-$2"
}
page 1 overview
page "$(first_with 'percentage points (pts)')" contributions
page "$(first_with 'Worst-fifth mean ratio')" diagnostics
echo "wrote docs/demo-report.png, docs/demo-report-phone.png and docs/demo-print-*.png ($pages printed pages)"
