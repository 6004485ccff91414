/*
 * `coldprep sweep FILE.lua [--jobs N] [--out PATH] [--resume] [--force] [--shard K/N]`:
 * the command line around the engine of cli_sweep_run.c: options, the slice of points
 * (--shard or the job-array variables of SLURM and SGE), opening the output afresh or
 * after its finished rows (--resume: a torn last row is dropped, the rows the journal
 * PATH.pending kept are recovered), SIGINT/SIGTERM (stop starting points, stop the running
 * ones within 0.2 s: the signal is the workers' cancel flag; finished rows stay on disk),
 * the summary line and the completion marker PATH.done.
 */
#include <errno.h>
#include <fcntl.h>
#include <inttypes.h>
#include <lauxlib.h>
#include <signal.h>
#include <stdlib.h>
#include <string.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli.h"
#include "cli_sweep.h"
#include "fileio.h"

static const char SWEEP_USAGE[] =
    "usage: coldprep sweep FILE.lua [--jobs N] [--out PATH] [--resume] [--force]\n"
    "                      [--shard K/N]\n"
    "\n"
    "Runs the sweep FILE.lua returns (a cp.sweep description table) and streams one row\n"
    "per point to PATH (default: FILE with .csv; .jsonl gives JSON Lines).\n"
    "  --jobs N     worker threads, each with its own Lua state (default: the cores)\n"
    "  --out PATH   output file (overrides the description's `out`)\n"
    "  --resume     continue an interrupted run: keep its finished rows, drop a torn\n"
    "               last row, compute the rest\n"
    "  --force      overwrite an existing output file\n"
    "  --shard K/N  compute only slice K of N (output PATH gets .K-of-N before its\n"
    "               extension); without it, SLURM_ARRAY_TASK_ID/_COUNT or SGE_TASK_ID/\n"
    "               _FIRST/_LAST/_STEPSIZE give the slice when set (SGE_TASK_ID=undefined:\n"
    "               none)\n"
    "  --sandbox    run FILE as a file you do not trust (also when COLDPREP_SANDBOX=1):\n"
    "               no os or io beyond reading its own directory, no native code, debug\n"
    "               library or bytecode; each point capped in memory and time\n"
    "  --max-memory MIB  memory cap of each worker's Lua state (default 1024)\n"
    "  --max-time S      time cap of each point (default 600)\n"
    "Join slices with `coldprep merge OUT SLICES...`.  See docs/cli.md (Sweeps).\n";

enum { MAX_JOBS = 1024 };

static volatile sig_atomic_t got_signal = 0;

static void on_stop_signal(int sig)
{
    got_signal = sig;
    signal(sig, SIG_DFL); /* a second one ends the process at once */
}

/* --shard K/N, or the job-array variables of SLURM or SGE; 0 if none, -1 if malformed. */
static int parse_shard(const char *s, int64_t *k, int64_t *n)
{
    char *end;
    long long a = strtoll(s, &end, 10);
    if (end == s || *end != '/')
        return -1;
    const char *s2 = end + 1;
    long long b = strtoll(s2, &end, 10);
    if (end == s2 || *end != '\0' || b < 1 || b > (1LL << 30) || a < 1 || a > b)
        return -1;
    *k = a;
    *n = b;
    return 1;
}

/* The integer in environment variable `name`: 1 if set, 0 if unset or empty, -1 (with a
 * message in err) if it is not a whole number. */
static int env_int(const char *name, long long *v, char *err, size_t errlen)
{
    const char *s = getenv(name);
    char *end;
    if (s == NULL || *s == '\0')
        return 0;
    errno = 0;
    *v = strtoll(s, &end, 10);
    if (*end != '\0' || errno != 0) {
        snprintf(err, errlen, "%s is '%.100s', not a whole number; give --shard K/N", name, s);
        return -1;
    }
    return 1;
}

