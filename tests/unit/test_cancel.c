/*
 * Cancellation of long core computations (cp_collisions_hold_cancellable,
 * cp_raman_scan_cancellable, cp_feshbach_max_efficiency_cancellable,
 * cp_lattice_band_energies_bounded, cp_lattice_wannier_bounded): with a NULL or clear flag the result is the plain
 * function's, bit for bit (the second method here is the plain function itself); with the
 * flag set before the call the status is CP_ECANCELED, the outputs are NaN and the message
 * says "interrupted"; a flag raised by another thread 100 ms into a computation that would
 * run for minutes stops it within 0.1 s (the bound the program's Ctrl-C promises, common
 * practice for interactive response, no source).  The work estimates: a call estimated
 * beyond its limit is refused with CP_ETOOLONG before it starts, and within the limit the
 * bounded functions give the plain function's bits.
 */
#include <math.h>
#include <pthread.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>
#include <time.h>

#include <cmocka.h>

#include "coldprep/collisions.h"
#include "coldprep/consts.h"
#include "coldprep/feshbach.h"
#include "coldprep/lattice.h"
#include "coldprep/limits.h"
#include "coldprep/raman.h"

#define TWO_PI 6.283185307179586

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static cp_hold_params hold_case(double lifetime, double duration)
{
    cp_hold_params p = {2e4, 300e-9, {600.0, 600.0, 6000.0}, 2.1e-25, 1e-17, CP_LOSS_S_WAVE,
                        lifetime, 0.0, 1, duration};
    return p;
}

static cp_raman_params raman_case(void)
{
    cp_raman_params p;
    cp_raman_params_init(&p);
    p.rabi_pump = p.rabi_stokes = TWO_PI * 5e6;
    p.width = 2e-6;
    p.delay = 2.4e-6;
    p.gamma = TWO_PI * 6e6;
    return p;
}

/* Two thermal clouds (87Rb and 40K masses, 2 pi x 100 Hz) for the phase-space sampling. */
static void spss_clouds(cp_feshbach_cloud *a, cp_feshbach_cloud *b)
{
    double w = TWO_PI * 100.0;
    *a = (cp_feshbach_cloud){CP_PROFILE_THERMAL, 1e4, 86.909180529 * CP_AMU, {w, w, w}, 0.0};
    *b = (cp_feshbach_cloud){CP_PROFILE_THERMAL, 1e4, 39.963998165 * CP_AMU, {w, w, w}, 0.0};
}

static void test_clear_flag_changes_nothing(void **state)
{
    (void)state;
    enum { P = 21 };
    double a[3 * P], b[3 * P];
    cp_cancel_flag clear = 0;
    cp_hold_params h = hold_case(1.0, 0.5);
    assert_int_equal(cp_collisions_hold(&h, P, a, a + P, a + 2 * P, NULL), CP_OK);
    assert_int_equal(cp_collisions_hold_cancellable(&h, P, b, b + P, b + 2 * P, &clear, NULL),
                     CP_OK);
    assert_memory_equal(a, b, sizeof a);
    assert_int_equal(cp_collisions_hold_cancellable(&h, P, b, b + P, b + 2 * P, NULL, NULL),
                     CP_OK);
    assert_memory_equal(a, b, sizeof a);

    cp_raman_params r = raman_case();
    double d[P], ea[P], eb[P];
    for (int i = 0; i < P; i++)
        d[i] = TWO_PI * 1e5 * (i - P / 2);
    assert_int_equal(cp_raman_scan(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, P, 2, ea, NULL, NULL), CP_OK);
    assert_int_equal(cp_raman_scan_cancellable(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, P, 2, eb, NULL,
                                               &clear, NULL), CP_OK);
    assert_memory_equal(ea, eb, sizeof ea);

    cp_feshbach_cloud fa, fb;
    spss_clouds(&fa, &fb);
    cp_feshbach_spss o = {0.38, 7, 200000, 0};
    double pa, sa, pb, sb;
    assert_int_equal(cp_feshbach_max_efficiency(&fa, &fb, 1e-6, &o, &pa, &sa, NULL), CP_OK);
    assert_int_equal(cp_feshbach_max_efficiency_cancellable(&fa, &fb, 1e-6, &o, &pb, &sb, &clear,
                                                            NULL), CP_OK);
    assert_memory_equal(&pa, &pb, sizeof pa);
    assert_memory_equal(&sa, &sb, sizeof sa);

    double xa[P], wa[P], xb[P], wb[P];
    assert_int_equal(cp_lattice_wannier(20.0, 1, 2.0, P, xa, wa, NULL), CP_OK);
    assert_int_equal(cp_lattice_wannier_bounded(20.0, 1, 2.0, P, xb, wb, &clear,
                                                CP_WORK_LIMIT_S, NULL), CP_OK);
    assert_memory_equal(xa, xb, sizeof xa);
    assert_memory_equal(wa, wb, sizeof wa);
}

