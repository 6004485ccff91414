/*
 * The ideal gas in a separable cubic optical lattice with a harmonic envelope, and entropy
 * matching from a harmonic trap into it.  The band structure enters exactly; the envelope
 * V(r) = m sum omega_i^2 r_i^2 / 2 in the local-density approximation: every 3D band
 * state e (one per site per band combination) forms a "harmonic trap of sites" of density
 * 1/d^3, and integrating the occupation over the envelope gives polylogarithms,
 *   int d^3r / d^3  f(e + V(r) - mu) = A f_{3/2}(beta (mu - e)),
 *   A = (2 pi k_B T / (m omega_bar^2))^{3/2} / d^3,
 *   f_{3/2} = F_{1/2} (fermions; GSL's normalised Fermi-Dirac integral), Li_{3/2} (bosons),
 * and likewise E = A sum w [e f_{3/2} + (3/2) k_BT f_{5/2}], Omega = -k_BT A sum w f_{5/2},
 * S = (E - Omega - mu N)/T.  The 3D band energies (sums over the axes) are histogrammed
 * per band combination into bins that keep their weight and mean energy (the lowest
 * combination finely, the others more coarsely when there are many), sorted by energy,
 * and merged at each temperature into bins no wider than k_B T / 128 (error second order
 * in the bin width over k_B T); states more than 45 k_B T above max(mu, e_min) are left
 * out of the sums (weight below e^-45).  Bosons condense when the thermal population
 * saturates at mu = e_min, the band bottom (the condensate carries no entropy).
 */
#include <math.h>
#include <stdlib.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "thermo_int.h"

#define DEFAULT_BINS 96
#define MERGE_FRACTION (1.0 / 128.0) /* merged bin width, units of k_B T */
#define SUM_CUTOFF 45.0               /* states this many k_B T above max(mu, e_min) are left out */
#define WORK_LIMIT 8e6                /* products of 1D entries summed per DOS build */
#define BIN_LIMIT 4e5                 /* bins over all excited band combinations */

typedef struct dos_bin {
    double w; /* states per site */
    double e; /* J, from the lowest state */
} dos_bin;

typedef struct lattice_dos {
    size_t count;       /* sorted bins */
    dos_bin *bin;
    size_t merged;      /* bins merged at the current temperature */
    dos_bin *merge;
    double e_min;       /* J, lowest 3D band energy from the lattice potential minimum */
    double e_cut;       /* J above e_min: lower bound of the first band left out */
    int bands;          /* most bands per axis */
    double bottom[3][CP_THERMO_LATTICE_MAX_BANDS]; /* J above the axis's lowest energy */
    int axis_bands[3];
} lattice_dos;

static void dos_free(lattice_dos *dos)
{
    free(dos->bin);
    free(dos->merge);
    dos->bin = dos->merge = NULL;
}

static cp_status check_lattice(const cp_thermo_lattice *lat, const char *ctx, cp_error *err)
{
    static const char *const envs[3] = {"omega_envelope_x", "omega_envelope_y",
                                        "omega_envelope_z"};
    for (int a = 0; a < 3; a++) {
        const cp_thermo_band_table *t = &lat->axis[a];
        CP_TRY(cp_check_int_range(err, ctx, "bands", t->bands, 1, CP_THERMO_LATTICE_MAX_BANDS));
        CP_TRY(cp_check_int_range(err, ctx, "quasimomentum points", t->points, 4, 256));
        if (!t->energy_er)
            return cp_fail(err, CP_EINVAL, "%s: band table of axis %d has no energies", ctx, a);
        for (int k = 0; k < t->bands * t->points; k++)
            if (!isfinite(t->energy_er[k]) || fabs(t->energy_er[k]) > 1e6)
                return cp_fail(err, CP_EINVAL,
                               "%s: band energy %g E_r (axis %d, entry %d) is not finite or "
                               "beyond 1e6 E_r",
                               ctx, t->energy_er[k], a, k);
        CP_TRY(cp_check_range(err, ctx, envs[a], lat->omega_envelope[a], "rad/s",
                              CP_MIN_TRAP_OMEGA, CP_MAX_TRAP_OMEGA, CP_CLOSED));
    }
    CP_TRY(cp_check_range(err, ctx, "recoil_energy", lat->recoil_energy, "J", 0.0, 1e-25,
                          CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "spacing", lat->spacing, "m", 0.0, 1e-4, CP_LO_OPEN));
    if (lat->bins != 0)
        CP_TRY(cp_check_int_range(err, ctx, "bins", lat->bins, 8, 4096));
    return CP_OK;
}

