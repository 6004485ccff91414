#!/usr/bin/env bash
# The fuzzers of tests/fuzz, bounded for ctest: the public Lua API (fuzz_api.lua,
# COLDPREP_FUZZ_CALLS calls, default 6000, the same ones for a given seed, stopped after
# COLDPREP_FUZZ_SECONDS, default 40, on a slow machine: a prefix of the same calls), the sweep file reader (fuzz_files.lua,
# COLDPREP_FUZZ_FILES mutations per format, default 300), and `coldprep sweep --resume`
# on sweep outputs and journals cut at every offset or mutated at random.  The seed is
# COLDPREP_FUZZ_SEED (default 20261202); a longer run on demand:
#   COLDPREP_FUZZ_CALLS=1000000 COLDPREP_FUZZ_SECONDS=600 COLDPREP_FUZZ_FILES=20000 \
#     bash tests/cli/test_fuzz.sh build/coldprep
# A call that crashes the process or makes no progress for 15 s is a finding (the call in
# progress is named); so is every API finding not listed in tests/fuzz/known.txt.
set -uo pipefail
bin=$(realpath "$1")
here=$(cd "$(dirname "$0")" && pwd)
fuzz=$here/../fuzz
ncalls=${COLDPREP_FUZZ_CALLS:-6000}
seconds=${COLDPREP_FUZZ_SECONDS:-40}
files=${COLDPREP_FUZZ_FILES:-300}
seed=${COLDPREP_FUZZ_SEED:-20261202}
dir=$(mktemp -d -p /dev/shm 2>/dev/null || mktemp -d)
trap 'rm -rf "$dir"' EXIT
cd "$dir"
fails=0
check() { # check NAME COMMAND...
  if "${@:2}"; then echo "ok   $1"; else echo "FAIL $1"; fails=$((fails + 1)); fi
}
echo "fuzz seed $seed, $ncalls API calls (at most $seconds s), $files file mutations per format"

# ---- the API: batches until the CPU budget is spent; a hang or crash skips its call ----
start=1
calls=0
t0=$(date +%s)
: > findings.txt
while :; do
  left=$((seconds - ($(date +%s) - t0)))
  [ "$left" -le 0 ] || [ "$start" -gt "$ncalls" ] && break
  : > progress.txt
  "$bin" "$fuzz/fuzz_api.lua" "$seed" "$start" $((ncalls - start + 1)) progress.txt "$left" \
    > batch.txt 2> batch.err < /dev/null &
  pid=$!
  hung=0
  while kill -0 "$pid" 2>/dev/null; do
    sleep 0.5
    age=$(( $(date +%s) - $(stat -c %Y progress.txt) ))
    if [ "$age" -gt 15 ]; then hung=1; kill -9 "$pid" 2>/dev/null; break; fi
  done
  wait "$pid" 2>/dev/null
  rc=$?
  grep -a '^FINDING' batch.txt >> findings.txt
  done_line=$(grep -a '^DONE' batch.txt)
  if [ -n "$done_line" ]; then
    set -- $done_line
    calls=$(($2 - 1))
    # a sanitizer's report at exit (leaks) changes the status after the last call
    [ "$rc" = 0 ] || { echo "FINDING $calls (exit) status $rc after the last call: $(tail -c 600 batch.err)" >> findings.txt; }
    break
  fi
  # the process died or hung: the call in progress is a finding; go on after it
  read -r idx fn rest < progress.txt
  kind=$([ "$hung" = 1 ] && echo "hang: no progress for 15 s" || echo "crash: exit status $rc")
  echo "FINDING $idx $fn $kind | args: ${rest:0:600}" >> findings.txt
  start=$((idx + 1))
  calls=$idx
done
check "the API fuzzer made $calls of $ncalls calls" test "$calls" -eq "$ncalls" -o "$calls" -ge 1000
unknown=0
while IFS= read -r line; do
  set -- $line
  fn=$3
  kind=${line#FINDING * * }
  known=0
  while IFS='|' read -r kfn kkind _; do
    case "$kfn" in ''|'#'*) continue ;; esac
    if [ "$kfn" = "$fn" ] && [ "${kind#"$kkind"}" != "$kind" ]; then known=1; break; fi
  done < "$fuzz/known.txt"
  if [ "$known" = 0 ]; then
    unknown=$((unknown + 1))
    [ "$unknown" -le 20 ] && echo "  $line" | cut -c1-700
  fi
