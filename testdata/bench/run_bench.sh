#!/usr/bin/env bash
# Speed benchmarks, side by side in one run (not part of the CI tests):
#   1. the leapfrog for 1000 test bodies: ../shared/bench/leapfrog.c built
#      with gcc -O2 against the same problem through the public Go path
#      (gobench leapfrog), checksums compared to 1e-9, best of 5 each;
#   2. the Mercury-like 1PN precession to 1e-6: SciPy solve_ivp (DOP853,
#      mercury_dop853.py with Debian's /usr/bin/python3) against the Go
#      methods (gobench mercury);
#   3. go test -bench: force evaluations per second per kernel, steps per
#      second for 1..1e5 test bodies, massive-body scaling, Mercury per method;
#   4. time per step against body counts with fitted exponents;
#   5. the error-against-step plot, error_vs_step.png (gonum/plot, in the
#      separate module testdata/bench/plot).
# Timings on a shared machine are noisy: read the ratios, run it twice.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(cd "$here/../.." && pwd)"
shared="${SHARED:-$root/../shared}"
[ -f "$shared/bench/leapfrog.c" ] || shared=/work/shared
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
cd "$root"

echo "== building"
gcc -O2 -o "$tmp/leapfrog_c" "$shared/bench/leapfrog.c" -lm
go build -o "$tmp/gobench" ./testdata/bench/gobench

echo "== 1. leapfrog, 1000 test bodies, 20000 steps (C gcc -O2 vs Go public path)"
best_c=0; best_go=0
for i in 1 2 3 4 5; do
  "$tmp/leapfrog_c" 1000 20000 >"$tmp/c.out"
  "$tmp/gobench" leapfrog 1000 20000 >"$tmp/go.out"
  c=$(awk '/body_steps_per_s/{print $2}' "$tmp/c.out"); g=$(awk '/body_steps_per_s/{print $2}' "$tmp/go.out")
  best_c=$(awk -v a="$best_c" -v b="$c" 'BEGIN{print (b>a)?b:a}')
  best_go=$(awk -v a="$best_go" -v b="$g" 'BEGIN{print (b>a)?b:a}')
done
cs_c=$(awk '/checksum/{print $2}' "$tmp/c.out"); cs_go=$(awk '/checksum/{print $2}' "$tmp/go.out")
echo "C  checksum $cs_c  best $best_c body-steps/s"
echo "Go checksum $cs_go  best $best_go body-steps/s"
awk -v a="$cs_c" -v b="$cs_go" 'BEGIN{d=a-b; if(d<0)d=-d; printf "checksum difference %.3g (%s 1e-9)\n", d, (d<=1e-9)?"within":"NOT within"; exit (d<=1e-9)?0:1}'
awk -v c="$best_c" -v g="$best_go" 'BEGIN{printf "ratio C/Go time per body-step: Go takes %.3fx the C time\n", c/g}'

echo "== 2. Mercury-like 1PN precession to 1e-6 (SciPy DOP853 vs Go)"
/usr/bin/python3 "$here/mercury_dop853.py" | tee "$tmp/py.out"
"$tmp/gobench" mercury | tee "$tmp/gom.out"
py=$(sed -n 's/.*seconds=\([^ ]*\).*/\1/p' "$tmp/py.out")
gos=$(sed -n 's/^go_best method=\([^ ]*\) seconds=\([^ ]*\)/\1 \2/p' "$tmp/gom.out")
y6=$(awk '$1=="yoshida6"{for(i=1;i<=NF;i++) if($i ~ /^seconds=/){sub("seconds=","",$i); print $i}}' "$tmp/gom.out")
awk -v p="$py" -v g="${gos#* }" -v m="${gos% *}" -v y="$y6" 'BEGIN{
  printf "ratio SciPy/Go (best Go method %s): %.0fx\n", m, p/g
  if (y != "") printf "ratio SciPy/Go (yoshida6 on gr1pn itself, by difference): %.0fx\n", p/y }'

echo "== 3. go test -bench"
go test ./integrator/ -run '^$' -bench 'Force|Steps|Massive|Mercury|LeapfrogReference' -benchtime 0.2s 2>&1 | grep -E '^(Benchmark|ok|FAIL)'

echo "== 4. scaling"
"$tmp/gobench" scaling

echo "== 5. error against step -> testdata/bench/error_vs_step.png"
"$tmp/gobench" errstep >"$tmp/errstep.csv"
(cd "$here/plot" && go run . "$here/error_vs_step.png") <"$tmp/errstep.csv"
echo "written $here/error_vs_step.png"