static void band_range(const cp_thermo_band_table *t, int n, double *lo, double *hi)
{
    *lo = INFINITY;
    *hi = -INFINITY;
    for (int j = 0; j < t->points; j++) {
        double e = t->energy_er[j * t->bands + n];
        *lo = fmin(*lo, e);
        *hi = fmax(*hi, e);
    }
}

/* One axis's energies as weighted entries per band: band 0 keeps every quasimomentum
 * sample, higher bands too when k reaches the sample count, else they are binned into k
 * bins (mean energy kept). */
typedef struct axis_entries {
    int start[CP_THERMO_LATTICE_MAX_BANDS + 1];
    double lo[CP_THERMO_LATTICE_MAX_BANDS], hi[CP_THERMO_LATTICE_MAX_BANDS];
    dos_bin *entry;
} axis_entries;

static cp_status axis_build(const cp_thermo_band_table *t, int k, axis_entries *ax,
                            cp_error *err)
{
    ax->entry = malloc((size_t)(t->points + (t->bands - 1) * k) * sizeof *ax->entry);
    if (!ax->entry)
        return cp_fail(err, CP_ENOMEM, "thermo.lattice: cannot allocate the band entries");
    int m = 0;
    for (int n = 0; n < t->bands; n++) {
        band_range(t, n, &ax->lo[n], &ax->hi[n]);
        ax->start[n] = m;
        int raw = n == 0 || k >= t->points, nb = raw ? t->points : k;
        dos_bin *b = ax->entry + m;
        for (int i = 0; i < nb; i++)
            b[i].w = b[i].e = 0.0;
        double width = ax->hi[n] - ax->lo[n];
        for (int j = 0; j < t->points; j++) {
            double e = t->energy_er[j * t->bands + n];
            int i = raw ? j : (width > 0 ? (int)((e - ax->lo[n]) / width * nb) : 0);
            i = i < 0 ? 0 : (i >= nb ? nb - 1 : i);
            b[i].w += 1.0 / t->points;
            b[i].e += e / t->points;
        }
        for (int i = 0; i < nb; i++)
            if (b[i].w > 0.0) {
                ax->entry[m].e = b[i].e / b[i].w;
                ax->entry[m].w = b[i].w;
                m++;
            }
    }
    ax->start[t->bands] = m;
    return CP_OK;
}

static int by_energy(const void *a, const void *b)
{
    double x = ((const dos_bin *)a)->e, y = ((const dos_bin *)b)->e;
    return (x > y) - (x < y);
}

