#!/usr/bin/env python3
"""Band energies of the 1D optical lattice against numpy's batched eigvalsh, same run.

The problem (docs/models/lattice.md): V(x) = V0 sin^2(kx) at V0 = 10 E_r, the lowest 5 bands
at 1000 quasimomenta q_i = -1 + 2i/999 (units of k, first Brillouin zone [-1, 1]), energies
in E_r from the potential minimum.  In the plane-wave basis e^{i(q + 2l)kx}, l = -L..L, the
Hamiltonian is real symmetric tridiagonal: diagonal (q + 2l)^2 + V0/2, off-diagonal -V0/4
(from sin^2 = 1/2 - (e^{2ikx} + e^{-2ikx})/4; Bloch's theorem, Ashcroft & Mermin, Solid State
Physics (1976), Ch. 9).  This script builds the 1000 matrices as one stacked (1000, n, n)
array with n the basis size the C kernel chose (23 here) and takes
numpy.linalg.eigvalsh of the stack (LAPACK's dense symmetric solver, a different method from
the kernel's Sturm sequences and Newton iteration).

It times, in one run and interleaved so that both see the same load, the C kernel
cp_lattice_band_energies (through build/tests/compare_kernels, the kernel alone) and
eigvalsh alone (building the stack is timed apart and not counted), prints both, their
ratio, the load average, and the largest relative difference of the energies, which must be
within 1e-10 (exit status 1 otherwise).  A basis 20 plane waves larger checks that the
basis size is converged.

    compare_lattice.py PATH/TO/compare_kernels [--check]

--check: only the agreement (no timing), for the test suite.
"""
import os
import subprocess
import sys
import time

import numpy as np

DEPTH_ER = 10.0
BANDS = 5
NQ = 1000
AGREEMENT = 1e-10  # relative, asked of the energies


def hamiltonians(q, n):
    """The stacked (len(q), n, n) plane-wave Hamiltonians, n = 2L + 1, in E_r."""
    half = n // 2
    l = np.arange(-half, half + 1)
    h = np.zeros((len(q), n, n))
    i = np.arange(n)
    h[:, i, i] = (q[:, None] + 2.0 * l[None, :]) ** 2 + DEPTH_ER / 2
    h[:, i[:-1], i[1:]] = -DEPTH_ER / 4
    h[:, i[1:], i[:-1]] = -DEPTH_ER / 4
    return h


def run_c(kernels, reps):
    out = subprocess.run([kernels, "bands", str(reps)], check=True, capture_output=True,
                         text=True).stdout.splitlines()
    times = np.array([float(x) for x in out[0].split()[1:]])
    basis = int(out[1].split()[1])
    rows = np.array([[float(x) for x in line.split()] for line in out[2:]])
    return times, basis, rows[:, 0], rows[:, 1:]


def load():
    return "load average %.2f %.2f %.2f" % os.getloadavg()


def main():
    if len(sys.argv) not in (2, 3) or (len(sys.argv) == 3 and sys.argv[2] != "--check"):
        sys.exit("usage: compare_lattice.py PATH/TO/compare_kernels [--check]")
    kernels, check_only = sys.argv[1], len(sys.argv) == 3
    print(load())
    _, basis, q_c, e_c = run_c(kernels, 1)
    q = -1.0 + 2.0 * np.arange(NQ) / (NQ - 1)
    if e_c.shape != (NQ, BANDS) or np.max(np.abs(q_c - q)) > 0:
        sys.exit("compare_lattice: the C kernel did not solve the same quasimomenta")
    stack = hamiltonians(q, basis)
    e_np = np.linalg.eigvalsh(stack)[:, :BANDS]
    e_big = np.linalg.eigvalsh(hamiltonians(q, basis + 20))[:, :BANDS]
    diff = np.max(np.abs(e_c - e_np) / np.abs(e_np))
    print("basis %d plane waves; largest |E_C - E_numpy| / E over %d x %d energies: %.1e "
          "(%.1e E_r absolute) %s" % (basis, NQ, BANDS, diff, np.max(np.abs(e_c - e_np)),
                                      "ok" if diff <= AGREEMENT else "DISAGREE"))
    print("numpy with %d plane waves against %d: largest difference %.1e E_r (basis converged)"
          % (basis + 20, basis, np.max(np.abs(e_big - e_np))))
    if check_only:
        return 0 if diff <= AGREEMENT else 1

    c_times, np_times, build_times = [], [], []
    for _ in range(3):  # interleaved rounds: both see the same load
        c_times.extend(run_c(kernels, 30)[0])
        for _ in range(10):
            t0 = time.perf_counter()
            h = hamiltonians(q, basis)
            t1 = time.perf_counter()
            np.linalg.eigvalsh(h)
            np_times.append((time.perf_counter() - t1) * 1e6)
            build_times.append((t1 - t0) * 1e6)
    c_med, np_med = np.median(c_times), np.median(np_times)
    print("C kernel (cp_lattice_band_energies): median %.0f us, best %.0f us over %d calls"
          % (c_med, min(c_times), len(c_times)))
    print("numpy.linalg.eigvalsh on the (%d, %d, %d) stack: median %.0f us, best %.0f us over %d"
          " calls (building the stack, not counted: median %.0f us)"
          % (NQ, basis, basis, np_med, min(np_times), len(np_times), np.median(build_times)))
    ratio = np_med / c_med
    print("ratio numpy / C: %.1fx (medians), %.1fx (bests); target >= 30x: %s"
          % (ratio, min(np_times) / min(c_times), "met" if ratio >= 30 else "not met"))
    print(load())
    return 0 if diff <= AGREEMENT else 1


if __name__ == "__main__":
    sys.exit(main())
