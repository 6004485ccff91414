#!/usr/bin/env bash
# The demo (scripts/demo.lua) runs end to end, prints both budgets, their verdicts (the
# second flipped by one changed parameter: the protection of the molecules) and the safety
# cautions, with collision rates predicted for the protection.
set -euo pipefail
bin=$1
top=$(cd "$(dirname "$0")/../.." && pwd)
out=$("$bin" "$top/scripts/demo.lua")
fail() { echo "FAIL: $1"; exit 1; }
grep -q "Preparation budget: Tidewater lab, first NaK plan (microwave shielding)" <<<"$out" || fail "first budget"
grep -q "Preparation budget: Tidewater lab, NaK plan without shielding" <<<"$out" || fail "second budget"
grep -q "Verdict with microwave shielding: degenerate; without: not degenerate." <<<"$out" \
  || fail "flipped verdict"
grep -q "Class 4 laser" <<<"$out" || fail "laser caution"
# the STIRAP lasers (30 and 60 mW) are between 5 mW and 0.5 W: Class 3B (IEC 60825-1,
# docs/planning.md [M])
flat=$(tr -s ' \n' '  ' <<<"$out")   # the report wraps its lines
grep -q "Class 3B laser (beam power 5 mW to 0.5 W): stage 3 (transfer): pump laser of the two-photon transfer, 30 mW" <<<"$flat" \
  || fail "Class 3B caution for the STIRAP lasers"
grep -q "High-current coils" <<<"$out" || fail "coil caution"
grep -q "High voltage" <<<"$out" || fail "high-voltage caution"
grep -q "Microwave sources for shielding" <<<"$out" || fail "microwave caution"
flat_has() { grep -q "$1" <<<"$flat" || fail "$2"; }
flat_has "collision rates predicted for microwave shielding" "predicted rates in the protected plan"
flat_has "no protection from loss" "the unprotected plan says it loses fast"
grep -q "laser safety officer" <<<"$out" || fail "deference to the laser safety officer"
echo "demo ok"