/* Histogram the 3D band energies per band combination, then sort all bins by energy. */
static cp_status build_dos(const cp_thermo_lattice *lat, lattice_dos *dos, cp_error *err)
{
    const cp_thermo_band_table *tab = lat->axis;
    int bins = lat->bins ? lat->bins : DEFAULT_BINS;
    double combos = (double)tab[0].bands * tab[1].bands * tab[2].bands;
    int k = (int)cbrt(WORK_LIMIT / combos);
    int ptmax = tab[0].points > tab[1].points ? tab[0].points : tab[1].points;
    ptmax = ptmax > tab[2].points ? ptmax : tab[2].points;
    k = k < 2 ? 2 : (k > ptmax ? ptmax : k);
    int excited_bins = combos > 1 ? (int)fmin(bins, fmax(8.0, BIN_LIMIT / (combos - 1))) : 0;
    axis_entries ax[3] = {{.entry = NULL}, {.entry = NULL}, {.entry = NULL}};
    cp_status st = CP_OK;
    for (int a = 0; a < 3 && st == CP_OK; a++)
        st = axis_build(&tab[a], k, &ax[a], err);
    size_t total = (size_t)bins + (size_t)(combos - 1) * (size_t)excited_bins;
    if (st == CP_OK) {
        dos->bin = malloc(total * sizeof *dos->bin);
        dos->merge = malloc(total * sizeof *dos->merge);
        if (!dos->bin || !dos->merge)
            st = cp_fail(err, CP_ENOMEM, "thermo.lattice: cannot allocate %zu energy bins",
                         total);
    }
    dos_bin *h = st == CP_OK ? malloc((size_t)bins * sizeof *h) : NULL;
    if (st == CP_OK && !h)
        st = cp_fail(err, CP_ENOMEM, "thermo.lattice: cannot allocate the bins");
    if (st != CP_OK) {
        for (int a = 0; a < 3; a++)
            free(ax[a].entry);
        dos_free(dos);
        return st;
    }
    double e_min = ax[0].lo[0] + ax[1].lo[0] + ax[2].lo[0];
    size_t m = 0;
    for (int nx = 0; nx < tab[0].bands; nx++)
        for (int ny = 0; ny < tab[1].bands; ny++)
            for (int nz = 0; nz < tab[2].bands; nz++) {
                int nb = nx + ny + nz == 0 ? bins : excited_bins;
                double lo = ax[0].lo[nx] + ax[1].lo[ny] + ax[2].lo[nz];
                double width = ax[0].hi[nx] + ax[1].hi[ny] + ax[2].hi[nz] - lo;
                for (int b = 0; b < nb; b++)
                    h[b].w = h[b].e = 0.0;
                for (int i = ax[0].start[nx]; i < ax[0].start[nx + 1]; i++)
                    for (int j = ax[1].start[ny]; j < ax[1].start[ny + 1]; j++) {
                        double wxy = ax[0].entry[i].w * ax[1].entry[j].w;
                        double exy = ax[0].entry[i].e + ax[1].entry[j].e;
                        for (int l = ax[2].start[nz]; l < ax[2].start[nz + 1]; l++) {
                            double e = exy + ax[2].entry[l].e, w = wxy * ax[2].entry[l].w;
                            int b = width > 0 ? (int)((e - lo) / width * nb) : 0;
                            b = b < 0 ? 0 : (b >= nb ? nb - 1 : b);
                            h[b].w += w;
                            h[b].e += w * e;
                        }
                    }
                for (int b = 0; b < nb; b++)
                    if (h[b].w > 0.0) {
                        dos->bin[m].w = h[b].w;
                        dos->bin[m].e = (h[b].e / h[b].w - e_min) * lat->recoil_energy;
                        m++;
                    }
            }
    free(h);
    qsort(dos->bin, m, sizeof *dos->bin, by_energy);
    dos->count = m;
    dos->e_min = e_min * lat->recoil_energy;
    /* 1D bands do not overlap: the first band left out on an axis starts at or above the
     * top of the last band kept. */
    dos->e_cut = INFINITY;
    dos->bands = 0;
    for (int a = 0; a < 3; a++) {
        int nb = tab[a].bands;
        dos->axis_bands[a] = nb;
        dos->bands = nb > dos->bands ? nb : dos->bands;
        dos->e_cut = fmin(dos->e_cut, (ax[a].hi[nb - 1] - ax[a].lo[0]) * lat->recoil_energy);
        for (int n = 0; n < nb; n++)
            dos->bottom[a][n] = (ax[a].lo[n] - ax[a].lo[0]) * lat->recoil_energy;
        free(ax[a].entry);
    }
    return CP_OK;
}

