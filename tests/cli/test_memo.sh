#!/usr/bin/env bash
# The memo of cp.feshbach.overlap_density and max_efficiency (lua/bind/memo.h) never changes
# a result bit: a sweep of the demo plan (scripts/examples/sweep_tidewater.lua, 4 x 3
# points: the starting mixture, and so both results, the same at every point) on 2 jobs
# writes byte-identical files with the memo on (the default) and off
# (cp.feshbach.memo{enabled = false} at the top of the sweep file, run by every worker).
source "$(dirname "$0")/lib.sh"
top=$(cd "$(dirname "$0")/../.." && pwd)
cd "$tmp" || exit 1
for memo in on off; do
  {
    [ $memo = off ] && echo 'cp.feshbach.memo{enabled = false}'
    echo "local s = dofile('$top/scripts/examples/sweep_tidewater.lua')"
    echo 's.parameters[1].points, s.parameters[2].points = 4, 3'
    echo 'return s'
  } >sweep_$memo.lua
done
run "$coldprep" sweep sweep_on.lua --jobs 2 --out on.csv
checks=$((checks + 1))
[ "$rc" = 0 ] || fail MEMO-1 "the sweep with the memo failed"
run "$coldprep" sweep sweep_off.lua --jobs 2 --out off.csv
checks=$((checks + 1))
[ "$rc" = 0 ] || fail MEMO-1 "the sweep without the memo failed"
checks=$((checks + 1))
[ "$(wc -l <on.csv)" -eq 13 ] && grep -q ",true," on.csv && cmp -s on.csv off.csv ||
  fail MEMO-2 "the files differ or are short: $(diff on.csv off.csv | head -4)"
# the memo is used: one entry per function after two plans from the same mixture
run "$coldprep" -e "local s = dofile('$top/scripts/examples/sweep_tidewater.lua')
  s.evaluate{ramp_rate = 50, electric_field = 4e4}:run()
  s.evaluate{ramp_rate = 60, electric_field = 5e4}:run()
  print(cp.feshbach.memo().size, cp.feshbach.memo{enabled = false}.size)"
checks=$((checks + 1))
[ "$out" = "2	0" ] || fail MEMO-3 "memo sizes '$out' (want 2 then 0)"
finish
