#!/usr/bin/env bash
# Times `gapwise decompose` on a synthetic benchmark cohort.
#
#   testdata/bench/time-cli.sh [ROWS] [K...]
#
# Defaults: 200000 rows, K = 8 mechanisms. For each K it generates the
# cohort with cmd/gapwise-benchcohort (fairness/synth.BenchTable), builds
# gapwise, and times `decompose --format json` with hyperfine when present
# (3 runs), otherwise once with /usr/bin/time -v (wall clock, CPU and peak
# memory). decompose adds its default intervals (50 bootstrap refits);
# DECOMPOSE_FLAGS adds flags, e.g. DECOMPOSE_FLAGS="--intervals 0" for the
# point estimate alone. Run from the repository root or anywhere inside it.
set -euo pipefail
cd "$(git -C "$(dirname "$0")" rev-parse --show-toplevel)"

rows=${1:-200000}
shift || true
ks=("$@")
[ ${#ks[@]} -eq 0 ] && ks=(8)

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
go build -o "$work/gapwise" ./cmd/gapwise
echo "gapwise $("$work/gapwise" --version | cut -d' ' -f2), $(nproc) CPUs, GOMAXPROCS=${GOMAXPROCS:-default}"

for k in "${ks[@]}"; do
	dir="$work/k$k"
	go run ./cmd/gapwise-benchcohort -rows "$rows" -k "$k" -out "$dir"
	echo "== $rows rows, $k mechanisms ($(du -h "$dir/cohort.csv" | cut -f1) CSV)"
	cmd="$work/gapwise decompose --spec $dir/spec.yaml --format json ${DECOMPOSE_FLAGS:-}"
	if command -v hyperfine >/dev/null 2>&1; then
		hyperfine --warmup 1 --runs 3 --output=null "$cmd"
	elif [ -x /usr/bin/time ]; then
		/usr/bin/time -v $cmd >/dev/null 2>"$work/time.txt" || { cat "$work/time.txt" >&2; exit 1; }
		grep -E 'Elapsed \(wall clock\)|Maximum resident set size|User time|System time' "$work/time.txt"
	else
		time $cmd >/dev/null
	fi
done