/* Merge neighbouring sorted bins into bins no wider than MERGE_FRACTION k_B T. */
static void dos_merge(lattice_dos *dos, double kt)
{
    size_t m = 0;
    double width = MERGE_FRACTION * kt;
    for (size_t i = 0; i < dos->count;) {
        double first = dos->bin[i].e, w = 0.0, we = 0.0;
        for (; i < dos->count && dos->bin[i].e - first <= width; i++) {
            w += dos->bin[i].w;
            we += dos->bin[i].w * dos->bin[i].e;
        }
        dos->merge[m].w = w;
        dos->merge[m].e = we / w;
        m++;
    }
    dos->merged = m;
}

/* Sums over the merged bins at temperature T and log-fugacity x = (mu - e_min)/k_BT. */
typedef struct lattice_eval {
    const lattice_dos *dos;
    cp_statistics stat;
    double kt, amp; /* k_B T, J; A, particles per unit f_{3/2} */
    const cp_polylog_plan *li32, *li52;
} lattice_eval;

static double f_order(const lattice_eval *ev, int order52, double eta)
{
    if (ev->stat == CP_FERMION) {
        double v;
        if (cp_thermo_fd(order52 ? 3 : 1, eta, &v, NULL) != CP_OK)
            return NAN;
        return v;
    }
    /* eta <= 0 for bosons: mu never exceeds the band bottom and e_b >= e_min */
    return cp_polylog_bose(order52 ? ev->li52 : ev->li32, fmin(exp(eta), 1.0));
}

/* The last eta kept in the sums at log-fugacity x. */
static double eta_floor(double x)
{
    return fmin(x, 0.0) - SUM_CUTOFF;
}

static double lattice_number(double x, void *p)
{
    const lattice_eval *ev = p;
    double n = 0.0, floor = eta_floor(x);
    for (size_t b = 0; b < ev->dos->merged; b++) {
        double eta = x - ev->dos->merge[b].e / ev->kt;
        if (eta < floor)
            break;
        n += ev->dos->merge[b].w * f_order(ev, 0, eta);
    }
    return ev->amp * n;
}

/* Solve N(x) = N for x = (mu - e_min)/k_BT; bosons whose thermal population saturates at
 * x = 0 (mu at the band bottom) return x = 0 and the condensed number n0. */
static cp_status lattice_solve(const lattice_eval *ev, double number, double *x, double *n0,
                               cp_error *err)
{
    const char *ctx = "thermo.lattice";
    *n0 = 0.0;
    /* F_{1/2}(eta) <= e^eta and Li_{3/2}(e^eta) <= zeta(3/2) e^eta bound N from above, so
     * N(lo) < N at lo = ln(N / (A sum w c)) - 1 with c = 1 or zeta(3/2) < 2.62. */
    double wsum = 0.0;
    for (size_t b = 0; b < ev->dos->merged; b++)
        wsum += ev->dos->merge[b].w;
    double lo = log(number / (ev->amp * wsum * (ev->stat == CP_BOSON ? 2.62 : 1.0))) - 1.0;
    double hi;
    if (ev->stat == CP_BOSON) {
        hi = 0.0;
        double nmax = lattice_number(hi, (void *)ev);
        if (!isfinite(nmax))
            return cp_fail(err, CP_ENUMERIC, "%s: thermal number not finite", ctx);
        if (nmax <= number) {
            *x = hi;
            *n0 = number - nmax;
            return CP_OK;
        }
        if (lo >= hi)
            lo = hi - 1.0;
    } else {
        double step = 1.0;
        hi = fmax(lo + 1.0, 1.0);
        for (int it = 0; lattice_number(hi, (void *)ev) < number; it++) {
            if (it > 200)
                return cp_fail(err, CP_ENOCONV, "%s: cannot bracket the chemical potential",
                               ctx);
            hi += step;
            step *= 2.0;
        }
    }
    return cp_thermo_brent(lattice_number, (void *)ev, number, lo, hi, x, ctx, err);
}

