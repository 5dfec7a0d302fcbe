#!/usr/bin/env bash
# Times `gapwise demo` at several cohort sizes and bootstrap settings, to
# choose the demo's defaults (cmd/gapwise/demo.go: demoRows,
# demoIntervals).
#
#   testdata/bench/time-demo.sh [RUNS] ["ROWS REPLICATES FAST" ...]
#
# Defaults: 3 runs of each of the settings below. Each run prints wall
# clock, user and system CPU seconds and the load average before it; on a
# shared machine compare CPU seconds, and report the median wall time of
# runs at low load. Run from the repository root or anywhere inside it.
set -euo pipefail
cd "$(git -C "$(dirname "$0")" rev-parse --show-toplevel)"

runs=${1:-3}
shift || true
configs=("$@")
[ ${#configs[@]} -eq 0 ] && configs=("5000 100 false" "5000 200 false" "4000 200 false" "12000 100 true" "12000 100 false" "5000 0 false")

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
go build -o "$work/gapwise" ./cmd/gapwise
echo "gapwise $("$work/gapwise" --version | cut -d' ' -f2), $(nproc) CPUs"
for cfg in "${configs[@]}"; do
	read -r rows reps fast <<<"$cfg"
	for _ in $(seq "$runs"); do
		load=$(cut -d' ' -f1 /proc/loadavg 2>/dev/null || echo "?")
		/usr/bin/time -f "rows $rows, $reps replicates, fast $fast: %e s wall, %U s user, %S s sys (load $load)" \
			"$work/gapwise" demo --out "$work/demo" --force --rows "$rows" --intervals "$reps" --fast-intervals="$fast" >/dev/null
	done
done
