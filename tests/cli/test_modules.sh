#!/usr/bin/env bash
# The parts opened on first use (lua/bind/modpath.h): a start opens neither PLplot nor
# readline (the program does not link them, and `coldprep -e ''` maps neither), the first
# plot opens the plot module and a session the session module, and a program copied away
# from its modules still runs plans and scripts and reports a missing module plainly,
# naming the file and where it looked, instead of failing at start.
source "$(dirname "$0")/lib.sh"

# MOD-1: neither library is linked into the program; the modules carry them
checks=$((checks + 1))
if ldd "$coldprep" | grep -Eq 'libplplot|libreadline'; then
  out=$(ldd "$coldprep") err= rc=0
  fail MOD-1 "the program links PLplot or readline"
fi

# MOD-2: a start maps neither (the maps of the process at the end of -e)
run "$coldprep" -e 'io.write(io.open("/proc/self/maps"):read("a"))'
status MOD-2a 0
out_lacks MOD-2b libplplot
out_lacks MOD-2c libreadline
out_lacks MOD-2d coldprep_plot.so

# MOD-3: the first plot opens the plot module
run "$coldprep" -e "cp.plot.bands{quasimomenta = {-1, 0, 1}, energies_er = {{1, 1}, {0, 4}, {1, 1}},
  out = '$tmp/b.svg'}
  io.write(io.open('/proc/self/maps'):read('a'))"
status MOD-3a 0
out_has MOD-3b coldprep_plot.so
out_has MOD-3c libplplot

# MOD-4: a piped session runs (the session module)
session 'print(6 * 7)'
status MOD-4a 0
out_is MOD-4b 42

# MOD-5: the program alone, without its modules: plans and scripts run; a plot or a
# session is a clear error
mkdir -p "$tmp/alone"
cp "$coldprep" "$tmp/alone/coldprep"
run "$tmp/alone/coldprep" -e 'print(cp.feshbach.ramp_law{resonance = "KRb", molecule = "KRb",
  density = 1e18, ramp_rates = cp.reals.from{1}}.efficiency[1] > 0)'
status MOD-5a 0
out_is MOD-5b true
run "$tmp/alone/coldprep" -e "cp.plot.bands{quasimomenta = {-1, 0, 1},
  energies_er = {{1, 1}, {0, 4}, {1, 1}}, out = '$tmp/never.svg'}"
status MOD-5c 1
err_has MOD-5d "plot: cannot find coldprep_plot.so (looked in $tmp/alone/., $tmp/alone/luamod,"
err_has MOD-5e "is the coldprep build or install complete?"
run "$tmp/alone/coldprep" </dev/null
status MOD-5f 1
err_has MOD-5g "coldprep: the interactive session: cannot find coldprep_repl.so (looked in $tmp/alone/."

finish
