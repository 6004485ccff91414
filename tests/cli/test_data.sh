# `coldprep data [SPECIES]`: the built-in values with their publications and checks.
source "$(dirname "$0")/lib.sh"
cd "$tmp" || exit 1

# DATA-1: without a name every record is listed; the KRb dipole moment is the verified
# 0.566(17) D of K.-K. Ni et al., Science 322, 231 (2008), arXiv:0808.2963 (abstract).
run "$coldprep" data </dev/null
status DATA-1a 0
out_has DATA-1b "40K87Rb dipole_debye = 0.566 D +- 0.017  [measured, checked against the paper]"
out_has DATA-1c "arXiv:0808.2963"
out_has DATA-1d "87Rb mass_u = "
out_has DATA-1e "23Na87Rb#1 b0 = 347.64 G"

# DATA-2: a name keeps that species and its resonances only.
run "$coldprep" data RbCs </dev/null
status DATA-2a 0
out_has DATA-2b "87Rb133Cs dipole_debye = 1.225 D"
out_has DATA-2c "87Rb133Cs#1 b0 = 197.1 G"
out_lacks DATA-2d "40K87Rb"

# DATA-3: an unknown name or too many arguments is a usage error.
run "$coldprep" data Xx99 </dev/null
status DATA-3a 2
err_has DATA-3b "unknown"
run "$coldprep" data KRb NaK </dev/null
status DATA-3c 2
err_has DATA-3d "at most one species name"

# DATA-4: --help lists the subcommand.
run "$coldprep" --help </dev/null
out_has DATA-4 "data [SPECIES]"

finish
