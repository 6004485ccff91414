/*
 * Lua binding: coldprep.raman over core/raman*.c — transfer{...} (one sequence, optional
 * round trip and time trace) and lineshape{...} (a detuning scan on several threads).
 * All arrays handed to C live in userdata on the Lua stack, so an argument error that
 * long-jumps leaks nothing.
 */
#include <lauxlib.h>
#include <lua.h>
#include <math.h>

#include "args.h"
#include "coldprep/raman.h"
#include "help.h"
#include "reals.h"

int cpl_open_raman(lua_State *L);

#define PULSE_KEYS                                                                          \
    "rabi_pump", "rabi_stokes", "width", "delay", "gamma", "detuning", "two_photon_detuning", \
        "pump_linewidth_hz", "stokes_linewidth_hz", "relative_linewidth_hz", "shape",       \
        "times", "pump", "stokes", "branching_initial", "branching_target", "gamma_initial", \
        "gamma_target", "accuracy"

static const char *const transfer_keys[] = {PULSE_KEYS, "round_trip", "trace", "estimates",
                                            NULL};
static const char *const lineshape_keys[] = {PULSE_KEYS, "scan", "values", "from", "to",
                                             "points", "threads", "allow_long", NULL};
static const char *const trace_names[CP_RAMAN_TRACE_COLUMNS] = {
    [CP_RAMAN_TRACE_TIME] = "time",       [CP_RAMAN_TRACE_INITIAL] = "initial",
    [CP_RAMAN_TRACE_EXCITED] = "excited", [CP_RAMAN_TRACE_TARGET] = "target",
    [CP_RAMAN_TRACE_LOST] = "lost",       [CP_RAMAN_TRACE_RE12] = "coherence_12_re",
    [CP_RAMAN_TRACE_IM12] = "coherence_12_im", [CP_RAMAN_TRACE_RE13] = "coherence_13_re",
    [CP_RAMAN_TRACE_IM13] = "coherence_13_im", [CP_RAMAN_TRACE_RE23] = "coherence_23_re",
    [CP_RAMAN_TRACE_IM23] = "coherence_23_im"};
static const char *const shapes[] = {"gaussian", "sin2", "sampled", NULL};

/* Read the sequence and model parameters shared by both functions into p.  Sampled arrays
 * are left on the stack (userdata) and must stay there while p is used. */
static void read_params(lua_State *L, const char *fname, cp_raman_params *p)
{
    cp_raman_params_init(p);
    p->shape = (cp_raman_shape)cpl_option(L, 1, fname, "shape", shapes, "gaussian");
    if (p->shape == CP_RAMAN_SAMPLED) {
        static const char *const analytic[] = {"rabi_pump", "rabi_stokes", "width", "delay",
                                               NULL};
        for (int i = 0; analytic[i]; i++)
            if (cpl_has(L, 1, analytic[i]))
                cpl_error(L, fname, "argument '%s' is not used with shape = \"sampled\" (give "
                          "times, pump and stokes)", analytic[i]);
        size_t nt, np, ns;
        p->times = cpl_number_array(L, 1, fname, "times", "s", 3, &nt);
        p->pump_samples = cpl_number_array(L, 1, fname, "pump", "rad/s", 3, &np);
        p->stokes_samples = cpl_number_array(L, 1, fname, "stokes", "rad/s", 3, &ns);
        if (np != nt || ns != nt)
            cpl_error(L, fname, "arrays 'times', 'pump' and 'stokes' must have the same length, "
                      "got %zu, %zu and %zu", nt, np, ns);
        p->n_samples = nt;
    } else {
        static const char *const sampled[] = {"times", "pump", "stokes", NULL};
        for (int i = 0; sampled[i]; i++)
            if (cpl_has(L, 1, sampled[i]))
                cpl_error(L, fname, "argument '%s' is only used with shape = \"sampled\"",
                          sampled[i]);
        p->rabi_pump = cpl_number(L, 1, fname, "rabi_pump", "rad/s");
        p->rabi_stokes = cpl_number(L, 1, fname, "rabi_stokes", "rad/s");
        p->width = cpl_number(L, 1, fname, "width", "s");
        p->delay = cpl_number(L, 1, fname, "delay", "s");
    }
    p->gamma = cpl_number(L, 1, fname, "gamma", "1/s");
    p->detuning = cpl_opt_number(L, 1, fname, "detuning", "rad/s", 0.0);
    p->two_photon_detuning = cpl_opt_number(L, 1, fname, "two_photon_detuning", "rad/s", 0.0);
    p->pump_linewidth_hz = cpl_opt_number(L, 1, fname, "pump_linewidth_hz", "Hz", 0.0);
    p->stokes_linewidth_hz = cpl_opt_number(L, 1, fname, "stokes_linewidth_hz", "Hz", 0.0);
    p->use_relative = cpl_has(L, 1, "relative_linewidth_hz");
    p->relative_linewidth_hz = cpl_opt_number(L, 1, fname, "relative_linewidth_hz", "Hz", 0.0);
    p->branching_initial = cpl_opt_number(L, 1, fname, "branching_initial", "", 0.0);
    p->branching_target = cpl_opt_number(L, 1, fname, "branching_target", "", 0.0);
    p->gamma_initial = cpl_opt_number(L, 1, fname, "gamma_initial", "1/s", 0.0);
    p->gamma_target = cpl_opt_number(L, 1, fname, "gamma_target", "1/s", 0.0);
    p->accuracy = cpl_opt_number(L, 1, fname, "accuracy", "", 1e-8);
}

