#!/usr/bin/env bash
# The memo of cp.feshbach.overlap_density and max_efficiency (lua/bind/memo.h), and under the
# same switch the tables of cp.collisions.shielded and the transfer stage's Raman results,
# never change a result bit: a sweep of the demo plan (scripts/examples/sweep_tidewater.lua, 4 x 3
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
# the transfer stage computes the Raman result once per pulse while the memo is on: count
# the calls of cp.raman.transfer for three stages (two pulses alike, one different), then
# again with the memo off; the different pulse gets its own result
run "$coldprep" -e "local calls, raman = 0, cp.raman.transfer
  cp.raman.transfer = function(p) calls = calls + 1; return raman(p) end
  local function stage(rabi) return cp.stages.transfer{rabi_pump = rabi, rabi_stokes = 2*math.pi*5e6,
    width = 8e-6, delay = 7e-6, gamma = 2*math.pi*6e6} end
  local a, b, c = stage(2*math.pi*3e6), stage(2*math.pi*3e6), stage(2*math.pi*1e6)
  local on = calls
  cp.feshbach.memo{enabled = false}
  calls = 0
  stage(2*math.pi*3e6); stage(2*math.pi*3e6)
  print(on, calls, cp.feshbach.memo().enabled)"
checks=$((checks + 1))
[ "$out" = "2	2	false" ] || fail MEMO-4 "cp.raman.transfer calls '$out' (want 2 with the memo, 2 without)"
finish
