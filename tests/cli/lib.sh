# Shared by the CLI tests (sourced, not a test itself): runs the coldprep binary given as
# $1 and counts checks.  Every check has an id (PIPE-3, RUN-7, ...) printed on failure
# with what the program wrote.  HOME and XDG_STATE_HOME point into a temporary directory
# so no test reads or writes the user's history.
set -u
abspath() { [ -z "$1" ] || echo "$(cd "$(dirname "$1")" && pwd)/$(basename "$1")"; }
coldprep=$(abspath "${1:?usage: $0 COLDPREP_BINARY [CLI_PTY_BINARY]}")
cli_pty=$(abspath "${2:-}")
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
export HOME=$tmp/home XDG_STATE_HOME=$tmp/state
unset COLDPREP_TRACEBACK
checks=0
failures=0
out= err= rc=

# run CMD...: runs CMD with the current stdin; sets $out, $err (trailing newlines
# stripped) and $rc.
run() {
  "$@" >"$tmp/stdout" 2>"$tmp/stderr"
  rc=$?
  out=$(cat "$tmp/stdout")
  err=$(cat "$tmp/stderr")
}

# session TEXT [ARGS...]: a piped REPL session with TEXT as its input.
session() {
  local input=$1
  shift
  run "$coldprep" "$@" <<<"$input"
}

fail() {
  failures=$((failures + 1))
  {
    echo "FAIL $1: $2"
    echo "  exit status: $rc"
    echo "  stdout: $(printf '%s' "$out" | sed '2,$s/^/          /')"
    echo "  stderr: $(printf '%s' "$err" | sed '2,$s/^/          /')"
  } >&2
}

# status ID WANT: the last run exited with status WANT
status() {
  checks=$((checks + 1))
  [ "$rc" = "$2" ] || fail "$1" "exit status $rc, want $2"
}
# out_is ID TEXT / out_has ID TEXT / out_lacks ID TEXT: stdout equals / contains / lacks TEXT
out_is() {
  checks=$((checks + 1))
  [ "$out" = "$2" ] || fail "$1" "stdout is not exactly: $2"
}
out_has() {
  checks=$((checks + 1))
  [[ $out == *"$2"* ]] || fail "$1" "stdout lacks: $2"
}
out_lacks() {
  checks=$((checks + 1))
  [[ $out != *"$2"* ]] || fail "$1" "stdout should not contain: $2"
}
# err_is ID TEXT / err_has ID TEXT: stderr equals / contains TEXT
err_is() {
  checks=$((checks + 1))
  [ "$err" = "$2" ] || fail "$1" "stderr is not exactly: $2"
}
err_has() {
  checks=$((checks + 1))
  [[ $err == *"$2"* ]] || fail "$1" "stderr lacks: $2"
}

finish() {
  echo "$(basename "$0"): $((checks - failures)) of $checks checks passed"
  [ "$failures" -eq 0 ]
}