static double *new_array(lua_State *L, size_t n)
{
    return lua_newuserdatauv(L, n * sizeof(double), 0);
}

static int l_transfer(lua_State *L)
{
    static const char *fname = "raman.transfer";
    cpl_check_args(L, 1, fname, transfer_keys);
    cp_raman_params p;
    read_params(L, fname, &p);
    int round_trip = cpl_opt_boolean(L, 1, fname, "round_trip", 0);
    p.estimates = cpl_opt_boolean(L, 1, fname, "estimates", 1);
    long ntrace = cpl_opt_integer(L, 1, fname, "trace", 0, 0, 100000);
    if (ntrace == 1)
        cpl_error(L, fname, "trace 1 is out of range; allowed 0 (none) or 2 to "
                  "100000 samples");
    cp_raman_trace tr = {.n = (size_t)ntrace};
    if (ntrace) {
        double *buf = new_array(L, CP_RAMAN_TRACE_COLUMNS * tr.n);
        for (int c = 0; c < CP_RAMAN_TRACE_COLUMNS; c++)
            tr.column[c] = buf + (size_t)c * tr.n;
    }
    cp_raman_result r;
    cp_error err;
    if (cp_raman_transfer(&p, round_trip, &r, ntrace ? &tr : NULL, &err) != CP_OK)
        return cpl_raise(L, &err);

    lua_createtable(L, 0, 12);
    cpl_set_number(L, "efficiency", r.efficiency);
    lua_createtable(L, 0, 3);
    cpl_set_number(L, "initial", r.populations[0]);
    cpl_set_number(L, "excited", r.populations[1]);
    cpl_set_number(L, "target", r.populations[2]);
    lua_setfield(L, -2, "populations");
    cpl_set_number(L, "lost", r.lost);
    if (round_trip)
        cpl_set_number(L, "round_trip_efficiency", r.round_trip_efficiency);
    if (p.estimates) {
        cpl_set_number(L, "adiabaticity", r.adiabaticity);
        cpl_set_number(L, "overlap_time", r.overlap_time);
        lua_createtable(L, 0, 4);
        cpl_set_number(L, "decay_loss", r.decay_loss_estimate);
        cpl_set_number(L, "dephasing_loss", r.dephasing_loss_estimate);
        if (!isnan(r.nonadiabatic_loss_estimate)) { /* defined for resonant Gaussians only */
            cpl_set_number(L, "nonadiabatic_loss", r.nonadiabatic_loss_estimate);
            cpl_set_number(L, "nonadiabatic_exponent", r.nonadiabatic_exponent);
        }
        lua_setfield(L, -2, "estimates");
    }
    cpl_set_number(L, "t_start", r.t_start);
    cpl_set_number(L, "t_end", r.t_end);
    cpl_set_number(L, "transfer_duration", r.transfer_duration);
    static const char *const flag_names[] = {"estimates_detuned", NULL};
    cpl_set_flags(L, r.flags, flag_names);
    cpl_set_integer(L, "steps", (lua_Integer)r.steps);
    cpl_set_string(L, "integrator", r.integrator);
    if (ntrace) {
        lua_createtable(L, 0, CP_RAMAN_TRACE_COLUMNS);
        for (int c = 0; c < CP_RAMAN_TRACE_COLUMNS; c++) {
            cpl_push_array(L, tr.column[c], tr.n);
            lua_setfield(L, -2, trace_names[c]);
        }
        lua_setfield(L, -2, "trace");
    }
    return 1;
}