/* The lattice state at temperature T (DOS and plans prepared). */
static cp_status lattice_at(lattice_dos *dos, const cp_thermo_lattice *lat,
                            const cp_thermo_trap *trap, cp_statistics stat,
                            const cp_polylog_plan *li32, const cp_polylog_plan *li52,
                            double temperature, cp_thermo_lattice_result *out, cp_error *err)
{
    double wbar = cbrt(lat->omega_envelope[0] * lat->omega_envelope[1] * lat->omega_envelope[2]);
    double kt = CP_KB * temperature;
    double d3 = lat->spacing * lat->spacing * lat->spacing;
    dos_merge(dos, kt);
    lattice_eval ev = {dos, stat, kt,
                       pow(2.0 * CP_PI * kt / (trap->mass * wbar * wbar), 1.5) / d3, li32, li52};
    double x, n0;
    CP_TRY(lattice_solve(&ev, trap->number, &x, &n0, err));
    double n = 0.0, e = 0.0, omega = 0.0, fill = 0.0, floor = eta_floor(x);
    for (size_t b = 0; b < dos->merged; b++) {
        double eta = x - dos->merge[b].e / kt;
        if (eta < floor)
            break;
        double f32 = f_order(&ev, 0, eta), f52 = f_order(&ev, 1, eta);
        double w = dos->merge[b].w;
        n += w * f32;
        e += w * (dos->merge[b].e * f32 + 1.5 * kt * f52);
        omega -= w * kt * f52;
        if (stat == CP_FERMION) /* occupation per site at the envelope centre */
            fill += w / (exp(-eta) + 1.0);
    }
    n *= ev.amp;
    e *= ev.amp;
    omega *= ev.amp;
    double mu = x * kt; /* from e_min */
    double s = (e - omega - mu * n) / (kt * trap->number);
    if (!(isfinite(s) && isfinite(e)))
        return cp_fail(err, CP_ENUMERIC, "thermo.lattice: entropy not finite at T = %g K",
                       temperature);
    double top = fmax(mu, 0.0);
    int needed = 0;
    for (int a = 0; a < 3; a++)
        for (int k = 0; k < dos->axis_bands[a]; k++)
            if (dos->bottom[a][k] < top + CP_THERMO_LATTICE_MARGIN * kt && k + 1 > needed)
                needed = k + 1;
    out->temperature = temperature;
    out->chemical_potential = mu + dos->e_min;
    out->entropy_per_particle = s;
    out->energy_per_particle = e / trap->number + dos->e_min; /* condensate at e_min */
    out->peak_filling = stat == CP_FERMION ? fill : NAN;
    out->condensed_fraction = n0 / trap->number;
    out->band_margin = (dos->e_cut - top) / kt;
    out->bands = dos->bands;
    out->bands_needed = needed;
    return CP_OK;
}

static cp_status check_common(const cp_thermo_lattice *lat, const cp_thermo_trap *trap,
                              cp_statistics stat, const char *ctx, cp_error *err)
{
    if (!lat || !trap)
        return cp_fail(err, CP_EINVAL, "%s: lattice or trap is NULL", ctx);
    CP_TRY(cp_check_range(err, ctx, "number", trap->number, "", 1.0, 1e12, CP_CLOSED));
    CP_TRY(cp_check_range(err, ctx, "mass", trap->mass, "kg", 1e-30, 1e-21, CP_LO_OPEN));
    CP_TRY(cp_thermo_check_statistics(stat, ctx, err));
    return check_lattice(lat, ctx, err);
}

static cp_status prepare(const cp_thermo_lattice *lat, lattice_dos *dos, cp_polylog_plan *li32,
                         cp_polylog_plan *li52, cp_error *err)
{
    CP_TRY(cp_polylog_plan_init(li32, 1.5, err));
    CP_TRY(cp_polylog_plan_init(li52, 2.5, err));
    return build_dos(lat, dos, err);
}

