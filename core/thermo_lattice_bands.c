/*
 * The band tables of a separable cubic lattice for the lattice thermodynamics
 * (thermo_lattice.c), computed by the lattice model's band-structure solver
 * (cp_lattice_band_energies): the lowest bands of V0 sin^2(k x) along each axis at
 * quasimomenta q = (j + 1/2)/points (units of k) over half the Brillouin zone.
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"
#include "coldprep/thermo.h"

cp_status cp_thermo_lattice_bands(const double depth_er[3], double wavelength, double mass,
                                  int bands, int points, double *tables,
                                  cp_thermo_lattice *lat, cp_error *err)
{
    static const char *const names[3] = {"depth_er (x)", "depth_er (y)", "depth_er (z)"};
    const char *ctx = "thermo lattice_bands";
    CP_TRY(cp_check_int_range(err, ctx, "bands", bands, 1, CP_THERMO_LATTICE_MAX_BANDS));
    CP_TRY(cp_check_int_range(err, ctx, "quasimomentum points", points, 4, 256));
    if (!depth_er || !tables || !lat)
        return cp_fail(err, CP_EINVAL, "%s: depth_er, tables and lattice must not be NULL",
                       ctx);
    size_t per_axis = (size_t)bands * (size_t)points;
    cp_poison(tables, (int)(3 * per_axis));
    for (int a = 0; a < 3; a++)
        CP_TRY(cp_check_range(err, ctx, names[a], depth_er[a], "E_r", 0.0,
                              CP_LATTICE_MAX_DEPTH_ER, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "wavelength", wavelength, "m", 1e-8, 1e-3, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "mass", mass, "kg", 1e-30, 1e-21, CP_LO_OPEN));
    double recoil = CP_H * CP_H / (2.0 * mass * wavelength * wavelength); /* E_r */
    double q[256];
    for (int j = 0; j < points; j++)
        q[j] = (j + 0.5) / points;
    for (int a = 0; a < 3; a++) {
        double *t = tables + (size_t)a * per_axis;
        /* Axes of equal depth share one solve. */
        int same = -1;
        for (int b = 0; b < a; b++)
            if (depth_er[b] == depth_er[a])
                same = b;
        if (same >= 0) {
            for (size_t k = 0; k < per_axis; k++)
                t[k] = tables[(size_t)same * per_axis + k];
        } else {
            cp_status st = cp_lattice_band_energies(depth_er[a], bands, 0, (size_t)points, q,
                                                    t, NULL, err);
            if (st != CP_OK) {
                cp_poison(tables, (int)(3 * per_axis));
                return st;
            }
        }
        lat->axis[a].bands = bands;
        lat->axis[a].points = points;
        lat->axis[a].energy_er = t;
    }
    lat->recoil_energy = recoil;
    lat->spacing = wavelength / 2.0;
    return CP_OK;
}
