/*
 * The temperature of a trapped ideal gas with a given energy per particle, at fixed number
 * and trap: the state a cloud rethermalises to after energy is added (heating by a removal
 * pulse, or the mean energy left behind by a uniform loss).  The energy per particle E/N(T)
 * of the Fermi and Bose models (cp_thermo_fermi, cp_thermo_bose; Butts & Rokhsar, PRA 55,
 * 4346 (1997); docs/models/thermo.md) rises monotonically with T, so the inverse is found
 * by Brent's method on ln T within a bracket grown by doubling.
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/thermo.h"
#include "thermo_int.h"

typedef struct energy_problem {
    const cp_thermo_trap *trap;
    cp_statistics stat;
} energy_problem;

/* E/N (J) at T = exp(log_t), NaN where the model refuses the temperature. */
static double energy_at(double log_t, void *params)
{
    const energy_problem *p = params;
    double t = exp(log_t);
    if (p->stat == CP_FERMION) {
        cp_thermo_fermi_result r;
        return cp_thermo_fermi(p->trap, t, &r, NULL) == CP_OK ? r.energy_per_particle : NAN;
    }
    cp_thermo_bose_result r;
    return cp_thermo_bose(p->trap, t, &r, NULL) == CP_OK ? r.energy_per_particle : NAN;
}

cp_status cp_thermo_temperature_from_energy(const cp_thermo_trap *trap, cp_statistics stat,
                                            double energy_per_particle, double *temperature,
                                            cp_error *err)
{
    static const char ctx[] = "thermo.temperature_from_energy";
    if (temperature)
        *temperature = NAN;
    if (!temperature)
        return cp_fail(err, CP_EINVAL, "%s: temperature is NULL", ctx);
    CP_TRY(cp_thermo_check_trap(trap, ctx, err));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    const double e_max = 3.0 * CP_KB * CP_MAX_TEMPERATURE; /* classical E/N at the cap */
    CP_TRY(cp_check_range(err, ctx, "energy_per_particle", energy_per_particle, "J", 0.0, e_max,
                          CP_LO_OPEN));
    energy_problem p = {trap, stat};
    /* Start at the classical temperature E/(3 k_B) and double or halve until the energy is
     * bracketed (a Fermi gas holds more energy than a classical one at the same T, a Bose
     * gas less), staying inside the models' range. */
    double hi = log(fmin(energy_per_particle / (3.0 * CP_KB), CP_MAX_TEMPERATURE));
    double lo = hi;
    const double step = log(2.0), log_t_max = log(CP_MAX_TEMPERATURE);
    while (!(energy_at(hi, &p) >= energy_per_particle)) {
        if (hi >= log_t_max)
            return cp_fail(err, CP_EINVAL,
                           "%s: energy_per_particle %.6g J is out of range; the gas reaches it "
                           "only above %g K", ctx, energy_per_particle, CP_MAX_TEMPERATURE);
        hi = fmin(hi + step, log_t_max);
    }
    for (;;) {
        double e = energy_at(lo, &p);
        if (e <= energy_per_particle)
            break;
        if (!(e == e) || lo - step < log(CP_MIN_TEMPERATURE))
            return cp_fail(err, CP_EINVAL,
                           "%s: energy_per_particle %.6g J is out of range; it is below the "
                           "energy the models reach at their lowest temperature (for fermions "
                           "the Fermi sea holds 3/4 E_F per particle at T = 0)",
                           ctx, energy_per_particle);
        lo -= step;
    }
    double log_t;
    if (lo == hi)
        log_t = lo;
    else
        CP_TRY(cp_thermo_brent(energy_at, &p, energy_per_particle, lo, hi, &log_t, ctx, err));
    *temperature = exp(log_t);
    return CP_OK;
}
