#!/usr/bin/env python3
"""The Raman reference case against scipy's DOP853, measured in the same run.

The reference case (docs/models/raman.md): Gaussian pulses Omega(t) = rabi exp(-(t - t_c)^2 /
width^2), Omega_p = Omega_s = 2 pi x 5 MHz, width 2 us, the Stokes pulse centred at -delay/2
and the pump at +delay/2 with delay 2.4 us, window [-delay/2 - 5 width, delay/2 + 5 width],
decay of |2> at gamma = 2 pi x 6 MHz into a sink, Delta = delta = 0, independent lasers of
1 kHz Lorentzian FWHM, rho(t_start) = |1><1|.

This script builds the same master equation on its own, in a different form from core/: a
4 x 4 density matrix over |1>, |2>, |3> and the sink |0>, the rotating-wave Hamiltonian
H = [[0, Op/2, 0], [Op/2, -Delta, Os/2], [0, Os/2, -delta]] (Bergmann, Theuer & Shore, RMP 70,
1003 (1998)) and the jump operators sqrt(gamma)|0><2|, sqrt(2 pi dnu_p)(P2 + P3),
sqrt(2 pi dnu_s) P3 assembled into the Liouvillian superoperator with Kronecker products
(Lindblad form, drho/dt = -i[H, rho] + sum_k L rho L^+ - {L^+ L, rho}/2), and integrates it
with scipy.integrate.solve_ivp(method="DOP853").

It then times, in one run and interleaved so that both see the same load: the C kernel
cp_raman_transfer at its default accuracy 1e-8 (through build/tests/compare_kernels, the
kernel alone) and the scipy integration at the loosest tolerance whose final populations
are within 1e-8 of a tight scipy run (rtol = atol = 1e-13).  It prints both, their ratio,
the load average, and the largest difference between the C populations and the tight
scipy ones, which must be within the C kernel's accuracy 1e-8 (exit status 1 otherwise).

    compare_raman.py PATH/TO/compare_kernels [--check]

--check: only the agreement (no timing), for the test suite.
"""
import math
import os
import subprocess
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

TWO_PI = 2.0 * np.pi
RABI = TWO_PI * 5e6  # rad/s, pump and Stokes
WIDTH = 2e-6  # s
DELAY = 2.4e-6  # s
GAMMA = TWO_PI * 6e6  # 1/s
DETUNING = 0.0  # Delta, rad/s
TWO_PHOTON = 0.0  # delta, rad/s
LINEWIDTH_HZ = 1e3  # pump and Stokes, Lorentzian FWHM
T_START = -DELAY / 2 - 5 * WIDTH
T_END = DELAY / 2 + 5 * WIDTH
ACCURACY = 1e-8  # asked of the final populations, both sides
N = 4  # |1>, |2>, |3>, sink |0> (indices 0, 1, 2, 3)


def ket_bra(i, j):
    m = np.zeros((N, N), dtype=complex)
    m[i, j] = 1.0
    return m


def commutator_super(h):
    """-i[h, .] as a superoperator on row-major vec(rho): vec(A rho B) = (A kron B^T) vec."""
    one = np.eye(N)
    return -1j * (np.kron(h, one) - np.kron(one, h.T))


def dissipator_super(ops):
    one = np.eye(N)
    d = np.zeros((N * N, N * N), dtype=complex)
    for op in ops:
        k = op.conj().T @ op
        d += np.kron(op, op.conj()) - 0.5 * (np.kron(k, one) + np.kron(one, k.T))
    return d


def liouvillian_parts():
    """Constant part, part per unit pump Rabi frequency, part per unit Stokes one."""
    h0 = -DETUNING * ket_bra(1, 1) - TWO_PHOTON * ket_bra(2, 2)
    hp = 0.5 * (ket_bra(0, 1) + ket_bra(1, 0))  # Omega_p/2 couples |1> and |2>
    hs = 0.5 * (ket_bra(1, 2) + ket_bra(2, 1))  # Omega_s/2 couples |2> and |3>
    jumps = [
        np.sqrt(GAMMA) * ket_bra(3, 1),  # |2> decays into the sink
        np.sqrt(TWO_PI * LINEWIDTH_HZ) * (ket_bra(1, 1) + ket_bra(2, 2)),  # pump phase
        np.sqrt(TWO_PI * LINEWIDTH_HZ) * ket_bra(2, 2),  # Stokes phase
    ]
    return np.vstack([commutator_super(h0) + dissipator_super(jumps),
                      commutator_super(hp), commutator_super(hs)])


PARTS = liouvillian_parts()  # (3 * 16, 16)


def rhs(t, y):
    z = (PARTS @ y).reshape(3, N * N)
    pump = RABI * math.exp(-((t - DELAY / 2) / WIDTH) ** 2)
    stokes = RABI * math.exp(-((t + DELAY / 2) / WIDTH) ** 2)
    return z[0] + pump * z[1] + stokes * z[2]


H_PUMP = 0.5 * (ket_bra(0, 1) + ket_bra(1, 0))
H_STOKES = 0.5 * (ket_bra(1, 2) + ket_bra(2, 1))
JUMPS = [np.sqrt(GAMMA) * ket_bra(3, 1),
         np.sqrt(TWO_PI * LINEWIDTH_HZ) * (ket_bra(1, 1) + ket_bra(2, 2)),
         np.sqrt(TWO_PI * LINEWIDTH_HZ) * ket_bra(2, 2)]
JUMPS_DAGGER = [op.conj().T for op in JUMPS]
JUMPS_K = [op.conj().T @ op for op in JUMPS]