static int l_lineshape(lua_State *L)
{
    static const char *fname = "raman.lineshape";
    static const char *const vars[] = {"two_photon_detuning", "detuning", NULL};
    cpl_check_args(L, 1, fname, lineshape_keys);
    cp_raman_params p;
    read_params(L, fname, &p);
    int var = cpl_option(L, 1, fname, "scan", vars, "two_photon_detuning");
    int threads = (int)cpl_opt_integer(L, 1, fname, "threads", 1, 1, 64);
    const char *key = vars[var];
    if (cpl_has(L, 1, key))
        cpl_error(L, fname, "argument '%s' is the scanned variable; give 'values' or "
                  "'from'/'to'/'points' instead", key);
    size_t n;
    const double *values;
    /* a reals of values gives reals back, the kernel writing into them */
    int as_reals = cpl_is_reals_field(L, 1, "values");
    if (cpl_has(L, 1, "values")) {
        if (cpl_has(L, 1, "from") || cpl_has(L, 1, "to") || cpl_has(L, 1, "points"))
            cpl_error(L, fname, "give either 'values' or 'from'/'to'/'points', not both");
        values = cpl_number_array(L, 1, fname, "values", "rad/s", 1, &n);
    } else {
        double from = cpl_number(L, 1, fname, "from", "rad/s");
        double to = cpl_number(L, 1, fname, "to", "rad/s");
        n = (size_t)cpl_opt_integer(L, 1, fname, "points", 101, 1, 1000000);
        double *grid = new_array(L, n);
        for (size_t i = 0; i < n; i++)
            grid[i] = n == 1 ? from : from + (to - from) * (double)i / (double)(n - 1);
        values = grid;
    }
    int top = lua_gettop(L);
    double *eff = as_reals ? cpl_new_reals(L, n) : new_array(L, n);
    double *lost = as_reals ? cpl_new_reals(L, n) : new_array(L, n);
    cp_error err;
    if (cp_raman_scan_bounded(&p, (cp_raman_scan_variable)var, values, n, threads, eff, lost,
                              cpl_cancel_flag(L), cpl_work_limit(L, 1, fname), &err) != CP_OK)
        return cpl_raise(L, &err);
    lua_createtable(L, 0, 4);
    cpl_set_string(L, "scan", key);
    cpl_push_numbers(L, values, n, as_reals);
    lua_setfield(L, -2, "values");
    if (as_reals) {
        lua_pushvalue(L, top + 1);
        lua_setfield(L, -2, "efficiency");
        lua_pushvalue(L, top + 2);
        lua_setfield(L, -2, "lost");
    } else {
        cpl_push_array(L, eff, n);
        lua_setfield(L, -2, "efficiency");
        cpl_push_array(L, lost, n);
        lua_setfield(L, -2, "lost");
    }
    return 1;
}

