#!/usr/bin/env bash
# The agreement part of the comparisons with Python references, for ctest: the Raman
# reference case against scipy's DOP853 integration of the same master equation (to the
# kernel's accuracy 1e-8) and 1000 x 5 band energies against numpy's eigvalsh (1e-10
# relative), both written independently in tests/bench/compare_*.py.  Given the
# compare_kernels program as $1.  Skipped (exit 77) when no python3 with numpy and scipy is
# found.
set -u
here=$(cd "$(dirname "$0")" && pwd)
if ! py=$(bash "$here/find_python.sh"); then
  echo "skipped: no python3 with numpy and scipy (Debian: python3-numpy python3-scipy)"
  exit 77
fi
status=0
"$py" "$here/compare_raman.py" "$1" --check || status=1
"$py" "$here/compare_lattice.py" "$1" --check || status=1
exit $status
