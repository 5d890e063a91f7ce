#!/usr/bin/env bash
# Renders the grower report of the first shipped scenario in headless Chromium and fails if the
# picture is missing or blank. Also prints it to PDF (the print layout) when asked with
# REPORT_PDF=1. Run from the repository root: bash .ci/report-check.sh
set -euo pipefail

cd "$(dirname "$0")/.."
out=target/report-check
mkdir -p "$out"

# The release binary (CI has built it already; this is a no-op then).
cargo build --release -p leafwind-app --bin leafwind

scenario=$(ls scenarios/*.ron | sort | head -n 1)
rm -f "$out"/*.html "$out"/*.csv "$out"/report.png "$out"/report.pdf "$out"/page-*.png
./target/release/leafwind report "$scenario" --out "$out"
test -s "$out/report.html" || { echo "report-check: no report.html"; exit 1; }

# Debian packages, installed only when missing (root on CI and developer machines).
need=()
command -v chromium >/dev/null 2>&1 || need+=(chromium)
[ -x /usr/bin/convert ] || need+=(imagemagick)
if [ "${REPORT_PDF:-0}" = 1 ] && ! command -v pdftoppm >/dev/null 2>&1; then need+=(poppler-utils); fi
if [ ${#need[@]} -gt 0 ]; then
    apt-get update -qq
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${need[@]}"
fi

html="file://$(pwd)/$out/report.html"
profile=$(mktemp -d)
trap 'rm -rf "$profile"' EXIT
chrome=(chromium --headless --no-sandbox --disable-gpu --disable-quic --no-first-run
    --disable-background-networking --disable-component-update --disable-sync
    --user-data-dir="$profile")

"${chrome[@]}" --screenshot="$out/report.png" --window-size=1240,1754 "$html" >/dev/null 2>&1 || true
test -s "$out/report.png" || { echo "report-check: Chromium wrote no report.png"; exit 1; }

# ImageMagick's real binary (a /usr/local/bin/convert on these machines may be a stand-in).
sd=$(/usr/bin/convert "$out/report.png" -colorspace Gray -format '%[fx:standard_deviation]' info:)
echo "report-check: report.png grey standard deviation $sd"
awk -v s="$sd" 'BEGIN { exit !(s > 0.02) }' || { echo "report-check: report.png is blank"; exit 1; }

if [ "${REPORT_PDF:-0}" = 1 ]; then
    "${chrome[@]}" --no-pdf-header-footer --print-to-pdf="$out/report.pdf" "$html" >/dev/null 2>&1 || true
    test -s "$out/report.pdf" || { echo "report-check: Chromium wrote no report.pdf"; exit 1; }
    pdftoppm -png -r 60 "$out/report.pdf" "$out/page"
    echo "report-check: $(ls "$out"/page-*.png | wc -l) printed pages in $out"
fi
echo "report-check: ok ($out/report.png)"