static int shard_from_env(int64_t *k, int64_t *n, char *err, size_t errlen)
{
    long long id = 0, count = 0, lo = 0, hi = 0, step = 1;
    int have = env_int("SLURM_ARRAY_TASK_ID", &id, err, errlen);
    if (have < 0)
        return -1;
    if (have > 0) {
        /* SLURM numbers tasks as the user's --array range says: offset by its minimum. */
        int c = env_int("SLURM_ARRAY_TASK_COUNT", &count, err, errlen);
        int m = c < 0 ? 0 : env_int("SLURM_ARRAY_TASK_MIN", &lo, err, errlen);
        if (c < 0 || m < 0)
            return -1;
        if (c == 0 || m == 0) {
            snprintf(err, errlen, "SLURM_ARRAY_TASK_ID is set but SLURM_ARRAY_TASK_COUNT or "
                     "SLURM_ARRAY_TASK_MIN is not; give --shard K/N");
            return -1;
        }
        int st = env_int("SLURM_ARRAY_TASK_STEP", &step, err, errlen);
        if (st < 0)
            return -1;
        if (st == 0)
            step = 1;
        *n = count;
    } else {
        /* SGE and its successors set SGE_TASK_ID=undefined in jobs that are not arrays */
        const char *sge = getenv("SGE_TASK_ID");
        if (sge != NULL && strcmp(sge, "undefined") == 0)
            return 0;
        have = env_int("SGE_TASK_ID", &id, err, errlen);
        if (have <= 0)
            return have;
        int f = env_int("SGE_TASK_FIRST", &lo, err, errlen);
        int l = f < 0 ? 0 : env_int("SGE_TASK_LAST", &hi, err, errlen);
        if (f < 0 || l < 0)
            return -1;
        if (f == 0 || l == 0) {
            snprintf(err, errlen, "SGE_TASK_ID is set but SGE_TASK_FIRST/SGE_TASK_LAST are not");
            return -1;
        }
        int st = env_int("SGE_TASK_STEPSIZE", &step, err, errlen);
        if (st < 0)
            return -1;
        if (st == 0)
            step = 1;
        *n = step >= 1 ? (hi - lo) / step + 1 : 0;
    }
    if (step < 1) {
        snprintf(err, errlen, "the scheduler's array step is %lld; allowed >= 1", step);
        return -1;
    }
    *k = (id - lo) / step + 1;
    if (*n < 1 || *n > (1LL << 30) || *k < 1 || *k > *n) {
        snprintf(err, errlen, "the scheduler's array variables give slice %" PRId64 " of %" PRId64
                 ", which is not a valid slice (1 <= K <= N <= 2^30)", *k, *n);
        return -1;
    }
    return 1;
}

/* PATH with ".K-of-N" inserted before its extension. */
static void shard_path(const char *path, int64_t k, int64_t n, char *buf, size_t len)
{
    const char *slash = strrchr(path, '/');
    const char *dot = strrchr(path, '.');
    if (dot == NULL || (slash && dot < slash) || dot == (slash ? slash + 1 : path))
        dot = path + strlen(path);
    snprintf(buf, len, "%.*s.%" PRId64 "-of-%" PRId64 "%s", (int)(dot - path), path, k, n, dot);
}

static int usage(const char *msg, const char *what)
{
    fprintf(stderr, "coldprep sweep: %s%s%s\nTry 'coldprep sweep --help'.\n", msg,
            what ? " " : "", what ? what : "");
    return CPL_EXIT_USAGE;
}

typedef struct sweep_options {
    const char *file, *out;
    long jobs;
    int resume, force;
    int64_t shard, shards;
    cpl_sandbox sandbox;
} sweep_options;

