#!/usr/bin/env bash
# Ctrl-C inside long C computations: cp.lattice.bands with 200 bands at 5000
# quasimomenta in a 4001-state basis and cp.raman.lineshape with a million points run for
# minutes, cp.thermo.lattice_filling of bosons with a Hubbard U of 1e-9 k_B T for ten
# seconds, cp.feshbach.max_efficiency with ten million samples for seconds,
# cp.lattice.wannier at 1e4 E_r with 1e5 points for about a second (each asked for
# with allow_long = true: their work estimates refuse them otherwise); the first Ctrl-C
# must stop them within 0.2 s (the core polls the flag the SIGINT handler sets), in the
# session on a terminal (cli_pty's `within 200`, timed from the Ctrl-C) and in a script
# (SIGINT sent by kill); the session goes on afterwards.  CANCEL-5: an optimisation (cp.optimize
# of a slow Lua objective, and cp.optim.nmsimplex) stops as fast and its message reports the
# best point found so far.  CANCEL-6: `coldprep sweep` on a terminal: the first Ctrl-C stops
# the points in progress (one in Lua code, one in a C band scan) within 0.2 s, every finished
# row stays on disk (in the file or the journal), and --resume completes a file
# byte-identical to an uninterrupted run.
source "$(dirname "$0")/lib.sh"
[ -x "$cli_pty" ] || { echo "usage: $0 COLDPREP CLI_PTY (the pty driver is missing)" >&2; exit 1; }
cd "$tmp" || exit 1
export TERM=dumb INPUTRC=/dev/null

filling='cp.thermo.lattice_filling{number = 1e12, mass = 2.1e-25, statistics = "boson", temperature = 5e-9, depth_er = 40, wavelength = 1064e-9, envelope_omega_bar = 1e6, onsite_u = 1e-40, allow_long = true}'
bands='cp.lattice.bands{depth_er = 10, bands = 200, points = 5000, basis = 4001, allow_long = true}'
sampling='cp.feshbach.max_efficiency{temperature = 200e-9, samples = 10000000, allow_long = true, a = {atom = "87Rb", t_over_tc = 1.2, omega_x = 628, omega_y = 628, omega_z = 628}, b = {atom = "40K", t_over_tf = 0.3, omega_x = 628, omega_y = 628, omega_z = 628}}'
wannier='cp.lattice.wannier{depth_er = 1e4, points = 100000, allow_long = true}'
shape='cp.raman.lineshape{rabi_pump = 2*math.pi*5e6, rabi_stokes = 2*math.pi*5e6, width = 3e-6, delay = 3e-6, gamma = 2*math.pi*6e6, from = -2*math.pi*1e6, to = 2*math.pi*1e6, points = 1000000, allow_long = true}'

# pty ID < SCRIPT: a terminal session played from SCRIPT.
pty() {
  run "$cli_pty" -t 30 -- "$coldprep"
  checks=$((checks + 1))
  [ "$rc" = 0 ] || fail "$1" "terminal session failed (see stderr)"
}

# interrupt ID CALL MS WITHIN [AFTER]: in a terminal session, a Ctrl-C MS ms into
# `r = CALL` prints WITHIN within 0.2 s (then AFTER, when given); the session goes on with
# r unset.
interrupt() {
  pty "$1" <<EOF
expect coldprep> 
send r = $2\r
sleep $3
send \x03
within 200 $4
${5:+expect $5}
expect coldprep> 
send print("still " .. "here", r)\r
expect still here	nil
expect coldprep> 
send \x04
exit 0
EOF
}

for case in "CANCEL-1 bands:$bands" "CANCEL-1 wannier:$wannier" "CANCEL-1 filling:$filling" "CANCEL-2 lineshape:$shape" "CANCEL-4 sampling:$sampling"; do
  interrupt "${case%% *}" "${case#*:}" 700 interrupted
done

