#!/usr/bin/env bash
# `coldprep sweep` and `coldprep merge` through the real binary: output identical under
# --jobs 1 and 2; a run killed with SIGKILL (for real, mid-sweep) then --resume'd equals an
# uninterrupted run; a torn last row is dropped; SIGTERM stops cleanly; shards merge to
# the unsharded file and a missing shard is refused; a second sweep on a busy output is
# refused; bad options are usage errors.
set -uo pipefail
bin=$(realpath "$1")
here=$(cd "$(dirname "$0")" && pwd)
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
cd "$dir"
fails=0
check() { # check NAME COMMAND...
  if "${@:2}"; then echo "ok   $1"; else echo "FAIL $1"; fails=$((fails + 1)); fi
}

# A sweep whose points cost about a millisecond (so that a kill lands mid-sweep), with
# quoted strings, failing points and a grid of two axes.
cat > scan.lua <<'LUA'
local work = tonumber(os.getenv("SCAN_WORK") or "3000")
return {
  parameters = { {name = "x", from = 0, to = 1, points = 100}, {name = "k", values = {1, 2, 3}} },
  evaluate = function(p)
    if p.k == 3 and p.x > 0.9 then error("too far") end
    local s = 0
    for i = 1, work do s = s + math.sin(p.x * i * p.k) end
    return {y = s, label = p.k == 2 and "two, \"quoted\"" or "plain"}
  end,
  outputs = {"y", "label"},
}
LUA

"$bin" sweep scan.lua --jobs 1 --out one.csv 2>/dev/null
"$bin" sweep scan.lua --jobs 2 --out two.csv 2>/dev/null
check "jobs 1 and jobs 2 write the same file" cmp -s one.csv two.csv
check "300 rows plus the header" test "$(wc -l < one.csv)" -eq 301
check "rows are in point order" awk -F, 'NR > 1 && $1 != NR - 1 { exit 1 }' one.csv
check "a failing point records its error" grep -q '^300,1,3,,,.*too far' one.csv
check "completion marker" grep -q '"points":300' one.csv.done
"$bin" sweep scan.lua --jobs 2 --out one.jsonl 2>/dev/null
"$bin" sweep scan.lua --jobs 1 --out one1.jsonl 2>/dev/null
check "JSON Lines also identical under jobs 1 and 2" cmp -s one.jsonl one1.jsonl
check "JSON Lines rows" grep -q '^{"point":2,"x":0,"k":2,"y":0,"label":"two, \\"quoted\\"","error":null}$' one.jsonl
head -c 2000 one.jsonl > cut.jsonl # ends inside a row
"$bin" sweep scan.lua --out cut.jsonl --resume 2>/dev/null
check "JSON Lines resume after a torn row" cmp -s cut.jsonl one.jsonl

# SIGKILL in the middle, for real: wait until some rows are on disk, kill -9, resume.
# (Every finished row is on disk: in the file, or in the journal PATH.pending when an
# earlier point was still running.)
SCAN_WORK=300000 "$bin" sweep scan.lua --jobs 2 --out killed.csv 2>/dev/null &
pid=$!
for _ in $(seq 1 400); do
  [ -f killed.csv ] && [ "$(wc -l < killed.csv)" -ge 20 ] && break
  sleep 0.02
done
kill -9 "$pid"
wait "$pid" 2>/dev/null
rows=$(($(wc -l < killed.csv) - 1))
check "killed mid-sweep (some rows, not all: $rows)" test "$rows" -ge 19 -a "$rows" -lt 300
check "no completion marker after the kill" test ! -e killed.csv.done
check "every row in the killed file is whole" awk 'NR > 1 && !/\r$/ { exit 1 }' killed.csv
printf '%d,0.99,1,0.12' "$((rows + 1))" >> killed.csv # what a torn write would leave
SCAN_WORK=300000 "$bin" sweep scan.lua --jobs 2 --out ref.csv 2>/dev/null
SCAN_WORK=300000 "$bin" sweep scan.lua --jobs 2 --out killed.csv --resume 2> resume.err
check "resume drops the torn row" grep -q "dropped an incomplete last row" resume.err
check "kill -9 then --resume equals an uninterrupted run" cmp -s killed.csv ref.csv
check "resume of a finished file does nothing" "$bin" sweep scan.lua --out ref.csv --resume