static int parse_options(int argc, char **argv, sweep_options *o)
{
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i];
        char err[256];
        int sbo = cpl_sandbox_option(argc, argv, &i, &o->sandbox, err, sizeof err);
        if (sbo < 0)
            return usage(err, NULL);
        if (sbo > 0)
            continue;
        if (strcmp(a, "-h") == 0 || strcmp(a, "--help") == 0) {
            fputs(SWEEP_USAGE, stdout);
            return -1;
        } else if (strcmp(a, "--jobs") == 0 || strcmp(a, "-j") == 0) {
            char *end, msg[320];
            if (++i >= argc)
                return usage("--jobs needs a number", NULL);
            o->jobs = strtol(argv[i], &end, 10);
            int whole = *end == '\0' && end != argv[i];
            if (!whole || o->jobs < 1 || o->jobs > MAX_JOBS) {
                snprintf(msg, sizeof msg, "--jobs %.256s is %s; allowed [1, %d]", argv[i],
                         whole ? "out of range" : "not a whole number", MAX_JOBS);
                return usage(msg, NULL);
            }
        } else if (strcmp(a, "--out") == 0 || strcmp(a, "-o") == 0) {
            if (++i >= argc)
                return usage("--out needs a path", NULL);
            o->out = argv[i];
        } else if (strcmp(a, "--resume") == 0) {
            o->resume = 1;
        } else if (strcmp(a, "--force") == 0) {
            o->force = 1;
        } else if (strcmp(a, "--shard") == 0) {
            if (++i >= argc || parse_shard(argv[i], &o->shard, &o->shards) != 1)
            {
                char msg[320];
                snprintf(msg, sizeof msg, "--shard %.256s is not a slice; allowed K/N with "
                         "1 <= K <= N", i < argc ? argv[i] : "(nothing)");
                return usage(msg, NULL);
            }
        } else if (a[0] == '-' && a[1] != '\0') {
            char msg[512];
            snprintf(msg, sizeof msg, "unknown option %s; allowed --jobs N (-j), --out PATH (-o), "
                     "--resume, --force, --shard K/N, --sandbox, --max-memory MIB, --max-time S, "
                     "-h (--help)", a);
            return usage(msg, NULL);
        } else if (o->file == NULL) {
            o->file = a;
        } else {
            return usage("more than one sweep file:", a);
        }
    }
    if (o->file == NULL)
        return usage("no sweep file given", NULL);
    if (o->resume && o->force)
        return usage("--resume and --force contradict each other", NULL);
    return 0;
}

/* Open the output and the journal: afresh, or (--resume) after the file's finished rows,
 * with the journal's rows recovered and the journal rewritten to hold exactly those.
 * Sets r->fd, r->jfd, r->next_write and the recovered rows; *complete is set when the
 * file is already finished.  Returns 0, or -1 after printing why. */
static int open_output(cpl_sweep_run *r, const sweep_options *o, int64_t first, int *complete)
{
    char err[8192], done[4096];
    struct stat st;
    int exists = stat(r->out, &st) == 0;
    cpl_marker_path(r->out, done, sizeof done);
    r->next_write = first;
    *complete = 0;
    if (exists && !o->resume && !o->force && st.st_size > 0) {
        fprintf(stderr, "coldprep sweep: %s exists; add --resume to continue it or --force to "
                "overwrite it\n", r->out);
        return -1;
    }
    if (exists && o->resume) {
        off_t good_end, torn;
        if (cpl_sweep_scan(r->out, r->format, r->header, r->shape, first, &r->next_write,
                           &good_end, &torn, err, sizeof err) != 0) {
            fprintf(stderr, "coldprep sweep: cannot resume: %s\n", err);
            return -1;
        }
        if (r->next_write > r->last + 1) {
            fprintf(stderr, "coldprep sweep: cannot resume: %s has more rows than this slice\n",
                    r->out);
            return -1;
        }
        size_t dropped;
        if (cpl_journal_read(r->journal, r->format, r->shape, r->next_write, r->last,
                             &r->recovered, &r->nrecovered, &dropped, err, sizeof err) != 0) {
            fprintf(stderr, "coldprep sweep: cannot resume: %s\n", err);
            return -1;
        }
        if (dropped > 0)
            fprintf(stderr, "coldprep sweep: ignored %zu malformed rows of %s (their points are "
                    "computed again)\n", dropped, r->journal);
        r->fd = cpl_open_nofollow(r->out, O_WRONLY | O_APPEND, 0);
        if (r->fd < 0 || ftruncate(r->fd, good_end) != 0
            || (good_end == 0 && cpl_write_all(r->fd, r->header, strlen(r->header)) != 0)) {
            fprintf(stderr, "coldprep sweep: cannot resume %s: %s\n", r->out,
                    errno == ELOOP ? "it is a symbolic link" : strerror(errno));
            return -1;
        }
        if (torn > 0)
            fprintf(stderr, "coldprep sweep: dropped an incomplete last row (%jd bytes) of %s\n",
                    (intmax_t)torn, r->out);
        if (r->nrecovered > 0)
            fprintf(stderr, "coldprep sweep: recovered %zu finished rows from %s\n",
                    r->nrecovered, r->journal);
        *complete = r->next_write > r->last && stat(done, &st) == 0;
    } else {
        remove(done); /* before the old rows go: a marker must never outlive its file */
        r->fd = cpl_open_nofollow(r->out, O_WRONLY | O_CREAT | O_TRUNC | O_APPEND, 0644);
        if (r->fd < 0 || cpl_write_all(r->fd, r->header, strlen(r->header)) != 0) {
            fprintf(stderr, "coldprep sweep: cannot write %s: %s\n", r->out,
                    errno == ELOOP ? "it is a symbolic link" : strerror(errno));
            return -1;
        }
    }
    /* The journal holds exactly the recovered rows (a torn row of it is gone).  They are
     * written to PATH.pending.tmp that then replaces it, so that a kill meanwhile leaves
     * the old journal with the same rows: never a truncated one. */
    char tmp[4300];
    snprintf(tmp, sizeof tmp, "%s.tmp", r->journal);
    r->jfd = cpl_create_temp(tmp);
    int bad = r->jfd < 0;
    for (size_t i = 0; i < r->nrecovered && !bad; i++)
        bad = cpl_write_all(r->jfd, r->recovered[i].text, r->recovered[i].len) != 0;
    if (bad || rename(tmp, r->journal) != 0) {
        fprintf(stderr, "coldprep sweep: cannot write %s: %s\n", r->journal, strerror(errno));
        unlink(tmp);
        return -1;
    }
    r->journal_rows = (long)r->nrecovered;
    return 0;
}

