#!/usr/bin/env bash
# Start-up time and resident memory of the coldprep program (targets: `coldprep -e ''`
# under 15 ms and at most 2x the stock interpreter's instructions, the REPL waiting at its
# prompt under 10 MB).
#   bench_cli.sh COLDPREP CLI_PTY      (scripts/bench passes build/coldprep and
#                                       build/tests/cli_pty)
# Start-up: wall time of 100 runs of `coldprep -e ''`, best of 3 rounds, less nothing
# (process creation is included, as a user sees it).  Memory: VmRSS from /proc of a REPL
# on a pseudo-terminal, read while it waits at its prompt.
set -euo pipefail
coldprep=$1
cli_pty=$2
ms() { date +%s%N; }

best=
for round in 1 2 3; do
  t0=$(ms)
  for _ in $(seq 100); do "$coldprep" -e ''; done
  t1=$(ms)
  per=$(((t1 - t0) / 1000000)) # per run, in units of 0.01 ms
  if [ -z "$best" ] || [ "$per" -lt "$best" ]; then best=$per; fi
done
printf "start-up of coldprep -e '': %d.%02d ms per run (best of 3 x 100; target < 15 ms)\n" \
  $((best / 100)) $((best % 100))

# Instruction counts (valgrind's callgrind; unaffected by the load of a shared machine):
# coldprep -e '' against the stock interpreter's lua5.4 -e '' (target: at most 2x).
if command -v valgrind >/dev/null && command -v lua5.4 >/dev/null; then
  count() { valgrind --tool=callgrind --callgrind-out-file=/dev/null "$@" 2>&1 |
    awk '/Collected/ {print $4}'; }
  ours=$(count "$coldprep" -e '')
  stock=$(count lua5.4 -e '')
  awk -v a="$ours" -v b="$stock" 'BEGIN { printf "instructions: coldprep -e \047\047 %.2f M, lua5.4 -e \047\047 %.2f M (%.1fx; target <= 2x)\n", a / 1e6, b / 1e6, a / b }'
fi

state=$(mktemp -d)
trap 'rm -rf "$state"' EXIT
printf 'expect coldprep> \nsleep 1500\nsend \\x04\nexit 0\n' >"$state/script"
XDG_STATE_HOME=$state TERM=dumb INPUTRC=/dev/null "$cli_pty" -- "$coldprep" <"$state/script" &
driver=$!
rss=
for _ in $(seq 50); do
  sleep 0.05
  pid=$(pgrep -P "$driver" || true)
  if [ -n "$pid" ] && [ -r "/proc/$pid/status" ]; then
    sleep 0.5 # let it reach the prompt
    rss=$(awk '/^VmRSS:/ { print $2 }' "/proc/$pid/status")
    break
  fi
done
wait "$driver"
echo "REPL resident memory at the prompt: ${rss:-?} kB (target < 10240 kB)"
[ -n "$rss" ] && [ "$best" -lt 1500 ] && [ "$rss" -lt 10240 ]
