#!/usr/bin/env bash
# `coldprep --sandbox FILE` and `coldprep sweep --sandbox`: a file one does not trust cannot
# run commands (os.execute, io.popen), read outside its own directory, write anything but
# the declared outputs, load native code (package.loadlib, require of a C module), use the
# debug library or load bytecode; its memory and time are capped (a pcall cannot swallow
# the time limit); and every example and the demo still run in it.
set -uo pipefail
bin=$(realpath "$1")
here=$(cd "$(dirname "$0")" && pwd)
root=$here/../..
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
mkdir "$dir/plans"
cd "$dir/plans"
fails=0
check() { # check NAME COMMAND...
  if "${@:2}"; then echo "ok   $1"; else echo "FAIL $1"; fails=$((fails + 1)); fi
}
refused() { # refused NAME CODE PATTERN: CODE in a sandboxed file fails with PATTERN
  printf '%s\n' "$2" > probe.lua
  "$bin" --sandbox probe.lua > probe.out 2> probe.err
  local rc=$?
  check "$1 (exit 1)" test "$rc" -eq 1
  check "$1 (says why)" grep -q -- "$3" probe.err
}

echo secret > ../outside.txt
refused "os.execute" 'os.execute("touch ../pwned")' "attempt to call a nil value (field 'execute')"
refused "io.popen" 'io.popen("id")' "attempt to call a nil value (field 'popen')"
refused "io.open outside the directory" 'assert(io.open("../outside.txt"))' "reading ../outside.txt is not allowed"
refused "io.open by absolute path" "assert(io.open(\"$dir/outside.txt\"))" "is not allowed"
ln -s ../outside.txt inside-link.txt
refused "a link inside pointing outside" 'assert(io.open("inside-link.txt"))' "reading inside-link.txt is not allowed"
refused "io.lines outside" 'for l in io.lines("/etc/hostname") do end' "is not allowed"
refused "writing an undeclared file" 'assert(io.open("new.txt", "w"))' "writing new.txt is not allowed"
refused "package.loadlib" 'package.loadlib("libc.so.6", "system")' "attempt to index a nil value (global 'package')"
refused "require of a C module" 'require("socket")' "only coldprep modules"
refused "the debug library" 'require("debug")' "only coldprep modules"
refused "the unchecked file functions" 'require("coldprep.files")' "is not allowed"
refused "a second sandbox of its own" 'require("coldprep.sandbox")' "is not allowed"
refused "bytecode" 'assert(load(string.char(27) .. "LuaT\0"))' "attempt to load a binary chunk"
refused "bytecode mode" 'assert(load("return 1", "x", "b"))' "only text chunks"
refused "string.dump" 'string.dump(print)' "attempt to call a nil value (field 'dump')"
refused "the real string table" 'getmetatable("").__index.x = 1' "attempt to index a nil value (field '__index')"
refused "os.getenv" 'os.getenv("HOME")' "attempt to call a nil value (field 'getenv')"
refused "a sweep written outside" \
  'cp.sweep{parameters = {{name = "x", values = {1}}}, evaluate = function(p) return 1 end, out = "../s.csv"}' \
  "writing ../s.csv is not allowed"
refused "a plot written outside" \
  'cp.plot.sweep{data = {{x = 1, y = 1}, {x = 2, y = 2}}, x = "x", y = "y", out = "../p.png"}' \
  "writing ../p.png is not allowed"
check "nothing was created outside" test ! -e ../pwned -a ! -e ../s.csv -a ! -e ../p.png
check "the outside file is intact" test "$(cat ../outside.txt)" = secret

# What it may do: read its own directory, write a declared output.
echo 'x' > data.txt
printf '%s\n' 'print(io.open("data.txt"):read("l"))' \
  'local f = assert(io.open("result.csv", "w")); f:write("a\n"); f:close()' \
  'cp.sweep{parameters = {{name = "x", values = {1, 2}}}, evaluate = function(p) return p.x end, out = "scan.csv"}' \
  > allowed.lua
"$bin" --sandbox --allow-write result.csv --allow-write scan.csv allowed.lua > allowed.out 2> allowed.err
check "reads its directory and writes the declared outputs" \
  test $? -eq 0 -a "$(cat allowed.out)" = x -a "$(cat result.csv)" = a -a "$(wc -l < scan.csv)" -eq 3

# Caps: memory (the allocator refuses), time (a pcall cannot swallow the limit).
printf '%s\n' 'local t = {}' 'for i = 1, 1e9 do t[i] = string.rep("x", 1000) .. i end' > mem.lua
"$bin" --sandbox --max-memory 64 mem.lua 2> mem.err
check "the memory cap stops a file" test $? -eq 1
check "and says so" grep -q "memory cap" mem.err
printf '%s\n' 'while true do pcall(function() while true do end end) end' > spin.lua
start=$(date +%s%N)
"$bin" --sandbox --max-time 0.5 spin.lua 2> spin.err
rc=$?
ms=$(( ($(date +%s%N) - start) / 1000000 ))
check "the time cap stops a file whose pcall catches errors ($ms ms)" test $rc -eq 1 -a $ms -lt 5000
check "and says so" grep -q "time limit of 0.5 s was exceeded" spin.err
"$bin" --sandbox -e 'print(1)' allowed.lua 2>/dev/null
check "-e is refused beside --sandbox" test $? -eq 2
COLDPREP_SANDBOX=1 "$bin" probe.lua 2>/dev/null
check "COLDPREP_SANDBOX=1 imposes the sandbox" test $? -eq 1

# Sweeps: each worker's state is sandboxed; the time cap is per point.
cat > sweep.lua <<'LUA'
return {parameters = {{name = "x", values = {1, 2, 3}}}, outputs = {"v"},
  evaluate = function(p)
    if p.x == 2 then os.execute("touch ../pwned") end
    if p.x == 3 then assert(io.open("../outside.txt")) end
    return {v = p.x}
  end}
LUA
"$bin" sweep --sandbox sweep.lua --jobs 2 --out sweep.csv 2>/dev/null
check "sandboxed sweep: os.execute fails its point" grep -q "^2,2,,.*field 'execute'" sweep.csv
check "sandboxed sweep: reading outside fails its point" grep -q "^3,3,,.*is not allowed" sweep.csv
check "sandboxed sweep: nothing created" test ! -e ../pwned
printf '%s\n' 'return {parameters = {{name = "x", values = {1, 2}}},' \
  'evaluate = function(p) if p.x == 2 then while true do end end return p.x end}' > slow.lua
"$bin" sweep --sandbox --max-time 0.3 slow.lua --out slow.csv 2> slow.err
check "the per-point time cap stops a sweep" test $? -eq 1
check "naming the point" grep -q "point 2: .*time limit of 0.3 s" slow.err

# Every example and the demo run in the sandbox.
for f in "$root"/scripts/examples/*.lua "$root"/scripts/demo.lua; do
  "$bin" --sandbox "$f" > /dev/null 2> ex.err
  check "example $(basename "$f") runs sandboxed" test $? -eq 0
done
"$bin" sweep --sandbox "$root/scripts/examples/sweep_tidewater.lua" --jobs 2 --shard 1263/2500 \
  --out tide.csv 2>/dev/null
check "the example sweep runs sandboxed" test "$(wc -l < tide.1263-of-2500.csv)" -eq 5

exit $((fails > 0))