static void close_output(cpl_sweep_run *r)
{
    if (r->fd >= 0)
        close(r->fd);
    if (r->jfd >= 0)
        close(r->jfd);
    for (size_t i = 0; i < r->nrecovered; i++)
        free(r->recovered[i].text);
    free(r->recovered);
    r->recovered = NULL;
    r->nrecovered = 0;
}

static int run_sweep_locked(cpl_sweep_run *r, const sweep_options *o, int64_t shard,
                            int64_t shards)
{
    int64_t first;
    cpl_shard_range(r->count, shard, shards, &first, &r->last);
    char done[4096], err[8192];
    cpl_marker_path(r->out, done, sizeof done);
    int complete;
    if (open_output(r, o, first, &complete) != 0) {
        close_output(r);
        return CPL_EXIT_ERROR;
    }
    if (complete) {
        fprintf(stderr, "coldprep sweep: %s is already complete (%" PRId64 " points)\n", r->out,
                r->last - first + 1);
        close_output(r);
        unlink(r->journal);
        return CPL_EXIT_OK;
    }
    remove(done);

    struct sigaction sa, old_int, old_term;
    memset(&sa, 0, sizeof sa);
    sa.sa_handler = on_stop_signal;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, &old_int);
    sigaction(SIGTERM, &sa, &old_term);
    int64_t resumed = r->next_write - first, recovered = (int64_t)r->nrecovered;
    int erc = cpl_sweep_execute(r, o->jobs, &got_signal, isatty(2));
    sigaction(SIGINT, &old_int, NULL);
    sigaction(SIGTERM, &old_term, NULL);

    int rc = erc == 0 ? CPL_EXIT_OK : CPL_EXIT_ERROR;
    if (fsync(r->fd) != 0 && errno != EINVAL && rc == CPL_EXIT_OK) {
        fprintf(stderr, "coldprep sweep: cannot sync %s: %s\n", r->out, strerror(errno));
        rc = CPL_EXIT_ERROR;
    }
    if (r->error[0])
        fprintf(stderr, "coldprep sweep: %s\n", r->error);
    int64_t written = r->next_write - first - resumed;
    fprintf(stderr, "coldprep sweep: %" PRId64 " of %" PRId64 " points in %s (%" PRId64
            " new, %" PRId64 " resumed) in %.2f s, %.1f points/s, %ld job%s\n",
            r->next_write - first, r->last - first + 1, r->out, written - recovered,
            resumed + recovered, r->elapsed,
            r->elapsed > 0 ? (double)(written - recovered) / r->elapsed : 0.0, r->jobs_used,
            r->jobs_used == 1 ? "" : "s");
    int finished = r->next_write > r->last && rc == CPL_EXIT_OK;
    close_output(r);
    if (finished) {
        cpl_sweep_marker m = {.points = r->count, .shard = shard, .shards = shards,
                              .first = first, .last = r->last};
        snprintf(m.format, sizeof m.format, "%s", r->format);
        unlink(r->journal);
        if (cpl_marker_write(r->out, &m, err, sizeof err) != 0) {
            fprintf(stderr, "coldprep sweep: %s\n", err);
            rc = CPL_EXIT_ERROR;
        }
    } else if (got_signal) {
        fprintf(stderr, "coldprep sweep: stopped by signal %d; continue with --resume\n",
                (int)got_signal);
        rc = 128 + got_signal;
    }
    return rc;
}

