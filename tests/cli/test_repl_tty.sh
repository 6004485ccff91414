# The REPL on a terminal, driven through a pseudo-terminal by cli_pty (tests/cli/cli_pty.c):
# Tab completion, Ctrl-C during a computation and at the prompt, Ctrl-D, persistent
# history, and -i.  cli_pty types the `send` lines and waits for the `expect` lines; typed
# text is echoed, so every expected result differs from what was typed ("st".."art"
# prints start).  Ctrl-C is sent only once the keys before it have been echoed: the
# terminal discards unread input on Ctrl-C, and keys typed during a computation go to the
# terminal driver, not readline.
source "$(dirname "$0")/lib.sh"
[ -x "$cli_pty" ] || { echo "usage: $0 COLDPREP CLI_PTY (the pty driver is missing)" >&2; exit 1; }
cd "$tmp" || exit 1
export TERM=dumb INPUTRC=/dev/null # no terminal escapes, no user key bindings

# pty ID [ARGS...] < SCRIPT: a terminal session of coldprep ARGS played from SCRIPT.
pty() {
  local id=$1
  shift
  run "$cli_pty" -t 30 -- "$coldprep" "$@"
  checks=$((checks + 1))
  [ "$rc" = 0 ] || fail "$id" "terminal session failed (see stderr)"
}

# TTY-1: Tab completes globals, fields along a path, fields of __index tables, methods
# of strings, keywords; after a call it offers nothing (two bells); a double Tab lists
# the fields without the path; inside a string Tab completes file names; the fields of a
# module loaded on first use (cp.uncertainty, not loaded before) complete too.
printf 'print("loaded " .. "ok")\n' >comp_target.lua
pty TTY-1 <<'EOF'
expect help() lists the library
expect coldprep> 
send cp.spec\t
expect cp.species
send .atom("40K").statistics\n
expect fermion
expect coldprep> 
send pri\t("hel".."lo")\n
expect hello
expect coldprep> 
send print(rawequal(cp.uncertainty, package.loaded["coldprep.uncertainty"]) and "load".."ed" or "not ".."loaded")\n
expect not loaded
expect coldprep> 
send print(type(cp.uncertainty.rank_corr\t) .. "!")\n
expect function!
expect coldprep> 
send obj = setmetatable({}, {__index = {frobnicate = function() return "fro".."bbed" end}})\n
send obj.frob\t()\n
expect frobbed
expect coldprep> 
send s = "abc"\n
send s:upp\t()\n
expect ABC
expect coldprep> 
send local v = 0 whi\t v < 3 do v = v + 1 end print("v=" .. v)\n
expect v=3
expect coldprep> 
send cp.species.atom("40K").sta\t\t
expect sta\x07\x07
send \x03
expect coldprep> 
send cp.species.add_\t\t
expect \nadd_atom
expect add_resonance
expect coldprep> 
send \x03
send dofile("comp_t\t)\n
expect loaded ok
expect coldprep> 
send \x04
exit 0
EOF

# TTY-2: Ctrl-C stops a running computation and the session goes on; a pcall inside
# the loop cannot swallow the interruption; a loop inside a coroutine is stopped too.
pty TTY-2 <<'EOF'
expect coldprep> 
send print("st".."art") while true do end\n
expect start
send \x03
expect interrupted
expect coldprep> 
send 6*7\n
expect 42
expect coldprep> 
send print("sw".."allow") while true do pcall(function() while true do end end) end\n
expect swallow
send \x03
expect interrupted
expect coldprep> 
send 6*8\n
expect 48
expect coldprep> 
send coroutine.wrap(function() print("in".."side") while true do end end)()\n
expect inside
send \x03
expect interrupted
expect coldprep> 
send 6*6\n
expect 36
expect coldprep> 
send \x04
exit 0
EOF

# TTY-3: Ctrl-C at the prompt clears the line, in a continuation it drops the pending
# statement, in a history search (Ctrl-R) it ends the search; the program keeps running.  Ctrl-D on an empty line leaves with status 0.
pty TTY-3 <<'EOF'
expect coldprep> 
send abc
expect abc
send \x03
expect coldprep> 
send 6*9\n
expect 54
expect coldprep> 
send for i = 1, 2 do\n
expect       ... 
send \x03
expect coldprep> 
send 5*11\n
expect 55
expect coldprep> 
send \x12
expect reverse-i-search
send *1
expect 1': 5*11
send \x03
expect coldprep> 
send 3*37\n
expect 111
expect coldprep> 
send \x03
expect coldprep> 
send \x04
exit 0
EOF

# TTY-4: history is saved under $XDG_STATE_HOME/coldprep/history, a multi-line entry as
# one line, and recalled with Up in the next session.
export XDG_STATE_HOME=$tmp/state4 # a history of its own
pty TTY-4a <<'EOF'
expect coldprep> 
send 6*7\n
expect 42
expect coldprep> 
send for i = 1, 2 do\n
send print(i + 100)\n
send end\n
expect 102
expect coldprep> 
send \x04
exit 0
EOF
hist=$XDG_STATE_HOME/coldprep/history
checks=$((checks + 1))
[ "$(cat "$hist" 2>/dev/null)" = $'6*7\nfor i = 1, 2 do print(i + 100) end' ] ||
  fail TTY-4b "history file $hist holds: $(cat "$hist" 2>&1)"
pty TTY-4c <<'EOF'
expect coldprep> 
send \e[A\n
expect 101
expect 102
expect coldprep> 
send \e[A\e[A\n
expect 42
expect coldprep> 
send \x04
exit 0
EOF
# without XDG_STATE_HOME: ~/.local/state/coldprep/history, directories created
XDG_STATE_HOME= pty TTY-4d <<'EOF'
expect coldprep> 
send 7*7\n
expect 49
expect coldprep> 
send \x04
exit 0
EOF
checks=$((checks + 1))
[ "$(cat "$HOME/.local/state/coldprep/history" 2>/dev/null)" = "7*7" ] ||
  fail TTY-4e "no history under \$HOME/.local/state"

# TTY-5: when history cannot be saved, a warning is shown and the session works.
: >"$tmp/not_a_dir"
XDG_STATE_HOME=$tmp/not_a_dir pty TTY-5 <<'EOF'
expect warning: cannot create the directory
expect coldprep> 
send 8*8\n
expect 64
expect coldprep> 
send \x04
exit 0
EOF

# TTY-6: -i FILE runs the file, then the session starts on the terminal.
printf 'answer = 40 + 2\n' >setup.lua
pty TTY-6 -i setup.lua <<'EOF'
expect coldprep> 
send answer\n
expect 42
expect coldprep> 
send \x04
exit 0
EOF

finish
