/*
 * Two-body collision parameters of ultracold molecules from the van der Waals C6 and the
 * dipole moment: the Gribakin-Flambaum mean scattering length, the centrifugal barrier,
 * the universal loss rate coefficients and the threshold dipolar elastic cross section;
 * also the argument checks shared with collisions_hold.c and collisions_evap.c.  Formulas
 * and sources: docs/models/collisions.md; the dipolar cross-section factors are the Born
 * threshold values (Bohn, Cavagnero & Ticknor, NJP 11, 055039 (2009), arXiv:0901.1281;
 * the factors themselves not read there, docs/data.md "Model constants").
 */
#include "coldprep/collisions.h"

#include <math.h>

#include "check_int.h"
#include "collisions_int.h"
#include "coldprep/consts.h"
#include "vdw_int.h"

/* The 1513 of Idziaszek & Julienne, PRL 104, 113202 (2010), for K_p = 1513 abar^3 k_BT/h
 * (identical fermions, thermal average, g = 2 included). */
#define CP_UNIVERSAL_PWAVE 1513.0

static cp_status check_c6_mu(const char *ctx, double c6_au, double reduced_mass,
                             cp_error *err)
{
    CP_TRY(cp_check_range(err, ctx, "c6_au", c6_au, "a.u.", CP_MIN_C6_AU, 1e9, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "mass (reduced)", reduced_mass, "kg", 1e-28, 1e-22,
                          CP_LO_OPEN));
    return CP_OK;
}

static cp_status check_pair(const char *ctx, cp_pair_statistics stat, cp_error *err)
{
    if (stat != CP_PAIR_BOSONS && stat != CP_PAIR_FERMIONS && stat != CP_PAIR_DISTINGUISHABLE)
        return cp_fail(err, CP_EINVAL,
                       "%s: statistics %d is not bosons, fermions or distinguishable", ctx,
                       (int)stat);
    return CP_OK;
}

cp_status cp_collisions_mean_scattering_length(double c6_au, double reduced_mass,
                                               double *abar, cp_error *err)
{
    *abar = NAN;
    CP_TRY(check_c6_mu("collisions.mean_scattering_length", c6_au, reduced_mass, err));
    *abar = cp_vdw_mean_scattering_length(c6_au, reduced_mass);
    return CP_OK;
}

cp_status cp_collisions_barrier(double c6_au, double reduced_mass, int l, double *energy,
                                cp_error *err)
{
    *energy = NAN;
    CP_TRY(check_c6_mu("collisions.barrier", c6_au, reduced_mass, err));
    CP_TRY(cp_check_int_range(err, "collisions.barrier", "partial wave l", l, 1, 20));
    double c6 = c6_au * CP_AU_C6;
    double a = CP_HBAR * CP_HBAR * l * (l + 1.0);
    *energy = pow(a, 1.5) / (3.0 * sqrt(6.0) * pow(reduced_mass, 1.5) * sqrt(c6));
    return CP_OK;
}

cp_status cp_collisions_universal_rate(double c6_au, double reduced_mass, double temperature,
                                       cp_pair_statistics stat, double *rate, cp_error *err)
{
    const char *ctx = "collisions.universal_rate";
    *rate = NAN;
    CP_TRY(check_pair(ctx, stat, err));
    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE, CP_MAX_TEMPERATURE,
                          CP_CLOSED));
    double abar;
    CP_TRY(check_c6_mu(ctx, c6_au, reduced_mass, err));
    CP_TRY(cp_collisions_mean_scattering_length(c6_au, reduced_mass, &abar, err));
    switch (stat) {
    case CP_PAIR_BOSONS: *rate = 2.0 * 4.0 * CP_PI * CP_HBAR * abar / reduced_mass; break;
    case CP_PAIR_DISTINGUISHABLE: *rate = 4.0 * CP_PI * CP_HBAR * abar / reduced_mass; break;
    case CP_PAIR_FERMIONS:
        *rate = CP_UNIVERSAL_PWAVE * abar * abar * abar * CP_KB * temperature / CP_H;
        break;
    }
    return CP_OK;
}