# A write the system refuses (here the file-size limit, EFBIG with SIGXFSZ ignored, in
# place of a full disk) ends the run with status 1; the file keeps whole rows in order
# (nothing is appended after the failed write), and --resume completes it exactly.
(trap '' XFSZ; ulimit -f 8; "$bin" sweep scan.lua --jobs 2 --out efbig.csv 2> efbig.err)
check "a refused write ends the run with status 1" test $? -eq 1
check "and names the file" grep -q "cannot write efbig.csv: File too large" efbig.err
# (the failed write may have put some whole rows of its batch in the file before it
# stopped: the summary counts the rows known to be written, never more than are there)
said=$(sed -n 's/^coldprep sweep: \([0-9]*\) of 300 points.*/\1/p' efbig.err)
check "the summary counts no row that is not in the file" \
  test -n "$said" -a "${said:-0}" -le "$(($(wc -l < efbig.csv) - 1))" -a "${said:-0}" -gt 0
"$bin" sweep scan.lua --jobs 2 --out efbig.csv --resume 2>/dev/null
check "after a refused write --resume equals an uninterrupted run" cmp -s efbig.csv one.csv

# Two sweeps never write one file: while one runs, a second on the same output (even with
# --resume) is refused, and the file the first writes stays in point order.
SCAN_WORK=300000 "$bin" sweep scan.lua --jobs 1 --out busy.csv 2>/dev/null &
pid=$!
for _ in $(seq 1 400); do [ -f busy.csv.lock ] && break; sleep 0.02; done
"$bin" sweep scan.lua --out busy.csv --resume 2> busy.err
check "a second sweep on a busy output exits 1" test $? -eq 1
check "and says another sweep is writing it" grep -q "another coldprep sweep is writing busy.csv" busy.err
wait "$pid"
check "the first sweep's file is whole and ordered" cmp -s busy.csv <(SCAN_WORK=300000 \
  "$bin" sweep scan.lua --jobs 1 --out busy2.csv 2>/dev/null; cat busy2.csv)
check "the lock is gone after a finished sweep" test ! -e busy.csv.lock

# The journal: rows finished ahead of an unfinished earlier point are kept in
# PATH.pending and recovered by --resume (rows 103 and 105 here, the first one marked so
# that its use shows; a torn fragment after them is ignored).
head -n 100 one.csv > journal.csv # header + points 1-99
{ grep '^105,' one.csv; grep '^103,' one.csv | sed 's/,plain,/,FROM-JOURNAL,/'; printf '107,0.3'; } \
  > journal.csv.pending
"$bin" sweep scan.lua --jobs 2 --out journal.csv --resume 2> journal.err
check "resume recovers the journal's rows" grep -q "recovered 2 finished rows" journal.err
check "a recovered row is used, not recomputed" grep -q '^103,.*,FROM-JOURNAL,' journal.csv
check "otherwise equal to the uninterrupted run" \
  cmp -s <(sed 's/FROM-JOURNAL/plain/' journal.csv) one.csv
check "the journal is removed once complete" test ! -e journal.csv.pending

# SIGTERM: stops claiming points, writes what is finished, exits 143; resume completes.
SCAN_WORK=300000 "$bin" sweep scan.lua --jobs 2 --out term.csv 2>/dev/null &
pid=$!
for _ in $(seq 1 400); do
  [ -f term.csv ] && [ "$(wc -l < term.csv)" -ge 10 ] && break
  sleep 0.02
done
kill -TERM "$pid"
wait "$pid"
check "SIGTERM exit status 143" test $? -eq 143
SCAN_WORK=300000 "$bin" sweep scan.lua --jobs 1 --out term.csv --resume 2>/dev/null
check "SIGTERM then --resume equals an uninterrupted run" cmp -s term.csv ref.csv

