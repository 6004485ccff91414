#!/usr/bin/env bash
# The files of `coldprep sweep` and `coldprep merge` under misuse: a cp.sweep{out = PATH}
# in a script while a command-line sweep writes PATH is refused (it used to truncate the
# file under the running sweep); merge refuses an output that is one of its slices under
# another name; SGE_TASK_ID=undefined (set in jobs that are not arrays) means an unsharded
# run; --resume refuses finished rows of the wrong width and ignores malformed journal rows;
# outputs, locks, journals, markers and temporary files are never written through symbolic
# links.
set -uo pipefail
bin=$(realpath "$1")
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
cd "$dir"
fails=0
check() { # check NAME COMMAND...
  if "${@:2}"; then echo "ok   $1"; else echo "FAIL $1"; fails=$((fails + 1)); fi
}

cat > scan.lua <<'LUA'
-- SCAN_WORK sets the cost of a point, not its value
local work = tonumber(os.getenv("SCAN_WORK") or "100")
return {
  parameters = { {name = "x", from = 0, to = 1, points = 20}, {name = "k", values = {1, 2}} },
  evaluate = function(p)
    local s = 0
    for i = 1, work do s = s + math.sin(p.x * i * p.k) end
    return {y = p.x * p.k + 0 * s, label = p.k == 2 and "two, \"q\"" or "plain"}
  end,
  outputs = {"y", "label"},
}
LUA
"$bin" sweep scan.lua --jobs 1 --out ref.csv 2>/dev/null
"$bin" sweep scan.lua --jobs 1 --out ref.jsonl 2>/dev/null

# A script's cp.sweep{out = PATH} while `coldprep sweep` writes PATH: refused, and the
# command-line sweep's file is whole.
SCAN_WORK=2000000 "$bin" sweep scan.lua --jobs 1 --out busy.csv 2>/dev/null &
pid=$!
for _ in $(seq 1 400); do [ -s busy.csv ] && break; sleep 0.02; done
"$bin" -e 'cp.sweep{parameters = {{name = "z", values = {1}}}, out = "busy.csv",
  evaluate = function(p) return p.z end}' 2> script.err
check "cp.sweep on a file a running sweep writes fails" test $? -eq 1
check "and says another sweep writes it" grep -q "another coldprep sweep is writing busy.csv" script.err
kill -TERM "$pid"; wait "$pid"
check "the running sweep's file kept its header" \
  test "$(head -n 1 busy.csv)" = "$(head -n 1 ref.csv)"
"$bin" sweep scan.lua --jobs 1 --out busy.csv --resume 2>/dev/null
check "and completes to the uninterrupted file" cmp -s busy.csv ref.csv

# merge: the output given again as a slice under another spelling.
for k in 1 2 3; do "$bin" sweep scan.lua --out m.csv --shard $k/3 2>/dev/null; done
cp m.1-of-3.csv keep.csv
"$bin" merge ./m.1-of-3.csv m.1-of-3.csv m.2-of-3.csv m.3-of-3.csv 2> merge.err
check "merge into one of its slices (./name) is refused" test $? -eq 1
check "and says so" grep -q "is also given as a slice" merge.err
check "slice 1 is untouched" cmp -s m.1-of-3.csv keep.csv
ln -s m.2-of-3.csv alias.csv
"$bin" merge alias.csv m.1-of-3.csv m.2-of-3.csv m.3-of-3.csv 2> merge.err
check "merge into a link to a slice is refused" grep -q "is also given as a slice" merge.err
ln -s keep.csv merged.csv.tmp
"$bin" merge merged.csv m.3-of-3.csv m.1-of-3.csv m.2-of-3.csv 2>/dev/null
check "merge works beside a planted OUT.tmp link" cmp -s merged.csv ref.csv
check "and does not write through it" cmp -s keep.csv m.1-of-3.csv

# SGE_TASK_ID=undefined: not an array job, the whole sweep.
SGE_TASK_ID=undefined "$bin" sweep scan.lua --out sge.csv 2> sge.err
check "SGE_TASK_ID=undefined runs the whole sweep" cmp -s sge.csv ref.csv
check "as one file, not a slice" test ! -e sge.1-of-1.csv

# --resume: a finished row of the wrong width is refused, not kept.
awk 'NR == 6 { sub(/,plain,/, ",") } { print }' ref.csv > narrow.csv
"$bin" sweep scan.lua --out narrow.csv --resume 2> narrow.err
check "resume refuses a finished row of the wrong width" test $? -eq 1
check "and names it" grep -q "byte .* (point 5.*does not have this sweep's columns" narrow.err
sed 's/"label":"plain",//' ref.jsonl | head -n 3 > narrow.jsonl
"$bin" sweep scan.lua --out narrow.jsonl --resume 2> narrow.err
check "JSON Lines: a row without a key is refused" grep -q "does not have this sweep's columns" narrow.err
# journal rows of another shape (12,1,2,3) are ignored and computed again
head -n 10 ref.csv > j.csv
printf '12,1,2,3\r\n' > j.csv.pending
grep '^14,' ref.csv >> j.csv.pending
"$bin" sweep scan.lua --out j.csv --resume 2> j.err
check "a malformed journal row is ignored" grep -q "ignored 1 malformed rows" j.err
check "a well-formed one is recovered" grep -q "recovered 1 finished rows" j.err
check "the result is the uninterrupted file" cmp -s j.csv ref.csv

# Symbolic links: an output, a lock, a journal's temporary file and a marker's temporary
# file planted as links are never written through.
echo precious > target.txt
ln -s target.txt link.csv
"$bin" sweep scan.lua --out link.csv --force 2> link.err
check "an output that is a link is refused" test $? -eq 1
check "with the reason" grep -q "symbolic link" link.err
ln -s target.txt lk.csv.lock
"$bin" sweep scan.lua --out lk.csv 2> lk.err
check "a lock that is a link is refused" grep -q "lock lk.csv.lock: it is a symbolic link" lk.err
ln -s target.txt t.csv.pending.tmp
ln -s target.txt t.csv.done.tmp
"$bin" sweep scan.lua --out t.csv 2>/dev/null
check "planted temporary links: the sweep still completes" cmp -s t.csv ref.csv
check "and the file they point to is untouched" test "$(cat target.txt)" = precious
head -n 10 ref.csv > r.csv
ln -s target.txt r.csv.pending
"$bin" sweep scan.lua --out r.csv --resume 2> r.err
check "a journal that is a link is refused" test $? -eq 1
check "with the reason" grep -q "r.csv.pending: it is a symbolic link" r.err
check "and not read or written" test "$(cat target.txt)" = precious -a -L r.csv.pending

exit $((fails > 0))