cp_status cp_collisions_universal_validity(double c6_au, double reduced_mass, double temperature,
                                           unsigned *flags, double *barrier_fraction,
                                           cp_error *err)
{
    const char *ctx = "collisions.universal_rate";
    if (!flags || !barrier_fraction)
        return cp_fail(err, CP_EINVAL, "%s: flags and barrier_fraction must not be NULL", ctx);
    *flags = 0;
    *barrier_fraction = NAN;
    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE, 1e-2,
                          CP_CLOSED));
    double e1;
    CP_TRY(cp_collisions_barrier(c6_au, reduced_mass, 1, &e1, err));
    *barrier_fraction = CP_KB * temperature / e1;
    if (*barrier_fraction > 0.1)
        *flags = CP_COLLISIONS_FLAG_ABOVE_BARRIER;
    return CP_OK;
}

cp_status cp_collisions_dipolar_cross_section(double dipole_debye, double reduced_mass,
                                              cp_pair_statistics stat, double *cross_section,
                                              double *dipole_length, cp_error *err)
{
    const char *ctx = "collisions.dipolar_cross_section";
    *cross_section = NAN;
    *dipole_length = NAN;
    CP_TRY(check_pair(ctx, stat, err));
    CP_TRY(cp_check_range(err, ctx, "dipole_debye", dipole_debye, "D", 0.0, 20.0, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "mass (reduced)", reduced_mass, "kg", 1e-28, 1e-22,
                          CP_LO_OPEN));
    double d = dipole_debye * CP_DEBYE;
    double len = reduced_mass * d * d / (4.0 * CP_PI * CP_EPS0 * CP_HBAR * CP_HBAR);
    double factor = stat == CP_PAIR_FERMIONS ? 32.0 / 15.0
                    : stat == CP_PAIR_BOSONS ? 32.0 / 45.0
                                             : 64.0 / 45.0;
    *cross_section = factor * CP_PI * len * len;
    *dipole_length = len;
    return CP_OK;
}

cp_status cp_collisions_collision_ratio(double cross_section, double rate, double mass,
                                        double temperature, double *ratio, cp_error *err)
{
    const char *ctx = "collisions.collision_ratio";
    *ratio = NAN;
    CP_TRY(cp_check_range(err, ctx, "cross_section", cross_section, "m^2", 0.0, 1e-6,
                          CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "rate", rate, "m^3/s", 0.0, 1e-8, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "mass", mass, "kg", 1e-28, 1e-22, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE, CP_MAX_TEMPERATURE,
                          CP_CLOSED));
    double vrel = sqrt(16.0 * CP_KB * temperature / (CP_PI * mass));
    *ratio = cross_section * vrel / rate;
    return CP_OK;
}

cp_status cp_collisions_check_cloud(const char *ctx, double number, double temperature,
                                    const double omega[3], double mass, cp_error *err)
{
    static const char *const names[3] = {"omega_x", "omega_y", "omega_z"};
    CP_TRY(cp_check_range(err, ctx, "number", number, "", 1.0, 1e12, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE, CP_MAX_TEMPERATURE,
                          CP_CLOSED));
    for (int i = 0; i < 3; i++)
        CP_TRY(cp_check_range(err, ctx, names[i], omega[i], "rad/s", CP_MIN_TRAP_OMEGA, CP_MAX_TRAP_OMEGA,
                              CP_CLOSED));
    return cp_check_range(err, ctx, "mass", mass, "kg", 1e-28, 1e-22, CP_LO_OPEN);
}

cp_status cp_collisions_check_wave(const char *ctx, cp_loss_wave wave, cp_error *err)
{
    if (wave != CP_LOSS_S_WAVE && wave != CP_LOSS_P_WAVE)
        return cp_fail(err, CP_EINVAL, "%s: wave %d is not s-wave (0) or p-wave (1)", ctx,
                       (int)wave);
    return CP_OK;
}
