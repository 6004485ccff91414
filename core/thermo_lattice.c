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
 * per band combination into bins that keep their weight and mean energy, so the sums run
 * over a few hundred terms.  Bosons condense when the thermal population saturates at
 * mu = e_min, the band bottom (the condensate carries no entropy).
 */
#include <math.h>
#include <stdlib.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "thermo_int.h"

#define DEFAULT_BINS 96

typedef struct lattice_dos {
    size_t count;
    double *weight; /* per site, summing to the number of band combinations */
    double *energy; /* J, from the lowest state (e_min subtracted) */
    double e_min;   /* J, lowest 3D band energy from the lattice potential minimum */
} lattice_dos;

static void dos_free(lattice_dos *dos)
{
    free(dos->weight);
    free(dos->energy);
    dos->weight = dos->energy = NULL;
}

static cp_status check_lattice(const cp_thermo_lattice *lat, const char *ctx, cp_error *err)
{
    static const char *const envs[3] = {"omega_envelope_x", "omega_envelope_y",
                                        "omega_envelope_z"};
    double combos = 1.0, samples = 1.0;
    for (int a = 0; a < 3; a++) {
        const cp_thermo_band_table *t = &lat->axis[a];
        CP_TRY(cp_check_int_range(err, ctx, "bands", t->bands, 1, 8));
        CP_TRY(cp_check_int_range(err, ctx, "quasimomentum points", t->points, 4, 256));
        if (!t->energy_er)
            return cp_fail(err, CP_EINVAL, "%s: band table of axis %d has no energies", ctx, a);
        for (int k = 0; k < t->bands * t->points; k++)
            if (!isfinite(t->energy_er[k]) || fabs(t->energy_er[k]) > 1e6)
                return cp_fail(err, CP_EINVAL,
                               "%s: band energy %g E_r (axis %d, entry %d) is not finite or "
                               "beyond 1e6 E_r",
                               ctx, t->energy_er[k], a, k);
        combos *= t->bands;
        samples *= t->points;
        CP_TRY(cp_check_range(err, ctx, envs[a], lat->omega_envelope[a], "rad/s",
                              CP_MIN_TRAP_OMEGA, CP_MAX_TRAP_OMEGA, CP_CLOSED));
    }
    CP_TRY(cp_check_range(err, ctx, "recoil_energy", lat->recoil_energy, "J", 0.0, 1e-25,
                          CP_LO_OPEN));
    CP_TRY(cp_check_range(err, ctx, "spacing", lat->spacing, "m", 0.0, 1e-4, CP_LO_OPEN));
    if (lat->bins != 0)
        CP_TRY(cp_check_int_range(err, ctx, "bins", lat->bins, 8, 4096));
    int bins = lat->bins ? lat->bins : DEFAULT_BINS;
    if (combos * bins > 1e6 || combos * samples > 5e7)
        return cp_fail(err, CP_EINVAL,
                       "%s: %g band combinations x %d bins x %g quasimomentum samples is too "
                       "large; allowed combinations x bins <= 1e6 and combinations x samples "
                       "<= 5e7",
                       ctx, combos, bins, samples);
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

/* Histogram the 3D band energies per band combination. */
static cp_status build_dos(const cp_thermo_lattice *lat, lattice_dos *dos, cp_error *err)
{
    const cp_thermo_band_table *tx = &lat->axis[0], *ty = &lat->axis[1], *tz = &lat->axis[2];
    int bins = lat->bins ? lat->bins : DEFAULT_BINS;
    size_t combos = (size_t)tx->bands * (size_t)ty->bands * (size_t)tz->bands;
    size_t total = combos * (size_t)bins;
    dos->weight = calloc(total, sizeof(double));
    dos->energy = calloc(total, sizeof(double));
    if (!dos->weight || !dos->energy) {
        dos_free(dos);
        return cp_fail(err, CP_ENOMEM, "thermo lattice: cannot allocate %zu energy bins",
                       total);
    }
    double norm = 1.0 / ((double)tx->points * ty->points * tz->points);
    double e_min = INFINITY;
    size_t c = 0;
    for (int nx = 0; nx < tx->bands; nx++)
        for (int ny = 0; ny < ty->bands; ny++)
            for (int nz = 0; nz < tz->bands; nz++, c++) {
                double lx, hx, ly, hy, lz, hz;
                band_range(tx, nx, &lx, &hx);
                band_range(ty, ny, &ly, &hy);
                band_range(tz, nz, &lz, &hz);
                double lo = lx + ly + lz, width = (hx + hy + hz) - lo;
                e_min = fmin(e_min, lo);
                double *w = dos->weight + c * bins, *es = dos->energy + c * bins;
                const double *ex = tx->energy_er + nx, *ey = ty->energy_er + ny;
                const double *ez = tz->energy_er + nz;
                for (int i = 0; i < tx->points; i++)
                    for (int j = 0; j < ty->points; j++) {
                        double exy = ex[i * tx->bands] + ey[j * ty->bands];
                        for (int k = 0; k < tz->points; k++) {
                            double e = exy + ez[k * tz->bands];
                            int b = width > 0 ? (int)((e - lo) / width * bins) : 0;
                            if (b >= bins)
                                b = bins - 1;
                            if (b < 0)
                                b = 0;
                            w[b] += norm;
                            es[b] += norm * e;
                        }
                    }
            }
    /* Compress the non-empty bins; energies to J, measured from the lowest state. */
    size_t m = 0;
    for (size_t b = 0; b < total; b++)
        if (dos->weight[b] > 0.0) {
            double e = dos->energy[b] / dos->weight[b];
            dos->weight[m] = dos->weight[b];
            dos->energy[m] = (e - e_min) * lat->recoil_energy;
            m++;
        }
    dos->count = m;
    dos->e_min = e_min * lat->recoil_energy;
    return CP_OK;
}

/* Sums over the bins at temperature T and log-fugacity x = (mu - e_min)/k_BT. */
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

static double lattice_number(double x, void *p)
{
    const lattice_eval *ev = p;
    double n = 0.0;
    for (size_t b = 0; b < ev->dos->count; b++)
        n += ev->dos->weight[b] * f_order(ev, 0, x - ev->dos->energy[b] / ev->kt);
    return ev->amp * n;
}

/* Solve N(x) = N for x = (mu - e_min)/k_BT; bosons whose thermal population saturates at
 * x = 0 (mu at the band bottom) return x = 0 and the condensed number n0. */
static cp_status lattice_solve(const lattice_eval *ev, double number, double *x, double *n0,
                               cp_error *err)
{
    const char *ctx = "thermo lattice";
    *n0 = 0.0;
    /* F_{1/2}(eta) <= e^eta and Li_{3/2}(e^eta) <= zeta(3/2) e^eta bound N from above, so
     * N(lo) < N at lo = ln(N / (A sum w c)) - 1 with c = 1 or zeta(3/2) < 2.62. */
    double wsum = 0.0;
    for (size_t b = 0; b < ev->dos->count; b++)
        wsum += ev->dos->weight[b];
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
static cp_status lattice_at(const lattice_dos *dos, const cp_thermo_lattice *lat,
                            const cp_thermo_trap *trap, cp_statistics stat,
                            const cp_polylog_plan *li32, const cp_polylog_plan *li52,
                            double temperature, cp_thermo_lattice_result *out, cp_error *err)
{
    double wbar = cbrt(lat->omega_envelope[0] * lat->omega_envelope[1] * lat->omega_envelope[2]);
    double kt = CP_KB * temperature;
    double d3 = lat->spacing * lat->spacing * lat->spacing;
    lattice_eval ev = {dos, stat, kt,
                       pow(2.0 * CP_PI * kt / (trap->mass * wbar * wbar), 1.5) / d3, li32, li52};
    double x, n0;
    CP_TRY(lattice_solve(&ev, trap->number, &x, &n0, err));
    double n = 0.0, e = 0.0, omega = 0.0, fill = 0.0;
    for (size_t b = 0; b < dos->count; b++) {
        double eta = x - dos->energy[b] / kt;
        double f32 = f_order(&ev, 0, eta), f52 = f_order(&ev, 1, eta);
        double w = dos->weight[b];
        n += w * f32;
        e += w * (dos->energy[b] * f32 + 1.5 * kt * f52);
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
        return cp_fail(err, CP_ENUMERIC, "thermo lattice: entropy not finite at T = %g K",
                       temperature);
    out->temperature = temperature;
    out->chemical_potential = mu + dos->e_min;
    out->entropy_per_particle = s;
    out->energy_per_particle = e / trap->number + dos->e_min; /* condensate at e_min */
    out->peak_filling = stat == CP_FERMION ? fill : NAN;
    out->condensed_fraction = n0 / trap->number;
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
    cp_poison(&out->temperature, (int)(sizeof *out / sizeof(double)));
}

cp_status cp_thermo_lattice_state(const cp_thermo_lattice *lat, const cp_thermo_trap *trap,
                                  cp_statistics stat, double temperature,
                                  cp_thermo_lattice_result *out, cp_error *err)
{
    const char *ctx = "thermo lattice_state";
    lattice_poison(out);
    CP_TRY(check_common(lat, trap, stat, ctx, err));
    CP_TRY(cp_thermo_check_temperature(temperature, ctx, err));
    lattice_dos dos = {0, NULL, NULL, 0.0};
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
    const lattice_dos *dos;
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
    const char *ctx = "thermo match_lattice";
    lattice_poison(out);
    CP_TRY(check_common(lat, trap, stat, ctx, err));
    double s;
    CP_TRY(cp_thermo_entropy(trap, stat, temperature, &s, err));
    lattice_dos dos = {0, NULL, NULL, 0.0};
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
