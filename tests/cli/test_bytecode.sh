#!/usr/bin/env bash
# The Lua-side library embedded as precompiled bytecode (scripts/embed_lua.cmake) gives the
# same results as its source: a stock lua5.4 with the Lua C module runs the demo plan, a
# sweep, an uncertainty study, an optimisation and help(), once with the embedded modules
# and once with every lua/coldprep module (subfolders included) preloaded from its source
# file under the same chunk name; the two outputs are byte-identical.  When the build had
# luac5.4 the binary holds bytecode (the Lua 5.4 signature "\x1bLuaT"), not source.
source "$(dirname "$0")/lib.sh"
top=$(cd "$(dirname "$0")/../.." && pwd)
luamod=$(dirname "$coldprep")/luamod
command -v lua5.4 >/dev/null || { echo "lua5.4 missing" >&2; exit 1; }

cat >"$tmp/work.lua" <<'LUA'
local cp = require "coldprep"
dofile(DEMO)
local s = cp.sweep{parameters = {{name = "x", from = 1, to = 3, points = 3}},
                   evaluate = function(p) return {y = p.x ^ 2 / 3} end, outputs = {"y"}}
for _, row in ipairs(s.rows) do print(string.format("%.17g %.17g", row.x, row.y)) end
local u = cp.uncertainty{parameters = {{name = "x", distribution = "normal", mean = 1, sd = 0.1}},
                         evaluate = function(p) return {y = p.x ^ 2} end, outputs = {"y"},
                         samples = 50, seed = 7}
print(string.format("%.17g %.17g", u.outputs.y.mean, u.outputs.y.sd))
local o = cp.optimize{parameters = {{name = "x", min = 0, max = 3}},
                      evaluate = function(p) return -(p.x - 2) ^ 2 end}
print(string.format("%.17g", o.parameters.x))
cp.help()
LUA

# the preload from source: one line per module, chunk name "@lua/coldprep/<file>"
{
  echo 'local function from(path) return function(...) local f = assert(io.open(path)); local s = f:read("a"); f:close(); return assert(load(s, "@" .. path:match("lua/coldprep/.*")))(...) end end'
  (cd "$top" && find lua/coldprep -name '*.lua' | sort) | while read -r f; do
    m=${f#lua/}
    m=${m%.lua}
    echo "package.preload[\"${m//\//.}\"] = from(\"$top/$f\")"
  done
} >"$tmp/source.lua"

# a module built with the sanitizers needs their runtimes loaded first into the stock
# (uninstrumented) interpreter
preload=
if ldd "$luamod/coldprep.so" 2>/dev/null | grep -q libasan; then
  preload="$(gcc -print-file-name=libasan.so) $(gcc -print-file-name=libubsan.so)"
  export ASAN_OPTIONS=detect_leaks=0
fi
runlua() { LD_PRELOAD=$preload LUA_CPATH="$luamod/?.so" LUA_PATH="" lua5.4 \
  -e "DEMO = '$top/scripts/demo.lua'" "$@"; }
# the demo reports the CPU time it took: the one line that may differ between two runs
(cd "$tmp" && runlua "$tmp/work.lua") >"$tmp/bytecode.raw" 2>&1
rc_b=$?
(cd "$tmp" && runlua -e "dofile('$tmp/source.lua')" "$tmp/work.lua") >"$tmp/source.raw" 2>&1
rc_s=$?
grep -v "of CPU time" "$tmp/bytecode.raw" >"$tmp/bytecode.out"
grep -v "of CPU time" "$tmp/source.raw" >"$tmp/source.out"
checks=$((checks + 1))
if [ $rc_b != 0 ] || [ $rc_s != 0 ]; then
  fail BYTECODE-1 "a run failed: $(tail -3 "$tmp/bytecode.raw") / $(tail -3 "$tmp/source.raw")"
elif ! cmp -s "$tmp/bytecode.out" "$tmp/source.out"; then
  fail BYTECODE-1 "outputs differ: $(diff "$tmp/bytecode.out" "$tmp/source.out" | head -5)"
fi
checks=$((checks + 1))
[ "$(grep -c 'verdict\|degenerate' "$tmp/bytecode.out")" -gt 0 ] ||
  fail BYTECODE-2 "the demo printed no verdict"
# the source run really used the source: its loaders are Lua functions (the embedded
# ones are C closures) and were kept by luaopen_coldprep
checks=$((checks + 1))
kinds=$(runlua -e "dofile('$tmp/source.lua')" -e 'require "coldprep"
  print(debug.getinfo(package.preload["coldprep.stage.hold"]).what)' 2>&1)
plain=$(runlua -e 'require "coldprep"; print(debug.getinfo(package.preload["coldprep.stage.hold"]).what)' 2>&1)
[ "$kinds $plain" = "Lua C" ] || fail BYTECODE-4 "loaders: source run '$kinds', plain run '$plain'"
if command -v luac5.4 >/dev/null; then
  checks=$((checks + 1))
  grep -q $'\x1bLuaT' "$coldprep" || fail BYTECODE-3 "no bytecode in $coldprep"
fi
finish