# Shards: three slices (one from the SLURM variables), merged in any order.
"$bin" sweep scan.lua --jobs 2 --out part.csv --shard 1/3 2>/dev/null
SLURM_ARRAY_TASK_ID=5 SLURM_ARRAY_TASK_MIN=4 SLURM_ARRAY_TASK_COUNT=3 \
  "$bin" sweep scan.lua --jobs 1 --out part.csv 2>/dev/null
SGE_TASK_ID=3 SGE_TASK_FIRST=1 SGE_TASK_LAST=3 SGE_TASK_STEPSIZE=1 \
  "$bin" sweep scan.lua --jobs 2 --out part.csv 2>/dev/null
check "slice files" test -e part.1-of-3.csv -a -e part.2-of-3.csv -a -e part.3-of-3.csv
"$bin" merge merged.csv part.3-of-3.csv part.1-of-3.csv part.2-of-3.csv 2>/dev/null
check "merged slices equal the unsharded run" cmp -s merged.csv one.csv
"$bin" merge bad.csv part.3-of-3.csv part.1-of-3.csv 2> merge.err
check "a missing slice is refused" grep -q "missing: 2" merge.err
rm part.2-of-3.csv.done
"$bin" merge bad.csv part.1-of-3.csv part.2-of-3.csv part.3-of-3.csv 2> merge.err
check "an unfinished slice is refused" grep -q "is not complete" merge.err
check "nothing written when refused" test ! -e bad.csv

"$bin" sweep scan.lua --out part.jsonl --shard 2/2 2>/dev/null
"$bin" sweep scan.lua --out part.jsonl --shard 1/2 2>/dev/null
"$bin" merge merged.jsonl part.2-of-2.jsonl part.1-of-2.jsonl 2>/dev/null
check "JSON Lines slices merge to the unsharded run" cmp -s merged.jsonl one.jsonl

# Progress: a bar with rate and ETA on a terminal (script(1) gives it one), one summary
# line otherwise.
if command -v script > /dev/null; then
  script -qec "$bin sweep scan.lua --out tty.csv" /dev/null > tty.out 2>&1
  check "progress bar on a terminal" grep -q 'ETA.*' tty.out
  check "progress bar shows the rate" grep -q 'points/s' tty.out
fi
"$bin" sweep scan.lua --out notty.csv 2> notty.err
check "one summary line when not a terminal" test "$(wc -l < notty.err)" -eq 1
check "summary names points, rate and jobs" grep -q '^coldprep sweep: 300 of 300 points in notty.csv .* points/s, [0-9]* jobs\?$' notty.err

# Usage and file errors.
"$bin" sweep scan.lua --jobs 0 2>/dev/null
check "--jobs 0 is a usage error" test $? -eq 2
"$bin" sweep scan.lua --shard 4/3 2>/dev/null
check "--shard 4/3 is a usage error" test $? -eq 2
SLURM_ARRAY_TASK_ID=abc "$bin" sweep scan.lua --out env.csv 2> env.err
check "a malformed SLURM_ARRAY_TASK_ID is a usage error, not an unsharded run" \
  test $? -eq 2 -a ! -e env.csv
check "the malformed variable is named" grep -q "SLURM_ARRAY_TASK_ID is 'abc'" env.err
SLURM_ARRAY_TASK_ID=1 SLURM_ARRAY_TASK_MIN=1 SLURM_ARRAY_TASK_COUNT=2 SLURM_ARRAY_TASK_STEP=0 \
  "$bin" sweep scan.lua --out env.csv 2> env.err
