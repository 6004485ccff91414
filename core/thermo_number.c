/*
 * The atom number that puts a trapped ideal gas at a given degeneracy T/T_F (Fermi) or
 * T/T_c (Bose) at a given temperature: the inversion of the degeneracy temperatures
 *   k_B T_F = hbar omega_bar (6 N)^(1/3),  k_B T_c = hbar omega_bar (N / zeta(3))^(1/3)
 * (Butts & Rokhsar, PRA 55, 4346 (1997); Dalfovo et al., RMP 71, 463 (1999), eq. 13;
 * docs/models/thermo.md).  Used where a cloud is described by its degeneracy rather than
 * its number.
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/thermo.h"
#include "thermo_int.h"

cp_status cp_thermo_number_at(cp_statistics stat, double temperature, const double omega[3],
                              double t_over_tdeg, double *number, cp_error *err)
{
    static const char ctx[] = "thermo.number_at";
    static const char *const names[3] = {"omega_x", "omega_y", "omega_z"};
    if (number)
        *number = NAN;
    if (!number || !omega)
        return cp_fail(err, CP_EINVAL, "%s: number or omega is NULL", ctx);
    if (stat != CP_FERMION && stat != CP_BOSON)
        return cp_fail(err, CP_EINVAL, "%s: statistics must be fermion or boson", ctx);
    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", CP_MIN_TEMPERATURE,
                          CP_MAX_TEMPERATURE, CP_CLOSED));
    for (int i = 0; i < 3; i++)
        CP_TRY(cp_check_range(err, ctx, names[i], omega[i], "rad/s", CP_MIN_TRAP_OMEGA,
                              CP_MAX_TRAP_OMEGA, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, stat == CP_FERMION ? "T/T_F" : "T/T_c", t_over_tdeg, "",
                          0.0, 1e3, CP_LO_OPEN));
    double wbar = cbrt(omega[0] * omega[1] * omega[2]);
    double r3 = pow(CP_KB * temperature / (CP_HBAR * wbar * t_over_tdeg), 3.0);
    *number = stat == CP_FERMION ? r3 / 6.0 : CP_THERMO_ZETA3 * r3;
    return CP_OK;
}