def rhs_textbook(t, y):
    """The same equation with the Lindblad form evaluated as matrix products at every call
    (Delta = delta = 0), for the record: how much the ratio depends on the Python side."""
    rho = y.reshape(N, N)
    h = (RABI * math.exp(-((t - DELAY / 2) / WIDTH) ** 2) * H_PUMP
         + RABI * math.exp(-((t + DELAY / 2) / WIDTH) ** 2) * H_STOKES)
    d = -1j * (h @ rho - rho @ h)
    for op, dag, k in zip(JUMPS, JUMPS_DAGGER, JUMPS_K):
        d += op @ rho @ dag - 0.5 * (k @ rho + rho @ k)
    return d.ravel()


def solve(tol, fun=rhs):
    """Final populations (rho_11, rho_22, rho_33, sink), RHS calls and steps at rtol = atol =
    tol; steps at most width/2, as in the C kernel."""
    y0 = np.zeros(N * N, dtype=complex)
    y0[0] = 1.0
    sol = solve_ivp(fun, (T_START, T_END), y0, method="DOP853", rtol=tol, atol=tol,
                    max_step=WIDTH / 2)
    if not sol.success:
        sys.exit("compare_raman: solve_ivp failed: " + sol.message)
    rho = sol.y[:, -1].reshape(N, N)
    return np.real(np.diag(rho)), sol.nfev, len(sol.t) - 1


def run_c(kernels, reps):
    out = subprocess.run([kernels, "raman", str(reps)], check=True, capture_output=True,
                         text=True).stdout
    fields = {line.split()[0]: line.split()[1:] for line in out.splitlines()}
    times = np.array([float(x) for x in fields["times_us"]])
    pops = np.array([float(x) for x in fields["populations"] + fields["lost"]])
    window = [float(x) for x in fields["window"]]
    return times, pops, window, int(fields["steps"][0])


def load():
    return "load average %.2f %.2f %.2f" % os.getloadavg()


def main():
    if len(sys.argv) not in (2, 3) or (len(sys.argv) == 3 and sys.argv[2] != "--check"):
        sys.exit("usage: compare_raman.py PATH/TO/compare_kernels [--check]")
    kernels, check_only = sys.argv[1], len(sys.argv) == 3
    print(load())
    _, c_pops, window, c_steps = run_c(kernels, 1)
    if max(abs(window[0] - T_START), abs(window[1] - T_END)) > 1e-9 * WIDTH:
        sys.exit("compare_raman: the C window %r is not [%g, %g] s" % (window, T_START, T_END))
    tight, nfev, steps = solve(1e-13)
    diff = np.max(np.abs(c_pops - tight))
    print("populations (rho_11, rho_22, rho_33, sink): C %s, scipy DOP853 at 1e-13 %s"
          % (np.array2string(c_pops, precision=10), np.array2string(tight, precision=10)))
    print("largest |C - scipy| over the four populations: %.2e (C accuracy %.0e) %s"
          % (diff, ACCURACY, "ok" if diff <= ACCURACY else "DISAGREE"))
    if check_only:
        return 0 if diff <= ACCURACY else 1

    # the loosest tolerance that gives the final populations to ACCURACY (fairest to scipy)
    for tol in [10.0 ** -k for k in range(5, 13)]:
        pops, nfev, steps = solve(tol)
        err = np.max(np.abs(pops - tight))
        print("scipy DOP853 rtol = atol = %.0e: %d steps, %d RHS calls, error %.1e"
              % (tol, steps, nfev, err))
        if err <= ACCURACY:
            break
    c_times, py_times = [], []
    for _ in range(3):  # interleaved rounds: both see the same load
        c_times.extend(run_c(kernels, 201)[0])
        for _ in range(5):
            t0 = time.perf_counter()
            solve(tol)
            py_times.append((time.perf_counter() - t0) * 1e6)
    c_med, py_med = np.median(c_times), np.median(py_times)
    print("C kernel (cp_raman_transfer, accuracy 1e-8, %d steps): median %.1f us, best %.1f us"
          " over %d transfers" % (c_steps, c_med, min(c_times), len(c_times)))
    print("scipy DOP853 (rtol = atol = %.0e, %d steps, %d RHS calls): median %.0f us, best %.0f"
          " us over %d solves" % (tol, steps, nfev, py_med, min(py_times), len(py_times)))
    y = np.zeros(N * N, dtype=complex)
    y[0] = 1.0
    t0 = time.perf_counter()
    for _ in range(2000):
        rhs(0.0, y)
    print("  of which the right-hand side alone: %.1f us per call"
          % ((time.perf_counter() - t0) / 2000 * 1e6))
    ratio = py_med / c_med
    print("ratio scipy / C: %.0fx (medians), %.0fx (bests); target >= 1500x: %s"
          % (ratio, min(py_times) / min(c_times), "met" if ratio >= 1500 else "not met"))
    text_times = []
    for _ in range(5):
        t0 = time.perf_counter()
        text_pops = solve(tol, rhs_textbook)[0]
        text_times.append((time.perf_counter() - t0) * 1e6)
    print("the same with the Lindblad terms as matrix products at every call: median %.0f us "
          "(%.0fx the C kernel), populations within %.1e of the superoperator form"
          % (np.median(text_times), np.median(text_times) / c_med,
             np.max(np.abs(text_pops - pops))))
    print(load())
    return 0 if diff <= ACCURACY else 1


if __name__ == "__main__":
    sys.exit(main())