static void lattice_poison(cp_thermo_lattice_result *out)
{
    double *d[] = {&out->temperature,  &out->chemical_potential, &out->entropy_per_particle,
                   &out->energy_per_particle, &out->peak_filling, &out->condensed_fraction,
                   &out->band_margin};
    for (size_t i = 0; i < sizeof d / sizeof d[0]; i++)
        *d[i] = NAN;
    out->bands = out->bands_needed = 0;
}

cp_status cp_thermo_lattice_state(const cp_thermo_lattice *lat, const cp_thermo_trap *trap,
                                  cp_statistics stat, double temperature,
                                  cp_thermo_lattice_result *out, cp_error *err)
{
    const char *ctx = "thermo.lattice_state";
    lattice_poison(out);
    CP_TRY(check_common(lat, trap, stat, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    lattice_dos dos = {.bin = NULL, .merge = NULL};
    cp_polylog_plan li32, li52;
    CP_TRY(prepare(lat, &dos, &li32, &li52, err));
    cp_status st = lattice_at(&dos, lat, trap, stat, &li32, &li52, temperature, out, err);
    dos_free(&dos);
    if (st != CP_OK)
        lattice_poison(out);
    return st;
}

/* Entropy per particle in the lattice as a function of ln T (for Brent). */
typedef struct match_ctx {
    lattice_dos *dos;
    const cp_thermo_lattice *lat;
    const cp_thermo_trap *trap;
    cp_statistics stat;
    const cp_polylog_plan *li32, *li52;
} match_ctx;

static double entropy_of_log_t(double log_t, void *p)
{
    const match_ctx *m = p;
    cp_thermo_lattice_result r;
    if (lattice_at(m->dos, m->lat, m->trap, m->stat, m->li32, m->li52, exp(log_t), &r, NULL) !=
        CP_OK)
        return NAN;
    return r.entropy_per_particle;
}

cp_status cp_thermo_match_lattice(const cp_thermo_trap *trap, cp_statistics stat,
                                  double temperature, const cp_thermo_lattice *lat,
                                  cp_thermo_lattice_result *out, cp_error *err)
{
    const char *ctx = "thermo.match_lattice";
    lattice_poison(out);
    CP_TRY(check_common(lat, trap, stat, ctx, err));
    double s;
    CP_TRY(cp_thermo_entropy(trap, stat, temperature, &s, err));
    lattice_dos dos = {.bin = NULL, .merge = NULL};
    cp_polylog_plan li32, li52;
    CP_TRY(prepare(lat, &dos, &li32, &li52, err));
    match_ctx m = {&dos, lat, trap, stat, &li32, &li52};
    /* Bracket ln T around the initial temperature: S(T) increases with T. */
    double lo = log(temperature) - 1.0, hi = log(temperature) + 1.0;
    cp_status st = CP_OK;
    double slo = entropy_of_log_t(lo, &m), shi = entropy_of_log_t(hi, &m);
    for (int it = 0; st == CP_OK && !(slo < s); it++) {
        lo -= 2.0;
        if (it > 30 || lo < log(1e-15))
            st = cp_fail(err, CP_ENOCONV,
                         "%s: no lattice temperature above 1e-15 K has entropy %.6g k_B", ctx,
                         s);
        else
            slo = entropy_of_log_t(lo, &m);
    }
    for (int it = 0; st == CP_OK && !(shi > s); it++) {
        hi += 2.0;
        if (it > 30 || hi > 0.0)
            st = cp_fail(err, CP_ENOCONV,
                         "%s: no lattice temperature below 1 K has entropy %.6g k_B", ctx, s);
        else
            shi = entropy_of_log_t(hi, &m);
    }
    double log_t = NAN;
    if (st == CP_OK)
        st = cp_thermo_brent(entropy_of_log_t, &m, s, lo, hi, &log_t, ctx, err);
    if (st == CP_OK)
        st = lattice_at(&dos, lat, trap, stat, &li32, &li52, exp(log_t), out, err);
    dos_free(&dos);
    if (st != CP_OK)
        lattice_poison(out);
    return st;
}
