/*
 * Spatial structure of the trapped ideal gas: the local density in the local-density
 * approximation and the rms cloud sizes in the trap and after a ballistic time of flight.
 * LDA: the gas at r is a uniform gas with local fugacity z e^{-V(r)/k_BT},
 * V = m sum omega_i^2 r_i^2 / 2, so n(r) = -Li_{3/2}(-z e^{-V/k_BT})/lambda^3 (fermions) or
 * Li_{3/2}(z e^{-V/k_BT})/lambda^3 (thermal bosons).  Time of flight: the phase-space
 * distribution of a non-interacting gas in a harmonic trap is a function of the energy,
 * each of the six quadratic terms carrying E/(6N) on average (equipartition of the
 * harmonic Hamiltonian's quadratic terms holds for any f(H): virial theorem), so
 * <x_i^2>(t) = <x_i^2> + <p_i^2> t^2 / m^2 = E/(3 N m omega_i^2) (1 + omega_i^2 t^2).
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "thermo_int.h"

cp_status cp_thermo_density(const cp_thermo_trap *trap, cp_statistics stat, double temperature,
                            const double r[3], cp_thermo_density_result *out, cp_error *err)
{
    static const char *const names[3] = {"x", "y", "z"};
    const char *ctx = "thermo.density";
    cp_poison(&out->density, 3);
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    if (!r)
        return cp_fail(err, CP_EINVAL, "%s: position is NULL", ctx);
    for (int i = 0; i < 3; i++)
        CP_TRY(cp_check_range(err, ctx, names[i], r[i], "m", -1.0, 1.0, CP_CLOSED));
    double v = 0.0;
    for (int i = 0; i < 3; i++)
        v += 0.5 * trap->mass * trap->omega[i] * trap->omega[i] * r[i] * r[i];
    double beta_v = v / (CP_KB * temperature);
    double lambda = cp_thermo_debroglie(trap->mass, temperature);
    double l3 = lambda * lambda * lambda;
    double thermal, condensate = 0.0;
    if (stat == CP_FERMION) {
        cp_thermo_fermi_result f;
        CP_TRY(cp_thermo_fermi(trap, temperature, &f, err));
        CP_TRY(cp_thermo_fd(1, f.log_fugacity - beta_v, &thermal, err));
        thermal /= l3;
    } else {
        cp_thermo_bose_result b;
        CP_TRY(cp_thermo_bose(trap, temperature, &b, err));
        double li;
        CP_TRY(cp_polylog(1.5, b.fugacity * exp(-beta_v), &li, err));
        thermal = li / l3;
        if (b.condensed_fraction > 0.0) {
            /* |psi_0|^2 of the oscillator ground state, a_i = sqrt(hbar / (m omega_i)). */
            double g = 1.0;
            for (int i = 0; i < 3; i++) {
                double a = sqrt(CP_HBAR / (trap->mass * trap->omega[i]));
                g *= exp(-r[i] * r[i] / (a * a)) / (sqrt(CP_PI) * a);
            }
            condensate = b.condensed_fraction * trap->number * g;
        }
    }
    out->density = thermal + condensate;
    out->thermal_density = thermal;
    out->condensate_density = condensate;
    return CP_OK;
}

cp_status cp_thermo_tof(const cp_thermo_trap *trap, cp_statistics stat, double temperature,
                        double time, cp_thermo_tof_result *out, cp_error *err)
{
    const char *ctx = "thermo.tof";
    cp_poison(out->sigma_trap, 12);
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    CP_TRY(cp_check_range(err, ctx, "time", time, "s", 0.0, 10.0, CP_CLOSED));
    double e_thermal; /* energy per non-condensed particle, J */
    double n0frac = 0.0;
    if (stat == CP_FERMION) {
        cp_thermo_fermi_result f;
        CP_TRY(cp_thermo_fermi(trap, temperature, &f, err));
        e_thermal = f.energy_per_particle;
    } else {
        cp_thermo_bose_result b;
        CP_TRY(cp_thermo_bose(trap, temperature, &b, err));
        n0frac = b.condensed_fraction;
        /* The condensate carries no energy in the semiclassical limit. */
        e_thermal = b.energy_per_particle / (1.0 - n0frac);
    }
    for (int i = 0; i < 3; i++) {
        double w = trap->omega[i];
        double expand = sqrt(1.0 + w * w * time * time);
        out->sigma_trap[i] = sqrt(e_thermal / (3.0 * trap->mass * w * w));
        out->sigma_tof[i] = out->sigma_trap[i] * expand;
        if (n0frac > 0.0) {
            out->condensate_sigma_trap[i] = sqrt(CP_HBAR / (2.0 * trap->mass * w));
            out->condensate_sigma_tof[i] = out->condensate_sigma_trap[i] * expand;
        }
    }
    return CP_OK;
}