#define COMMON_HELP                                                                          \
    "  rabi_pump, rabi_stokes  peak Rabi frequencies (rad/s, full Rabi frequency)\n"         \
    "  width    s; gaussian: O(t) = rabi exp(-(t-tc)^2/width^2); sin2: O(t) = rabi\n"         \
    "           cos^2(pi (t-tc)/(2 width)) for |t-tc| < width (duration 2 width)\n"           \
    "  delay    s; Stokes centred at -delay/2, pump at +delay/2 (delay > 0: counter-intuitive)\n" \
    "  gamma    decay rate of the excited state |2> (1/s)\n"                                  \
    "  detuning = 0, two_photon_detuning = 0  Delta and delta (rad/s)\n"                          \
    "  pump_linewidth_hz = 0, stokes_linewidth_hz = 0  independent lasers, Lorentzian FWHM (Hz)\n" \
    "  relative_linewidth_hz  lasers on a common reference: FWHM of their beat note (Hz);\n"  \
    "           pump_linewidth_hz is then the common-mode linewidth, stokes_linewidth_hz = 0\n" \
    "  shape = \"gaussian\" | \"sin2\" | \"sampled\"; sampled: times (s, increasing, >= 3),\n" \
    "           pump, stokes (rad/s at those times; Steffen interpolation, 0 outside)\n"      \
    "  branching_initial = 0, branching_target = 0  fractions of the |2> decay into |1>, |3>\n" \
    "  gamma_initial = 0, gamma_target = 0  slow loss rates of |1>, |3> (1/s), acting over the\n" \
    "           transfer duration |delay| + 2 width (sampled: the sample span)\n"           \
    "  accuracy = 1e-8  absolute accuracy asked of the final populations (1e-12 to 1e-3)\n"

static const cpl_function functions[] = {
    {"transfer", l_transfer,
     "raman.transfer{...}: two-photon Raman transfer (STIRAP) |1> -> |3> via |2>, Lindblad\n"
     "propagation from |1>.  Arguments:\n" COMMON_HELP
     "  round_trip = false  also run the time-reversed sequence back to |1>\n"
     "  trace = 0  number of equally spaced samples of the forward sequence to return\n"
     "  estimates = true  also return the closed-form estimates (false: skip them)\n"
     "Returns {efficiency, populations = {initial, excited, target}, lost,\n"
     "  round_trip_efficiency (if round_trip), adiabaticity (max Omega_rms * overlap_time),\n"
     "  overlap_time (s), estimates = {decay_loss, dephasing_loss, nonadiabatic_loss,\n"
     "  nonadiabatic_exponent} (closed forms; the last two, the Dykhne-Davis-Pechukas loss\n"
     "  4p(1-p), p = exp(-nonadiabatic_exponent), only for Gaussian pulses with delay >= width\n"
     "  and detuning = two_photon_detuning = 0; these three only with estimates = true),\n"
     "  flags = {\"estimates_detuned\"} when decay_loss and dephasing_loss are outside their\n"
     "  range (|delta| overlap_time > 0.5 or |Delta| > max(gamma, Omega_rms)), else {} (always\n"
     "  {} with estimates = false), transfer_duration (s), t_start, t_end (s), steps,\n"
     "  integrator (\"dopri5\" or \"gauss-legendre\"), trace = {time, initial, excited, target,\n"
     "  lost, coherence_12_re, coherence_12_im, coherence_13_re, ..., coherence_23_im} (if\n"
     "  trace)}.\n"
     "Example: cp.raman.transfer{rabi_pump = 2*math.pi*5*cp.units.MHz,\n"
     "  rabi_stokes = 2*math.pi*5*cp.units.MHz, width = 2*cp.units.us, delay = 2.4*cp.units.us,\n"
     "  gamma = 2*math.pi*6*cp.units.MHz, pump_linewidth_hz = 1e3, stokes_linewidth_hz = 1e3}"},
    {"lineshape", l_lineshape,
     "raman.lineshape{...}: one-way efficiency versus a detuning, computed on several threads.\n"
     "Arguments: those of raman.transfer (without round_trip, trace, and without the scanned\n"
     "detuning), plus\n"
     "  scan = \"two_photon_detuning\" | \"detuning\"\n"
     "  values = {...} (rad/s)  or  from, to (rad/s), points = 101\n"
     "  threads = 1  (1 to 64)\n"
     "  allow_long = false  run a scan estimated beyond 1 s of CPU (refused otherwise)\n"
     "Returns {scan, values, efficiency, lost}.\n"
     "Example: cp.raman.lineshape{rabi_pump = 2*math.pi*5e6, rabi_stokes = 2*math.pi*5e6,\n"
     "  width = 2e-6, delay = 2.4e-6, gamma = 2*math.pi*6e6, from = -2*math.pi*200e3,\n"
     "  to = 2*math.pi*200e3, points = 41, threads = 2}"},
    {NULL, NULL, NULL}};

int cpl_open_raman(lua_State *L)
{
    lua_newtable(L);
    cpl_register(L, functions);
    return 1;
}