done < findings.txt
echo "API findings: $(wc -l < findings.txt) ($unknown not in tests/fuzz/known.txt)"
cut -d' ' -f3-8 findings.txt | sort | uniq -c | sort -rn | head -30
check "every API finding is a known one" test "$unknown" -eq 0

echo "API part: $(( $(date +%s) - t0 )) s"
t1=$(date +%s)
# ---- the file reader -------------------------------------------------------------------
"$bin" "$fuzz/fuzz_files.lua" "$seed" "$files" "$dir" > files.txt 2>&1
rc=$?
check "the file fuzzer ran to the end (status $rc)" grep -q '^DONE' files.txt
check "the reader refused or read exactly every cut and mutation" test "$(grep -c '^FINDING' files.txt)" -eq 0
grep '^FINDING' files.txt | head -10

echo "file part: $(( $(date +%s) - t1 )) s"
# ---- coldprep sweep --resume on cut and mutated files ----------------------------------
cat > s.lua <<'LUA'
return {parameters = {{name = "x", values = {0.5, 3}}, {name = "k", values = {"a", "b"}}},
  outputs = {"v", "s"},
  evaluate = function(p)
    if p.x == 3 and p.k == "b" then error("no, \"x\",\nline", 0) end
    return {v = p.x / 3, s = p.k .. ', "q"'}
  end}
LUA
for fmt in csv jsonl; do
  "$bin" sweep s.lua --jobs 1 --out ref.$fmt 2>/dev/null
  size=$(stat -c %s ref.$fmt)
  bad=0
  for ((cut = 0; cut < size; cut++)); do
    head -c "$cut" ref.$fmt > cut.$fmt
    rm -f cut.$fmt.done cut.$fmt.pending
    "$bin" sweep s.lua --jobs 1 --out cut.$fmt --resume 2>/dev/null
    cmp -s cut.$fmt ref.$fmt || { bad=$((bad + 1)); echo "  $fmt cut at $cut: resume differs"; }
  done
  check "$fmt: --resume after a cut at each of $size offsets equals the whole run" test "$bad" -eq 0
  # the journal: rows 3-4 waiting for an unfinished point 2, cut at every offset
  head -n $([ $fmt = csv ] && echo 2 || echo 1) ref.$fmt > base.$fmt
  tail -n 2 ref.$fmt > journal.$fmt
  jsize=$(stat -c %s journal.$fmt)
  bad=0
  for ((cut = 0; cut < jsize; cut++)); do
    cp base.$fmt j.$fmt
    head -c "$cut" journal.$fmt > j.$fmt.pending
    "$bin" sweep s.lua --jobs 1 --out j.$fmt --resume 2>/dev/null
    cmp -s j.$fmt ref.$fmt || { bad=$((bad + 1)); echo "  $fmt journal cut at $cut: resume differs"; }
  done
  check "$fmt: --resume with the journal cut at each of $jsize offsets equals the whole run" \
    test "$bad" -eq 0
  # random bytes in the file or the journal: refused (status 1) or a file of whole,
  # ordered rows; never a crash
  bad=0
  for ((it = 1; it <= 40; it++)); do
    cp base.$fmt m.$fmt
    cp journal.$fmt m.$fmt.pending
    target=$([ $((it % 2)) = 0 ] && echo m.$fmt || echo m.$fmt.pending)
    tsize=$(stat -c %s "$target")
    pos=$(( (it * 7919 + seed) % tsize ))
    printf "\\x$(printf %02x $(( (it * 31 + seed) % 256 )))" |
      dd of="$target" bs=1 seek="$pos" conv=notrunc status=none
    "$bin" sweep s.lua --jobs 1 --out m.$fmt --resume 2> m.err
    rc=$?
    if [ "$rc" -ne 0 ] && [ "$rc" -ne 1 ]; then
      bad=$((bad + 1)); echo "  $fmt mutation $it: status $rc"
    elif [ "$rc" -eq 0 ] && ! "$bin" -e "local r = cp.sweep.read{path = 'm.$fmt'}
        for i, row in ipairs(r.rows) do assert(row.point == i) end assert(#r.rows == 4)" 2>/dev/null; then
      bad=$((bad + 1)); echo "  $fmt mutation $it: resumed file does not read back as 4 ordered rows"
    fi
    rm -f m.$fmt.done m.$fmt.pending
  done
  check "$fmt: 40 random bytes in file or journal: refused or whole, never a crash" test "$bad" -eq 0
done

exit $((fails > 0))
