/*
 * The lattice thermodynamics (thermo_lattice.c) with as many bands as k_B T needs: band
 * tables of CP_THERMO_LATTICE_MAX_BANDS bands are computed once per call
 * (cp_thermo_lattice_bands), and the state or the entropy match is computed with the
 * lowest b of them, b growing until the first band left out lies CP_THERMO_LATTICE_MARGIN
 * k_B T above max(mu, lowest state) at the temperature found.  A hot gas of many bands
 * thus gets them, a cold one in the lowest band does not pay for them.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/thermo.h"

#define DEFAULT_POINTS 32

/* Bands of the full tables whose bottom (above the axis's lowest energy) lies below
 * `above` E_r, the most over the axes. */
static int bands_below(const cp_thermo_lattice *full, double above_er)
{
    int count = 0;
    for (int a = 0; a < 3; a++) {
        const cp_thermo_band_table *t = &full->axis[a];
        double base = INFINITY;
        for (int j = 0; j < t->points; j++)
            base = fmin(base, t->energy_er[j * t->bands]);
        for (int n = 0; n < t->bands; n++) {
            double bottom = INFINITY;
            for (int j = 0; j < t->points; j++)
                bottom = fmin(bottom, t->energy_er[j * t->bands + n]);
            if (bottom - base < above_er && n + 1 > count)
                count = n + 1;
        }
    }
    return count;
}

/* Copy the lowest b bands of the full tables into `tables` (3 * b * points doubles). */
static void subset(const cp_thermo_lattice *full, int b, double *tables, cp_thermo_lattice *lat)
{
    *lat = *full;
    for (int a = 0; a < 3; a++) {
        const cp_thermo_band_table *t = &full->axis[a];
        double *dst = tables + (size_t)a * (size_t)b * (size_t)t->points;
        for (int j = 0; j < t->points; j++)
            memcpy(dst + (size_t)j * (size_t)b, t->energy_er + (size_t)j * (size_t)t->bands,
                   (size_t)b * sizeof(double));
        lat->axis[a].bands = b;
        lat->axis[a].energy_er = dst;
    }
}

static cp_status run_auto(const cp_thermo_lattice_spec *spec, const cp_thermo_trap *trap,
                          cp_statistics stat, double temperature, int match,
                          cp_thermo_lattice_result *out, const char *ctx, cp_error *err)
{
    if (!out)
        return cp_fail(err, CP_EINVAL, "%s: result is NULL", ctx);
    double *d[] = {&out->temperature,  &out->chemical_potential, &out->entropy_per_particle,
                   &out->energy_per_particle, &out->peak_filling, &out->condensed_fraction,
                   &out->band_margin};
    for (size_t i = 0; i < sizeof d / sizeof d[0]; i++)
        *d[i] = NAN;
    out->bands = out->bands_needed = 0;
    if (!spec || !trap)
        return cp_fail(err, CP_EINVAL, "%s: spec or trap is NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "mass", trap->mass, "kg", 1e-30, 1e-21, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "temperature", temperature, "K", 0.0, 1.0, CP_LO_OPEN));
    int points = spec->points ? spec->points : DEFAULT_POINTS;
    CP_TRY(cp_check_int_range(err, ctx, "points", points, 4, 256));
    int max = CP_THERMO_LATTICE_MAX_BANDS;
    double *full_tables = malloc(2 * 3 * (size_t)max * (size_t)points * sizeof(double));
    if (!full_tables)
        return cp_fail(err, CP_ENOMEM, "%s: cannot allocate the band tables", ctx);
    double *tables = full_tables + 3 * (size_t)max * (size_t)points;
    cp_thermo_lattice full;
    cp_status st = cp_thermo_lattice_bands(spec->depth_er, spec->wavelength, trap->mass, max,
                                           points, full_tables, &full, err);
    if (st == CP_OK) {
        for (int a = 0; a < 3; a++)
            full.omega_envelope[a] = spec->omega_envelope[a];
        full.bins = spec->bins;
        double kt_er = CP_KB * temperature / full.recoil_energy;
        int b = bands_below(&full, CP_THERMO_LATTICE_MARGIN * kt_er) + 1;
        b = b < 2 ? 2 : (b > max ? max : b);
        for (;;) {
            cp_thermo_lattice lat;
            subset(&full, b, tables, &lat);
            st = match ? cp_thermo_match_lattice(trap, stat, temperature, &lat, out, err)
                       : cp_thermo_lattice_state(&lat, trap, stat, temperature, out, err);
            if (st != CP_OK || out->band_margin >= CP_THERMO_LATTICE_MARGIN || b == max)
                break;
            double kt = CP_KB * out->temperature / full.recoil_energy;
            double top = fmax(out->chemical_potential / full.recoil_energy -
                                  (full.axis[0].energy_er[0] + full.axis[1].energy_er[0] +
                                   full.axis[2].energy_er[0]),
                              0.0);
            int need = bands_below(&full, top + CP_THERMO_LATTICE_MARGIN * kt) + 1;
            b = need > b + 1 ? need : b + 1;
            b = b > max ? max : b;
        }
    }
    free(full_tables);
    return st;
}

cp_status cp_thermo_lattice_state_auto(const cp_thermo_lattice_spec *spec,
                                       const cp_thermo_trap *trap, cp_statistics stat,
                                       double temperature, cp_thermo_lattice_result *out,
                                       cp_error *err)
{
    return run_auto(spec, trap, stat, temperature, 0, out, "thermo.lattice_state", err);
}

cp_status cp_thermo_match_lattice_auto(const cp_thermo_trap *trap, cp_statistics stat,
                                       double temperature, const cp_thermo_lattice_spec *spec,
                                       cp_thermo_lattice_result *out, cp_error *err)
{
    return run_auto(spec, trap, stat, temperature, 1, out, "thermo.match_lattice", err);
}
