#!/usr/bin/env bash
# cp.plot from the REPL: lines piped into the session draw a sweep's curve and a colour
# map; the files carry the PNG signature (PNG specification, section 5.2).
set -uo pipefail
bin=$(realpath "$1")
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
cd "$dir"
fails=0
check() { if "${@:2}"; then echo "ok   $1"; else echo "FAIL $1"; fails=$((fails + 1)); fi; }
png() { [ "$(head -c 8 "$1" | od -An -tx1 | tr -d ' \n')" = "89504e470d0a1a0a" ]; }

"$bin" > session.out 2>&1 <<'LUA'
r = cp.sweep{parameters = {{name = "x", from = 1, to = 100, points = 9, scale = "log"}, {name = "k", values = {1, 2}}}, evaluate = function(p) return {y = p.k * math.log(p.x)} end, outputs = {"y"}}
cp.plot.sweep{data = r, x = "x", y = "y", group = "k", xlog = true, out = "curve.png"}
cp.plot.map{data = r, x = "x", y = "k", z = "y", xlog = true, out = "map.png"}
cp.plot.sweep{data = r, x = "x", y = "nope", out = "bad.png"}
LUA
check "REPL: sweep curve written" png curve.png
check "REPL: map written" png map.png
check "REPL: a bad column is reported, not fatal" grep -q "no row has a value in column 'nope'" session.out
check "REPL: nothing written for the bad call" test ! -e bad.png
exit $((fails > 0))
