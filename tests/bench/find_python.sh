#!/usr/bin/env bash
# Prints the first Python 3 that has numpy and scipy (the comparisons tests/bench/compare_*.py
# need them): $COLDPREP_PYTHON if set, then python3 on the PATH, then /usr/bin/python3 (where
# Debian's python3-numpy and python3-scipy install).  Exit status 1, printing nothing, if
# there is none: neither the build nor the test suite needs them.
for p in "${COLDPREP_PYTHON:-}" python3 /usr/bin/python3; do
  if [ -n "$p" ] && "$p" -c 'import numpy, scipy' >/dev/null 2>&1; then
    command -v "$p"
    exit 0
  fi
done
exit 1