static void test_set_flag_cancels(void **state)
{
    (void)state;
    enum { P = 5 };
    double buf[3 * P];
    cp_cancel_flag set = 1;
    cp_error err;
    cp_hold_params h = hold_case(1.0, 0.5);
    assert_int_equal(cp_collisions_hold_cancellable(&h, P, buf, buf + P, buf + 2 * P, &set,
                                                    &err), CP_ECANCELED);
    assert_non_null(strstr(err.message, "collisions.hold: interrupted"));
    for (int i = 0; i < 3 * P; i++)
        assert_true(isnan(buf[i]));
    cp_raman_params r = raman_case();
    double d[P] = {0, 1, 2, 3, 4}, eff[P], lost[P];
    assert_int_equal(cp_raman_scan_cancellable(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, P, 2, eff, lost,
                                               &set, &err), CP_ECANCELED);
    assert_non_null(strstr(err.message, "raman.lineshape: interrupted"));
    for (int i = 0; i < P; i++)
        assert_true(isnan(eff[i]) && isnan(lost[i]));
    cp_feshbach_cloud fa, fb;
    spss_clouds(&fa, &fb);
    cp_feshbach_spss o = {0.38, 7, 200000, 0};
    double pm, se;
    assert_int_equal(cp_feshbach_max_efficiency_cancellable(&fa, &fb, 1e-6, &o, &pm, &se, &set,
                                                            &err), CP_ECANCELED);
    assert_non_null(strstr(err.message, "feshbach.max_efficiency: interrupted"));
    assert_true(isnan(pm) && isnan(se));
    double x[P], w[P];
    assert_int_equal(cp_lattice_wannier_bounded(20.0, 0, 2.0, P, x, w, &set, INFINITY, &err),
                     CP_ECANCELED);
    assert_non_null(strstr(err.message, "lattice.wannier: interrupted"));
    for (int i = 0; i < P; i++)
        assert_true(isnan(x[i]) && isnan(w[i]));
    assert_string_equal(cp_strerror(CP_ECANCELED), "cancelled");
}

typedef struct raiser {
    cp_cancel_flag *flag;
    double at; /* when the flag was raised, s */
} raiser;

static void *raise_later(void *arg)
{
    raiser *r = arg;
    struct timespec d = {0, 100 * 1000 * 1000};
    nanosleep(&d, NULL);
    r->at = now();
    *r->flag = 1;
    return NULL;
}

/* Runs `run` with a flag a second thread raises after 100 ms; returns the delay from the
 * raise to the return, s. */
static double stop_delay(cp_status (*run)(cp_cancel_flag *))
{
    cp_cancel_flag flag = 0;
    raiser r = {&flag, 0};
    pthread_t t;
    assert_int_equal(pthread_create(&t, NULL, raise_later, &r), 0);
    assert_int_equal(run(&flag), CP_ECANCELED);
    double end = now();
    pthread_join(t, NULL);
    return end - r.at;
}

/* 200 bands at 5000 quasimomenta in a 4001-state basis: three minutes of Sturm counts.
 * (A hold is no longer long: its one-body tail is closed-form, collisions_hold.c.) */