check "an array step of 0 is a usage error (was a division by zero)" test $? -eq 2
cp scan.lua self.lua
"$bin" sweep self.lua --out self.lua --force 2> self.err
check "the sweep file is never its own output" test $? -eq 2 -a "$(cat self.lua)" = "$(cat scan.lua)"
cat > flaky.lua <<'LUA'
-- describes the sweep the first time it runs (the main thread), raises a table after
local seen = io.open("flaky.seen")
if seen then seen:close(); error({}) end
io.open("flaky.seen", "w"):close()
return {parameters = {{name = "x", values = {1, 2}}}, evaluate = function(p) return p.x end}
LUA
"$bin" sweep flaky.lua --jobs 1 --out flaky.csv 2> flaky.err
check "a worker whose sweep file raises a non-string error says so" \
  grep -q "the sweep file raised a non-string error" flaky.err
"$bin" sweep scan.lua --out one.csv 2> exists.err
check "an existing output is not overwritten" grep -q -- "--resume" exists.err
echo 'return 42' > notasweep.lua
"$bin" sweep notasweep.lua 2> bad.err
check "a file that returns no table is explained" grep -q "must return a sweep description" bad.err
"$bin" sweep scan.lua --out other.csv 2>/dev/null
sed -i '1s/label/lable/' other.csv && rm other.csv.done
"$bin" sweep scan.lua --out other.csv --resume 2> other.err
check "resume refuses another sweep's file" grep -q "another header" other.err

# A misspelt output stops the sweep at its first point with the keys at hand and the
# closest name, in both formats, rather than write a file of empty columns.
cat > miss.lua <<'LUA'
return {
  parameters = { {name = "x", from = 0, to = 1, points = 50} },
  evaluate = function(p) return {final = {number = p.x, t_over_tf = 0.3}} end,
  outputs = {"final.number", "final.t_over_tff"},
}
LUA
for ext in csv jsonl; do
  "$bin" sweep miss.lua --jobs 2 --out "miss.$ext" 2> "miss.$ext.err"
  st=$?
  check "misspelt output is an error ($ext)" test "$st" -ne 0
  check "misspelt output named with did-you-mean ($ext)" grep -q \
    "output 'final.t_over_tff' is missing from evaluate's result at point 1 ('final' has the keys number, t_over_tf); did you mean 'final.t_over_tf'?" "miss.$ext.err"
  check "no rows and no completion marker ($ext)" test "$(grep -c '^[{0-9]' "miss.$ext")" -eq 0 -a ! -e "miss.$ext.done"
done
# "name?" marks an output that may be absent: empty cells there, identical on --resume.
sed -i 's/"final.t_over_tff"/"final.t_over_tff?"/' miss.lua
"$bin" sweep miss.lua --jobs 2 --out opt.csv 2>/dev/null
check "optional output gives empty cells" grep -q $'^50,1,1,,\r$' opt.csv
head -c 300 opt.csv > optcut.csv && rm -f optcut.csv.done
"$bin" sweep miss.lua --out optcut.csv --resume 2>/dev/null
check "optional output resumes byte-identically" cmp -s opt.csv optcut.csv

# The demo plan's sweep: points 5049-5052 of its 10 000 (slice 1263 of 2500), 2 jobs.
# Each row must carry a verdict consistent with the fermionic threshold T/T_F <= 0.5 (docs/api: the plan's default threshold).
demo=$here/../../scripts/examples/sweep_tidewater.lua
"$bin" sweep "$demo" --jobs 2 --shard 1263/2500 --out demo.csv 2>/dev/null
f=demo.1263-of-2500.csv
check "demo plan sweep: 4 rows" test "$(wc -l < "$f")" -eq 5
check "demo plan sweep: header" grep -q '^point,ramp_rate,electric_field,final.number,final.temperature,final.t_over_tf,degenerate,limiting_stage,error' "$f"
check "demo plan sweep: points 5049-5052" awk -F, 'NR > 1 && $1 != 5047 + NR { exit 1 }' "$f"
check "demo plan sweep: verdict agrees with T/T_F <= 0.5" \
  awk -F, 'NR > 1 && !(($6 <= 0.5 && $7 == "true") || ($6 > 0.5 && $7 == "false")) { exit 1 }' "$f"

exit $((fails > 0))
