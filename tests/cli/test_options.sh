#!/usr/bin/env bash
# Bad options and values on the command line of coldprep and its subcommands: a usage
# error (status 2) naming the option, the value and what is allowed, never a Lua
# traceback.
source "$(dirname "$0")/lib.sh"
cd "$tmp" || exit 1
printf 'return {parameters = {{name = "x", values = {1, 2}}}, outputs = {"v"},\n  evaluate = function(p) return {v = p.x} end}\n' > s.lua

no_traceback() { # ID: stderr holds no Lua traceback or Lua runtime error
  checks=$((checks + 1))
  [[ $err != *"stack traceback"* && $err != *"attempt to "* && $err != *"bad argument #"* ]] ||
    fail "$1" "stderr holds a Lua traceback or runtime error"
}

# OPT-1: an unknown option of coldprep names it and lists the allowed ones.
run "$coldprep" --bogus </dev/null
status OPT-1a 2
err_has OPT-1b "coldprep: unknown option --bogus; allowed -e CODE, -i,"
err_has OPT-1c "--allow-write PATH"
no_traceback OPT-1d
# the commands it lists are those of `coldprep --help` (the second source of the list)
commands=$("$coldprep" --help | sed -n '/^commands:/,/^$/p' | awk 'NR > 1 && /^  [a-z]/ {print $1}' | paste -sd, | sed 's/,/, /g')
checks=$((checks + 1))
[ -n "$commands" ] || fail OPT-1e "coldprep --help lists no commands"
err_has OPT-1f "or a command ($commands)"

# OPT-2: coldprep sweep: an unknown option, and values out of range, name what is allowed.
run "$coldprep" sweep s.lua --bogus </dev/null
status OPT-2a 2
err_has OPT-2b "coldprep sweep: unknown option --bogus; allowed --jobs N (-j), --out PATH (-o), --resume,"
run "$coldprep" sweep s.lua --jobs 0 </dev/null
status OPT-2c 2
err_has OPT-2d "coldprep sweep: --jobs 0 is out of range; allowed [1, 1024]"
run "$coldprep" sweep s.lua --shard 4/3 </dev/null
status OPT-2e 2
err_has OPT-2f "coldprep sweep: --shard 4/3 is not a slice; allowed K/N with 1 <= K <= N"
run "$coldprep" sweep s.lua --max-time -1 </dev/null
status OPT-2g 2
err_has OPT-2h "coldprep sweep: --max-time -1 s is out of range; allowed (0, 1000000] s"
run "$coldprep" sweep s.lua --jobs two </dev/null
status OPT-2j 2
err_has OPT-2k "coldprep sweep: --jobs two is not a whole number; allowed [1, 1024]"
run "$coldprep" --sandbox --max-memory lots s.lua </dev/null
status OPT-2l 2
err_has OPT-2m "--max-memory lots MiB is not a number; allowed (0, 1048576] MiB"
no_traceback OPT-2i

# OPT-3: coldprep merge: an option it does not have is named, not taken for the output.
run "$coldprep" merge --bogus a.csv b.csv </dev/null
status OPT-3a 2
err_has OPT-3b "coldprep merge: unknown option --bogus; allowed -h (--help) alone"
[ ! -e --bogus ] || fail OPT-3c "merge created a file named --bogus"
checks=$((checks + 1))
no_traceback OPT-3d

# OPT-4: coldprep data: an option is not looked up as a species name; --help is usage.
run "$coldprep" data --bogus </dev/null
status OPT-4a 2
err_has OPT-4b "coldprep data: unknown option --bogus; allowed -h (--help) alone, or one species name"
run "$coldprep" data --help </dev/null
status OPT-4c 0
out_has OPT-4d "usage: coldprep data [NAME]"
run "$coldprep" data Xx99 </dev/null
status OPT-4e 2
err_has OPT-4f 'unknown molecule "Xx99"; closest known names:'
no_traceback OPT-4g

# OPT-5: a bad value in a sweep file is named in the house spelling (NaN, not the C
# library's "-nan"; a table by its type, not its address).
printf 'return {parameters = {{name = "x", values = {0/0}}}, outputs = {"v"},\n  evaluate = function(p) return {v = p.x} end}\n' > nan.lua
run "$coldprep" sweep nan.lua --out nan.csv </dev/null
status OPT-5a 1
err_is OPT-5b "coldprep sweep: sweep: parameter 'x': values[1] must be a finite number, a string or a boolean, got NaN"
printf 'return {parameters = {{name = "x", values = {{}}}}, outputs = {"v"},\n  evaluate = function(p) return {v = 1} end}\n' > tab.lua
run "$coldprep" sweep tab.lua --out tab.csv </dev/null
status OPT-5c 1
err_is OPT-5d "coldprep sweep: sweep: parameter 'x': values[1] must be a finite number, a string or a boolean, got table"
no_traceback OPT-5e

finish