static cp_status long_bands(cp_cancel_flag *flag)
{
    enum { N = 5000, B = 200 };
    static double q[N], e[N * B];
    for (int i = 0; i < N; i++)
        q[i] = -1.0 + 2.0 * i / (N - 1);
    return cp_lattice_band_energies_bounded(10.0, B, 4001, N, q, e, NULL, flag, INFINITY, NULL);
}

/* A million-point line shape: minutes of transfers. */
static cp_status long_scan(cp_cancel_flag *flag)
{
    enum { N = 1000000 };
    static double d[N], eff[N];
    for (int i = 0; i < N; i++)
        d[i] = TWO_PI * (i - N / 2);
    cp_raman_params r = raman_case();
    return cp_raman_scan_cancellable(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, N, 2, eff, NULL, flag,
                                     NULL);
}

/* Ten million phase-space samples: seconds. */
static cp_status long_sampling(cp_cancel_flag *flag)
{
    cp_feshbach_cloud a, b;
    spss_clouds(&a, &b);
    cp_feshbach_spss o = {0.38, 7, 10000000, 0};
    double p, se;
    return cp_feshbach_max_efficiency_cancellable(&a, &b, 1e-6, &o, &p, &se, flag, NULL);
}

/* The deepest lattice's Wannier function at the most points: about a second. */
static cp_status long_wannier(cp_cancel_flag *flag)
{
    enum { N = 100000 };
    static double x[N], w[N];
    return cp_lattice_wannier_bounded(1e4, 0, 3.0, N, x, w, flag, INFINITY, NULL);
}

static void test_flag_stops_running_computations(void **state)
{
    (void)state;
    double dh = stop_delay(long_bands), ds = stop_delay(long_scan), dm = stop_delay(long_sampling);
    double dw = stop_delay(long_wannier);
    print_message("stopped after the flag: bands %.1f ms, line shape %.1f ms, sampling %.1f ms, "
                  "Wannier function %.1f ms\n", 1e3 * dh, 1e3 * ds, 1e3 * dm, 1e3 * dw);
    assert_true(dh < 0.1);
    assert_true(ds < 0.1);
    assert_true(dm < 0.1);
    assert_true(dw < 0.1);
}

/* Refused before starting: a million-point line shape of 3 us pulses (about 90 s: the
 * message names the estimate and the points that fit), 5000 quasimomenta x 200 bands in a
 * 4001-state basis (three minutes), ten million samples (2.3 s), 1e5 points of a Wannier
 * function at 1e4 E_r (1.4 s), and a work limit of 0; each returns within a
 * fraction of a second with NaN outputs.  Within the limit: the plain functions' bits. */
