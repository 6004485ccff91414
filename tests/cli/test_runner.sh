# The script runner and the command line: FILE with arguments, -e, -i, -, --help,
# --version, the help subcommand, exit statuses (0 ok, 1 script error, 2 usage error) and
# the form of error messages (file:line: message).
source "$(dirname "$0")/lib.sh"
cd "$tmp" || exit 1

# RUN-1: a script gets its arguments in `arg` (arg[0] = the script) and as `...`.
cat >args.lua <<'EOF'
print(arg[0], arg[1], arg[2], #arg, select("#", ...), (...))
EOF
run "$coldprep" args.lua alpha "two words" </dev/null
out_is RUN-1a $'args.lua\talpha\ttwo words\t2\t2\talpha'
status RUN-1b 0
run "$coldprep" -e 'x = 1' args.lua a </dev/null
out_is RUN-1c $'args.lua\ta\tnil\t1\t1\ta'

# RUN-2: a run-time error in a script prints file:line: message and exits 1.
printf 'local x = 1\nerror("went wrong")\n' >fails.lua
run "$coldprep" fails.lua </dev/null
err_is RUN-2a "fails.lua:2: went wrong"
status RUN-2b 1
out_is RUN-2c ""

# RUN-3: a syntax error is reported the same way.
printf 'x = 1\ny = = 2\n' >syntax.lua
run "$coldprep" syntax.lua </dev/null
err_is RUN-3a "syntax.lua:2: unexpected symbol near '='"
status RUN-3b 1

# RUN-4: an error raised by the library names the caller's line and suggests names.
printf '\nlocal a = cp.species.atom("Xx99")\n' >lib_error.lua
run "$coldprep" lib_error.lua </dev/null
err_has RUN-4a "lib_error.lua:2: "
err_has RUN-4b "closest known names"
status RUN-4c 1
# ... and so does a bad argument of a stage or a plan, raised while the plan is written
printf 'local u = cp.units\nlocal s = cp.stages.hold { duraton = 1 }\n' >stage_error.lua
run "$coldprep" stage_error.lua </dev/null
err_has RUN-4d "stage_error.lua:2: stages.hold: unknown argument 'duraton'"
printf '\n\nlocal p = cp.plan { start = {} }\n' >plan_error.lua
run "$coldprep" plan_error.lua </dev/null
err_has RUN-4e "plan_error.lua:3: plan: argument 'stages'"

# RUN-5: the acceptance checks of the command-line runner (docs/cli.md).
run "$coldprep" -e 'print(require("coldprep").species.atom("40K").statistics)'
out_is RUN-5a "fermion"
status RUN-5b 0
run "$coldprep" -e 'require("coldprep").species.atom("Xx99")'
status RUN-5c 1
err_has RUN-5d "closest known names"

# RUN-6: a missing script is an error (1), not a usage error.
run "$coldprep" no_such_file.lua </dev/null
err_has RUN-6a "cannot open no_such_file.lua"
status RUN-6b 1

# RUN-7: several -e run in order in one state; an error stops there.
run "$coldprep" -e 'x = 6' -e 'print(x * 7)'
out_is RUN-7a "42"
run "$coldprep" -e 'print("first")' -e 'error("second fails")' -e 'print("third")'
out_is RUN-7b "first"
err_is RUN-7c "(command line):1: second fails"
status RUN-7d 1

# RUN-8: usage errors exit 2 with a message and a pointer to --help.
run "$coldprep" -e
status RUN-8a 2
err_has RUN-8b "option -e needs an argument"
run "$coldprep" -x
status RUN-8c 2
err_has RUN-8d "unknown option -x"
err_has RUN-8e "Try 'coldprep --help'."
run "$coldprep" --frobnicate args.lua
status RUN-8f 2

# RUN-9: --help and -h print the usage with the subcommands; --version and -v the version,
# which is the library's cp.version.
run "$coldprep" --help
status RUN-9a 0
out_has RUN-9b "usage: coldprep [options] [FILE.lua [ARGS...]]"
out_has RUN-9c "help [NAME]"
run "$coldprep" -h
out_has RUN-9d "-e CODE"
run "$coldprep" --version
status RUN-9e 0
version=$out
run "$coldprep" -e 'io.write("coldprep ", cp.version)'
[ "$version" = "$out" ] || fail RUN-9f "--version says '$version', cp.version says '$out'"
[[ $version =~ ^coldprep\ [0-9]+\.[0-9]+\.[0-9]+$ ]] || fail RUN-9g "version '$version' is not MAJOR.MINOR.PATCH"
checks=$((checks + 2))
run "$coldprep" -v
out_is RUN-9h "$version"

# RUN-10: -i runs the script, then the session reads stdin.
printf 'answer = 42\n' >setup.lua
run "$coldprep" -i setup.lua <<<'answer + 1'
out_is RUN-10a "43"
status RUN-10b 0
run "$coldprep" -e 'y = 2' -i <<<'y * 3'
out_is RUN-10c "6"
run "$coldprep" -i fails.lua <<<'print("not reached")'
status RUN-10d 1
out_is RUN-10e ""
# -e without -i runs the code and does not read stdin
run "$coldprep" -e 'print("only")' <<<'print("stdin")'
out_is RUN-10f "only"

# RUN-11: "-" reads the script from stdin; "--" ends the options.
run "$coldprep" - one two <<<'print(select("#", ...), ...)'
out_is RUN-11a $'2\tone\ttwo'
printf 'print("dash file")\n' >-dash.lua
run "$coldprep" -- -dash.lua
out_is RUN-11b "dash file"

# RUN-12: error objects that are not strings, and tracebacks on request.
run "$coldprep" -e 'error({})'
err_is RUN-12a "(error object is a table value)"
status RUN-12b 1
run "$coldprep" -e 'error(setmetatable({}, {__tostring = function() return "custom" end}))'
err_is RUN-12c "custom"
COLDPREP_TRACEBACK=1 run "$coldprep" fails.lua
err_has RUN-12d "stack traceback:"
err_has RUN-12e "fails.lua:2: went wrong"

# RUN-13: os.exit sets the exit status.
run "$coldprep" -e 'os.exit(7)'
status RUN-13 7

# RUN-14: `coldprep help [NAME]` prints help from the shell.
run "$coldprep" help cp.species.atom
status RUN-14a 0
out_has RUN-14b "species.atom(name)"
run "$coldprep" help species.atom
out_has RUN-14c "species.atom(name)"
run "$coldprep" help
out_has RUN-14d "cp.species"
run "$coldprep" help cp.species.nothing
status RUN-14e 2
err_has RUN-14f "no such name: cp.species.nothing"
run "$coldprep" help a b
status RUN-14g 2
# a script named like a subcommand still runs when given as a path
printf 'print("the help script")\n' >help
run "$coldprep" ./help
out_is RUN-14h "the help script"

# RUN-15: Ctrl-C (SIGINT) stops a running script with "interrupted" and status 1, even
# when the script catches errors with pcall.  The script says "ready" inside its loop.
interrupt() {
  local id=$1 code=$2
  rm -f "$tmp/int.out" "$tmp/int.err" # no "ready" left from the previous run
  "$coldprep" -e "$code" >"$tmp/int.out" 2>"$tmp/int.err" &
  local pid=$! waited=0
  until grep -q ready "$tmp/int.out" 2>/dev/null || [ $waited -ge 200 ]; do
    sleep 0.05
    waited=$((waited + 1))
  done
  kill -INT $pid
  waited=0
  while kill -0 $pid 2>/dev/null && [ $waited -lt 200 ]; do
    sleep 0.05
    waited=$((waited + 1))
  done
  if kill -0 $pid 2>/dev/null; then
    kill -KILL $pid
    fail "$id" "did not stop on SIGINT"
  fi
  wait $pid
  rc=$?
  out=$(cat "$tmp/int.out")
  err=$(cat "$tmp/int.err")
}
interrupt RUN-15a 'io.stdout:setvbuf("line") print("ready") while true do end'
status RUN-15b 1
err_has RUN-15c "interrupted"
interrupt RUN-15d 'io.stdout:setvbuf("line")
  local caught = 0
  while true do
    local ok = pcall(function() if caught == 0 then print("ready") end while true do end end)
    caught = caught + 1
  end'
status RUN-15e 1
err_has RUN-15f "interrupted"
# inside coroutines, which have hooks of their own (both ways of running one)
interrupt RUN-15g 'io.stdout:setvbuf("line")
  coroutine.wrap(function() print("ready") while true do end end)()'
status RUN-15h 1
err_has RUN-15i "interrupted"
interrupt RUN-15j 'io.stdout:setvbuf("line")
  local inner = coroutine.create(function() print("ready") while true do end end)
  local outer = coroutine.create(function() while true do coroutine.resume(inner) end end)
  coroutine.resume(outer)
  while true do end'
status RUN-15k 1
err_has RUN-15l "interrupted"

# RUN-16: coroutines still behave as in stock Lua (their functions are wrapped to track
# them for Ctrl-C): values in and out, errors with positions, dead coroutines.
run "$coldprep" -e 'local f = coroutine.wrap(function(a, b) local c = coroutine.yield(a + b) return c * 2 end)
  print(f(1, 2), f(10))
  local co = coroutine.create(function(x) error("x" .. x) end)
  print(coroutine.resume(co, 1))
  print(coroutine.resume(co))'
out_is RUN-16a $'3\t20\nfalse\t(command line):3: x1\nfalse\tcannot resume dead coroutine'
run "$coldprep" -e 'coroutine.wrap(function() error("inside") end)()'
err_is RUN-16b "(command line):1: (command line):1: inside"
run "$coldprep" -e 'coroutine.resume(1)'
err_has RUN-16c "bad argument #1 to 'resume'"

finish