static int run_sweep(cpl_sweep_run *r, const sweep_options *o, int64_t shard, int64_t shards)
{
    /* PATH.lock keeps two writers (another coldprep sweep, a cp.sweep{out = PATH} in a
     * script) off one file: their rows would interleave, or one would truncate the other's */
    char lock[4200], err[8400];
    int lfd = cpl_lock_take(r->out, lock, sizeof lock, err, sizeof err);
    if (lfd < 0) {
        fprintf(stderr, "coldprep sweep: %s\n", err);
        return CPL_EXIT_ERROR;
    }
    int rc = run_sweep_locked(r, o, shard, shards);
    cpl_lock_release(lfd, lock);
    return rc;
}

int cpl_sweep_main(int argc, char **argv)
{
    sweep_options o = {.jobs = sysconf(_SC_NPROCESSORS_ONLN), .shard = 1, .shards = 1};
    cpl_sandbox_defaults(&o.sandbox);
    if (o.jobs < 1)
        o.jobs = 1;
    if (o.jobs > MAX_JOBS)
        o.jobs = MAX_JOBS;
    int prc = parse_options(argc, argv, &o);
    if (prc != 0)
        return prc > 0 ? prc : CPL_EXIT_OK;
    int have_shard = 0;
    for (int i = 1; i < argc; i++)
        have_shard |= strcmp(argv[i], "--shard") == 0;
    if (!have_shard) {
        char err[256];
        if (shard_from_env(&o.shard, &o.shards, err, sizeof err) < 0)
            return usage(err, NULL);
    }

    /* in the sandbox the file may read its own directory only, and write nothing: the
     * runner writes the output */
    char dir[4096];
    cpl_sandbox_dir(o.file, dir, sizeof dir);
    o.sandbox.dir = dir;
    lua_State *L = cpl_new_state_for(&o.sandbox);
    if (L == NULL)
        return CPL_EXIT_ERROR;
    if (o.sandbox.on)
        cpl_sandbox_arm(L);
    int loaded = cpl_sweep_load(L, o.file, o.out, NULL);
    if (o.sandbox.on)
        cpl_sandbox_disarm(L);
    if (loaded != 0) {
        cpl_report(L, "coldprep sweep");
        lua_close(L);
        return CPL_EXIT_ERROR;
    }
    lua_getfield(L, -1, "shape");
    lua_getfield(L, -2, "count");
    lua_getfield(L, -3, "header");
    lua_getfield(L, -4, "format");
    lua_getfield(L, -5, "out");
    char out[4096], journal[4200];
    if (o.shards > 1)
        shard_path(lua_tostring(L, -1), o.shard, o.shards, out, sizeof out);
    else
        snprintf(out, sizeof out, "%s", lua_tostring(L, -1));
    snprintf(journal, sizeof journal, "%s.pending", out);
    if (cpl_same_file(o.file, out)) {
        fprintf(stderr, "coldprep sweep: the output %s is the sweep file itself; give another "
                "--out\n", out);
        lua_close(L);
        return CPL_EXIT_USAGE;
    }
    cpl_sweep_run r = {.file = o.file, .out = out, .journal = journal,
                       .count = lua_tointeger(L, -4), .header = lua_tostring(L, -3),
                       .format = lua_tostring(L, -2), .shape = lua_tostring(L, -5),
                       .sandbox = &o.sandbox, .fd = -1, .jfd = -1};
    int rc = run_sweep(&r, &o, o.shard, o.shards);
    lua_close(L);
    return rc;
}