static void test_work_estimates(void **state)
{
    (void)state;
    enum { N = 1000000, P = 21, NQ = 5000, B = 200 };
    static double d[N], eff[N], q[NQ], e[NQ * B];
    for (int i = 0; i < N; i++)
        d[i] = TWO_PI * (i - N / 2);
    cp_raman_params r = raman_case();
    cp_error err;
    double t0 = now();
    assert_int_equal(cp_raman_scan_bounded(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, N, 2, eff, NULL, NULL,
                                           CP_WORK_LIMIT_S, &err), CP_ETOOLONG);
    assert_non_null(strstr(err.message, "raman.lineshape: estimated work"));
    assert_non_null(strstr(err.message, "scan at most"));
    assert_true(isnan(eff[0]) && isnan(eff[N / 2]) && isnan(eff[N - 1]));
    for (int i = 0; i < NQ; i++)
        q[i] = -1.0 + 2.0 * i / (NQ - 1);
    assert_int_equal(cp_lattice_band_energies_bounded(10.0, B, 4001, NQ, q, e, NULL, NULL,
                                                      CP_WORK_LIMIT_S, &err), CP_ETOOLONG);
    assert_non_null(strstr(err.message, "5000 quasimomenta x 200 bands in a 4001-state basis"));
    assert_true(isnan(e[0]));
    cp_feshbach_cloud fa, fb;
    spss_clouds(&fa, &fb);
    cp_feshbach_spss o = {0.38, 7, 10000000, 0};
    double pm, se;
    assert_int_equal(cp_feshbach_max_efficiency_bounded(&fa, &fb, 1e-6, &o, &pm, &se, NULL,
                                                        CP_WORK_LIMIT_S, &err), CP_ETOOLONG);
    assert_non_null(strstr(err.message, "10000000 samples"));
    assert_true(isnan(pm) && isnan(se));
    /* 1e5 points of the Wannier function at 1e4 E_r (141-state basis): about 1.4 s */
    static double wx[100000], ww[100000];
    assert_int_equal(cp_lattice_wannier_bounded(1e4, 0, 3.0, 100000, wx, ww, NULL,
                                                CP_WORK_LIMIT_S, &err), CP_ETOOLONG);
    assert_non_null(strstr(err.message, "lattice.wannier: estimated work"));
    assert_non_null(strstr(err.message, "100000 points in a 141-state basis"));
    assert_true(isnan(wx[0]) && isnan(ww[99999]));
    assert_int_equal(cp_lattice_wannier_bounded(1e4, 0, 3.0, 100, wx, ww, NULL, 0.0, &err),
                     CP_EINVAL);
    double used = now() - t0;
    print_message("four refusals in %.1f ms\n", 1e3 * used);
    assert_true(used < 0.5); /* against 90 s + 3 min + 2.3 s + 1.4 s if they ran */
    assert_string_equal(cp_strerror(CP_ETOOLONG), "estimated work too long");

    /* a work limit must be > 0 (+inf: none): refused in the house wording (DEVELOPERS.md),
     * outputs NaN */
    assert_int_equal(cp_raman_scan_bounded(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, 3, 1, eff, NULL, NULL,
                                           0.0, &err), CP_EINVAL);
    assert_string_equal(err.message, "raman.lineshape: work limit 0 s is out of range; allowed "
                                     "(0, inf] s");
    assert_true(isnan(eff[0]));
    assert_int_equal(cp_lattice_band_energies_bounded(8.0, 3, 0, 5, q, e, NULL, NULL, NAN, &err),
                     CP_EINVAL);
    assert_string_equal(err.message, "lattice.bands: work limit NaN s is not a number; "
                                     "allowed (0, inf] s");
    assert_true(isnan(e[0]));
    assert_int_equal(cp_feshbach_max_efficiency_bounded(&fa, &fb, 1e-6, &o, &pm, &se, NULL,
                                                        -1.0, &err), CP_EINVAL);
    assert_string_equal(err.message, "feshbach.max_efficiency: work limit -1 s is out of range; "
                                     "allowed (0, inf] s");
    assert_true(isnan(pm) && isnan(se));

    /* within the limit: the same bits as the plain functions (first, middle and last
     * points computed ahead of the others) */
    double ea[P], eb[P], la[P], lb[P];
    for (int i = 0; i < P; i++)
        d[i] = TWO_PI * 1e5 * (i - P / 2);
    assert_int_equal(cp_raman_scan(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, P, 3, ea, la, NULL), CP_OK);
    assert_int_equal(cp_raman_scan_bounded(&r, CP_RAMAN_SCAN_TWO_PHOTON, d, P, 3, eb, lb, NULL,
                                           CP_WORK_LIMIT_S, NULL), CP_OK);
    assert_memory_equal(ea, eb, sizeof ea);
    assert_memory_equal(la, lb, sizeof la);
    double e1[51 * 3], e2[51 * 3];
    for (int i = 0; i < 51; i++)
        q[i] = -1.0 + i / 25.0;
    assert_int_equal(cp_lattice_band_energies(8.0, 3, 0, 51, q, e1, NULL, NULL), CP_OK);
    assert_int_equal(cp_lattice_band_energies_bounded(8.0, 3, 0, 51, q, e2, NULL, NULL,
                                                      CP_WORK_LIMIT_S, NULL), CP_OK);
    assert_memory_equal(e1, e2, sizeof e1);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_clear_flag_changes_nothing),
        cmocka_unit_test(test_set_flag_cancels),
        cmocka_unit_test(test_flag_stops_running_computations),
        cmocka_unit_test(test_work_estimates),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