# CANCEL-5: optimisations.  Each evaluation burns about 1 ms in a Lua loop; the optimum
# of the bowl is (2, 1) (by inspection), found long before the Ctrl-C.
slow='local s = 0 for i = 1, 2e5 do s = s + i end'
optimize="cp.optimize{parameters = {{name = 'x', min = 0, max = 3}, {name = 'y', min = 0, max = 3}}, evaluate = function(p) $slow return -(p.x - 2)^2 - (p.y - 1)^2 end, tolerance = 1e-300, max_evaluations = 10000000}"
simplex="cp.optim.nmsimplex{f = function(x) $slow return (x[1] - 2)^2 + (x[2] - 1)^2 end, start = {0, 0}, step = {1, 1}, tolerance = 1e-300, max_iterations = 10000000}"
for case in "optimize:$optimize:best point so far: x = 2, y = 1 (merit" \
            "optim.nmsimplex:$simplex:best point so far: x = {2, 1}, f = 0"; do
  name=${case%%:*}
  rest=${case#*:}
  call=${rest%:best point*}
  best=${rest#"$call":}
  interrupt "CANCEL-5 $name" "$call" 1500 "interrupted; $name: stopped after" "$best"
done

# CANCEL-5 outside the simplex: a Ctrl-C while cp.optimize evaluates its starting points or
# its +-10 % report also reports the best point so far.  The objective spins (until the
# Ctrl-C) at its 2nd evaluation, the second starting point: the first is the middle of
# [0, 3], x = 1.5, merit -(1.5 - 2)^2 = -0.25 (by hand).  With max_evaluations = 12 the
# search ends after 12 evaluations and the 13th is the report's first; the best point
# then is the one an uninterrupted run returns (run below, a second way to the number).
stall="cp.optimize{parameters = {{name = 'x', min = 0, max = 3}}, evaluate = function(p) n = (n or 0) + 1 if n == STALL then while true do end end return -(p.x - 2)^2 end, tolerance = 1e-300, max_evaluations = 12}"
best=$("$coldprep" -e "local r = ${stall/STALL/0}; print(string.format('x = %.10g (merit %.10g, feasible)', r.parameters.x, r.merit))")
for case in "2:1 evaluations (starting points); best point so far: x = 1.5 (merit -0.25, feasible)" \
            "13:12 evaluations (in the +-10 % report); best point so far: $best"; do
  at=${case%%:*}
  want=${case#*:}
  interrupt "CANCEL-5 optimize outside the simplex (evaluation $at)" "${stall/STALL/$at}" 700 \
    "interrupted; optimize: stopped after $want"
done
# A finished optimisation leaves no note: a later Ctrl-C says only "interrupted".
pty "CANCEL-5 no stale note" <<EOF
expect coldprep> 
send r = ${stall/STALL/0}\r
expect coldprep> 
send while true do end\r
sleep 300
send \x03
within 200 interrupted\r\n
expect coldprep> 
send print(r.parameters.x > 1.9)\r
expect true
expect coldprep> 
send \x04
exit 0
EOF

# CANCEL-3: in a script, SIGINT stops the computation within 0.2 s; exit status 1.
for call in "$bands" "$wannier" "$filling" "$shape" "$sampling" "$optimize"; do
  "$coldprep" -e "$call" 2> script.err &
  pid=$!
  sleep 0.7
  start=$(date +%s%N)
  kill -INT "$pid"
  wait "$pid"
  status=$?
  ms=$(( ($(date +%s%N) - start) / 1000000 ))
  checks=$((checks + 1))
  [ "$status" = 1 ] && [ "$ms" -lt 200 ] && grep -q interrupted script.err ||
    fail CANCEL-3 "a script stopped by SIGINT: status $status after $ms ms: $(cat script.err)"
done
checks=$((checks + 1))
grep -q "optimize: stopped after [0-9]* evaluations; best point so far: x = 2, y = 1" script.err ||
  fail CANCEL-5 "the interrupted optimisation's script message lacks the best point: $(cat script.err)"


# CANCEL-6: a sweep of 6 points on 2 workers.  With SLOW=1 point 2 spins in Lua and point 5
# runs a three-minute band scan (allow_long), each for minutes; the others take
# milliseconds, so after 1.5 s points 1, 3 and 4 are finished (1 in the file, 3 and 4 in
# the journal, waiting for 2).  Values depend on x only, so SLOW changes no byte.
cat > slow.lua <<'LUA'
local slow = os.getenv("SLOW") == "1"
return {
  parameters = {{name = "x", values = {1, 2, 3, 4, 5, 6}}},
  outputs = {"y"},
  evaluate = function(p)
    if slow and p.x == 2 then local s = 0 while true do s = s + 1 end end
    if slow and p.x == 5 then
      cp.lattice.bands{depth_er = 10, bands = 200, points = 5000, basis = 4001, allow_long = true}
    end
    return {y = p.x / 7}
  end,
}
LUA
"$coldprep" sweep slow.lua --jobs 2 --out ref.csv 2> /dev/null
run "$cli_pty" -t 30 -- env SLOW=1 "$coldprep" sweep slow.lua --jobs 2 --out cut.csv <<EOF
sleep 1500
send \x03
within 200 stopped by signal 2; continue with --resume
exit 130
EOF
checks=$((checks + 1))
[ "$rc" = 0 ] || fail CANCEL-6 "the sweep did not stop within 0.2 s of Ctrl-C (see stderr)"
checks=$((checks + 1))
[ "$(tail -n +2 cut.csv | wc -l)" = 1 ] && [ "$(wc -l < cut.csv.pending)" = 2 ] ||
  fail CANCEL-6 "finished rows not on disk: $(cat cut.csv cut.csv.pending 2>&1)"
"$coldprep" sweep slow.lua --jobs 2 --out cut.csv --resume 2> resume.err
checks=$((checks + 1))
cmp -s cut.csv ref.csv && grep -q "recovered 2 finished rows" resume.err ||
  fail CANCEL-6 "--resume after Ctrl-C differs from an uninterrupted run: $(cat resume.err)"

finish
