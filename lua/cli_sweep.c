/*
 * `coldprep sweep FILE.lua [--jobs N] [--out PATH] [--resume] [--force] [--shard K/N]`:
 * runs the sweep a file describes on N worker threads, each with its own Lua state that
 * loads the file itself (cp.sweep.load).  Workers claim point numbers in increasing order
 * and hand the finished row texts to the main thread through a bounded reorder window;
 * the main thread appends them to the file strictly in point order with one write(2) per
 * batch of whole rows, so the file is the same whatever N and holds only finished rows at
 * every moment.  SIGINT/SIGTERM stop the claiming of new points; the points in progress
 * finish and are written.  After SIGKILL the rows in the window are lost but every row in
 * the file stays valid; --resume drops a torn last row and continues after the last one.
 */
#include <errno.h>
#include <fcntl.h>
#include <inttypes.h>
#include <lauxlib.h>
#include <pthread.h>
#include <signal.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "cli.h"
#include "cli_sweep.h"

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
    "               _FIRST/_LAST/_STEPSIZE give the slice when set\n"
    "Join slices with `coldprep merge OUT SLICES...`.  See docs/cli-sweep.md.\n";

enum { WINDOW_PER_JOB = 64, MAX_JOBS = 1024 };

/* Everything the workers and the writer share; guarded by mu. */
typedef struct sweep_run {
    const char *file, *out, *format, *header;
    int64_t count, next_claim, next_write, last;
    size_t window;
    char **slot; /* row text of point i at slot[i % window], NULL until finished */
    size_t *slot_len;
    int stop, workers_alive;
    char error[1024]; /* the first worker error; "" if none */
    pthread_mutex_t mu;
    pthread_cond_t row_ready, space_free;
} sweep_run;

static volatile sig_atomic_t got_signal = 0;

static void on_stop_signal(int sig)
{
    got_signal = sig;
    signal(sig, SIG_DFL); /* a second one ends the process at once */
}

static double now_seconds(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static void fail(sweep_run *r, const char *msg)
{
    pthread_mutex_lock(&r->mu);
    if (r->error[0] == '\0')
        snprintf(r->error, sizeof r->error, "%s", msg);
    r->stop = 1;
    pthread_cond_broadcast(&r->space_free);
    pthread_cond_broadcast(&r->row_ready);
    pthread_mutex_unlock(&r->mu);
}

/* Load the sweep file in L and leave its compiled sweep on the stack; 0 or -1 with the
 * error message on the stack. */
static int load_sweep(lua_State *L, const char *file, const char *out, const char *format)
{
    lua_createtable(L, 0, 1);
    lua_pushstring(L, file);
    lua_rawseti(L, -2, 0);
    lua_setglobal(L, "arg");
    lua_getglobal(L, "cp");
    lua_getfield(L, -1, "sweep");
    lua_getfield(L, -1, "load");
    lua_remove(L, -2);
    lua_remove(L, -2);
    lua_createtable(L, 0, 3);
    lua_pushstring(L, file);
    lua_setfield(L, -2, "file");
    if (out) {
        lua_pushstring(L, out);
        lua_setfield(L, -2, "out");
    }
    if (format) {
        lua_pushstring(L, format);
        lua_setfield(L, -2, "format");
    }
    return lua_pcall(L, 1, 1, 0) == LUA_OK ? 0 : -1;
}

/* One worker: its own Lua state, then claim, compute and hand over rows until done. */
static void *worker(void *arg)
{
    sweep_run *r = arg;
    char msg[1024];
    lua_State *L = cpl_new_state();
    if (L == NULL) {
        fail(r, "a worker could not create its Lua state");
        goto out;
    }
    if (load_sweep(L, r->file, r->out, r->format) != 0) {
        snprintf(msg, sizeof msg, "%s", lua_tostring(L, -1));
        fail(r, msg);
        goto out;
    }
    lua_getfield(L, -1, "count");
    lua_getfield(L, -2, "header");
    const char *header = lua_tostring(L, -1);
    if (lua_tointeger(L, -2) != r->count || header == NULL || strcmp(header, r->header) != 0) {
        fail(r, "the sweep file describes another sweep each time it runs (its description "
                "must not depend on time, random numbers or the environment)");
        goto out;
    }
    lua_pop(L, 2);
    lua_getfield(L, -1, "row");
    int row_fn = lua_gettop(L);

    for (;;) {
        pthread_mutex_lock(&r->mu);
        while (!r->stop && r->next_claim <= r->last
               && r->next_claim >= r->next_write + (int64_t)r->window)
            pthread_cond_wait(&r->space_free, &r->mu);
        if (r->stop || r->next_claim > r->last) {
            pthread_mutex_unlock(&r->mu);
            break;
        }
        int64_t i = r->next_claim++;
        pthread_mutex_unlock(&r->mu);

        lua_pushvalue(L, row_fn);
        lua_pushinteger(L, i);
        if (lua_pcall(L, 1, 1, 0) != LUA_OK) {
            snprintf(msg, sizeof msg, "point %" PRId64 ": %s", i,
                     lua_tostring(L, -1) ? lua_tostring(L, -1) : "(error object)");
            fail(r, msg);
            break;
        }
        size_t len;
        const char *text = lua_tolstring(L, -1, &len);
        char *copy = text ? malloc(len) : NULL;
        if (copy == NULL) {
            fail(r, "out of memory");
            break;
        }
        memcpy(copy, text, len);
        lua_pop(L, 1);
        pthread_mutex_lock(&r->mu);
        r->slot[i % (int64_t)r->window] = copy;
        r->slot_len[i % (int64_t)r->window] = len;
        if (i == r->next_write)
            pthread_cond_signal(&r->row_ready);
        pthread_mutex_unlock(&r->mu);
    }
out:
    if (L)
        lua_close(L);
    pthread_mutex_lock(&r->mu);
    r->workers_alive--;
    pthread_cond_signal(&r->row_ready);
    pthread_mutex_unlock(&r->mu);
    return NULL;
}

static int write_all(int fd, const char *buf, size_t len)
{
    while (len > 0) {
        ssize_t n = write(fd, buf, len);
        if (n < 0 && errno == EINTR)
            continue;
        if (n < 0)
            return -1;
        buf += n;
        len -= (size_t)n;
    }
    return 0;
}

static void format_duration(double s, char *buf, size_t n)
{
    if (!(s >= 0) || s > 1e7) {
        snprintf(buf, n, "--:--");
        return;
    }
    long t = (long)(s + 0.5);
    if (t >= 3600)
        snprintf(buf, n, "%ld:%02ld:%02ld", t / 3600, t / 60 % 60, t % 60);
    else
        snprintf(buf, n, "%ld:%02ld", t / 60, t % 60);
}

static void show_progress(int64_t done, int64_t total, double elapsed)
{
    enum { WIDTH = 30 };
    double frac = total > 0 ? (double)done / (double)total : 1.0;
    int filled = (int)(frac * WIDTH);
    char bar[WIDTH + 1], eta[32];
    for (int i = 0; i < WIDTH; i++)
        bar[i] = i < filled ? '#' : '-';
    bar[WIDTH] = '\0';
    double rate = elapsed > 0 ? (double)done / elapsed : 0;
    format_duration(rate > 0 ? (double)(total - done) / rate : -1, eta, sizeof eta);
    fprintf(stderr, "\r[%s] %5.1f%% %" PRId64 "/%" PRId64 " %.1f points/s ETA %s\033[K", bar,
            100 * frac, done, total, rate, eta);
    fflush(stderr);
}

/* The writer loop of the main thread: append finished rows in point order until every
 * point is written or the workers have stopped.  Returns 0, or -1 after a write error. */
static int write_rows(sweep_run *r, int fd, int tty)
{
    int64_t start = r->next_write, total = r->last - r->next_write + 1;
    double t0 = now_seconds(), last_draw = 0;
    char *batch = NULL;
    size_t cap = 0;
    int rc = 0;
    pthread_mutex_lock(&r->mu);
    for (;;) {
        if (got_signal && !r->stop) {
            r->stop = 1;
            pthread_cond_broadcast(&r->space_free);
        }
        size_t len = 0;
        int64_t first = r->next_write;
        while (r->next_write <= r->last && r->slot[r->next_write % (int64_t)r->window]) {
            size_t k = (size_t)(r->next_write % (int64_t)r->window);
            if (len + r->slot_len[k] > cap) {
                size_t ncap = 2 * (len + r->slot_len[k]) + 4096;
                char *nb = realloc(batch, ncap);
                if (nb == NULL) {
                    r->stop = 1; /* write what is batched, then stop */
                    if (r->error[0] == '\0')
                        snprintf(r->error, sizeof r->error, "out of memory");
                    pthread_cond_broadcast(&r->space_free);
                    break;
                }
                batch = nb;
                cap = ncap;
            }
            memcpy(batch + len, r->slot[k], r->slot_len[k]);
            len += r->slot_len[k];
            free(r->slot[k]);
            r->slot[k] = NULL;
            r->next_write++;
        }
        if (r->next_write > first) {
            pthread_cond_broadcast(&r->space_free);
            pthread_mutex_unlock(&r->mu);
            if (write_all(fd, batch, len) != 0) {
                char msg[512];
                snprintf(msg, sizeof msg, "cannot write %s: %s", r->out, strerror(errno));
                fail(r, msg);
                rc = -1;
            }
            pthread_mutex_lock(&r->mu);
            if (rc)
                break;
        }
        if (r->next_write > r->last || (r->stop && r->error[0]))
            break;
        int next_ready = r->slot[r->next_write % (int64_t)r->window] != NULL;
        if (r->workers_alive == 0 && !next_ready)
            break;
        if (!next_ready) {
            struct timespec until;
            clock_gettime(CLOCK_REALTIME, &until);
            until.tv_nsec += 200 * 1000 * 1000;
            if (until.tv_nsec >= 1000000000L) {
                until.tv_sec++;
                until.tv_nsec -= 1000000000L;
            }
            pthread_cond_timedwait(&r->row_ready, &r->mu, &until);
        }
        double t = now_seconds();
        if (tty && t - last_draw > 0.2) {
            show_progress(r->next_write - start, total, t - t0);
            last_draw = t;
        }
    }
    pthread_mutex_unlock(&r->mu);
    if (tty) {
        show_progress(r->next_write - start, total, now_seconds() - t0);
        fputc('\n', stderr);
    }
    free(batch);
    return rc;
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

static int env_int(const char *name, long long *v)
{
    const char *s = getenv(name);
    char *end;
    if (s == NULL || *s == '\0')
        return 0;
    *v = strtoll(s, &end, 10);
    return *end == '\0' ? 1 : -1;
}

static int shard_from_env(int64_t *k, int64_t *n, char *err, size_t errlen)
{
    long long id, count, lo = 0, hi, step = 1;
    int have = env_int("SLURM_ARRAY_TASK_ID", &id);
    if (have > 0) {
        /* SLURM numbers tasks as the user's --array range says: offset by its minimum. */
        if (env_int("SLURM_ARRAY_TASK_COUNT", &count) <= 0
            || env_int("SLURM_ARRAY_TASK_MIN", &lo) <= 0) {
            snprintf(err, errlen, "SLURM_ARRAY_TASK_ID is set but SLURM_ARRAY_TASK_COUNT or "
                     "SLURM_ARRAY_TASK_MIN is not; give --shard K/N");
            return -1;
        }
        if (env_int("SLURM_ARRAY_TASK_STEP", &step) <= 0)
            step = 1;
        *k = (id - lo) / step + 1;
        *n = count;
    } else if ((have = env_int("SGE_TASK_ID", &id)) > 0) {
        if (env_int("SGE_TASK_FIRST", &lo) <= 0 || env_int("SGE_TASK_LAST", &hi) <= 0) {
            snprintf(err, errlen, "SGE_TASK_ID is set but SGE_TASK_FIRST/SGE_TASK_LAST are not");
            return -1;
        }
        if (env_int("SGE_TASK_STEPSIZE", &step) <= 0 || step < 1)
            step = 1;
        *k = (id - lo) / step + 1;
        *n = (hi - lo) / step + 1;
    } else {
        return have < 0 ? -1 : 0;
    }
    if (*n < 1 || *k < 1 || *k > *n) {
        snprintf(err, errlen, "the scheduler's array variables give slice %" PRId64 " of %" PRId64
                 ", which is not a valid slice", *k, *n);
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
} sweep_options;

static int parse_options(int argc, char **argv, sweep_options *o)
{
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i];
        if (strcmp(a, "-h") == 0 || strcmp(a, "--help") == 0) {
            fputs(SWEEP_USAGE, stdout);
            return -1;
        } else if (strcmp(a, "--jobs") == 0 || strcmp(a, "-j") == 0) {
            char *end;
            if (++i >= argc)
                return usage("--jobs needs a number", NULL);
            o->jobs = strtol(argv[i], &end, 10);
            if (*end != '\0' || end == argv[i] || o->jobs < 1 || o->jobs > MAX_JOBS)
                return usage("--jobs must be a whole number from 1 to 1024, got", argv[i]);
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
                return usage("--shard needs K/N with 1 <= K <= N, got",
                             i < argc ? argv[i] : "nothing");
        } else if (a[0] == '-' && a[1] != '\0') {
            return usage("unknown option", a);
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

/* Open the output for appending after its finished rows (--resume) or afresh; sets
 * r->next_write.  Returns the descriptor, or -1 after printing why. */
static int open_output(sweep_run *r, const sweep_options *o, int64_t first, int *complete)
{
    char err[1024], done[4096];
    struct stat st;
    int exists = stat(r->out, &st) == 0;
    cpl_marker_path(r->out, done, sizeof done);
    r->next_write = first;
    *complete = 0;
    if (exists && o->resume) {
        int64_t next;
        off_t good_end, torn;
        if (cpl_sweep_scan(r->out, r->format, r->header, first, &next, &good_end, &torn, err,
                           sizeof err) != 0) {
            fprintf(stderr, "coldprep sweep: cannot resume: %s\n", err);
            return -1;
        }
        if (next > r->last + 1) {
            fprintf(stderr, "coldprep sweep: cannot resume: %s has more rows than this slice\n",
                    r->out);
            return -1;
        }
        int fd = open(r->out, O_WRONLY | O_APPEND);
        if (fd < 0 || ftruncate(fd, good_end) != 0) {
            fprintf(stderr, "coldprep sweep: cannot resume %s: %s\n", r->out, strerror(errno));
            if (fd >= 0)
                close(fd);
            return -1;
        }
        if (torn > 0)
            fprintf(stderr, "coldprep sweep: dropped an incomplete last row (%jd bytes) of %s\n",
                    (intmax_t)torn, r->out);
        if (good_end == 0 && write_all(fd, r->header, strlen(r->header)) != 0) {
            fprintf(stderr, "coldprep sweep: cannot write %s: %s\n", r->out, strerror(errno));
            close(fd);
            return -1;
        }
        r->next_write = next;
        *complete = next > r->last && stat(done, &st) == 0;
        return fd;
    }
    if (exists && !o->force && st.st_size > 0) {
        fprintf(stderr, "coldprep sweep: %s exists; add --resume to continue it or --force to "
                "overwrite it\n", r->out);
        return -1;
    }
    int fd = open(r->out, O_WRONLY | O_CREAT | O_TRUNC | O_APPEND, 0644);
    if (fd < 0 || write_all(fd, r->header, strlen(r->header)) != 0) {
        fprintf(stderr, "coldprep sweep: cannot write %s: %s\n", r->out, strerror(errno));
        if (fd >= 0)
            close(fd);
        return -1;
    }
    return fd;
}

/* Start the workers with every signal blocked (the main thread takes SIGINT/SIGTERM). */
static long start_workers(sweep_run *r, pthread_t *threads, long jobs)
{
    sigset_t all, old;
    sigfillset(&all);
    pthread_sigmask(SIG_BLOCK, &all, &old);
    long started = 0;
    for (; started < jobs; started++) {
        pthread_mutex_lock(&r->mu);
        r->workers_alive++;
        pthread_mutex_unlock(&r->mu);
        if (pthread_create(&threads[started], NULL, worker, r) != 0) {
            pthread_mutex_lock(&r->mu);
            r->workers_alive--;
            pthread_mutex_unlock(&r->mu);
            break;
        }
    }
    pthread_sigmask(SIG_SETMASK, &old, NULL);
    return started;
}

static int run_sweep(sweep_run *r, const sweep_options *o, int64_t count, int64_t shard,
                     int64_t shards)
{
    int64_t first;
    cpl_shard_range(count, shard, shards, &first, &r->last);
    int complete;
    int fd = open_output(r, o, first, &complete);
    if (fd < 0)
        return CPL_EXIT_ERROR;
    char done[4096], err[1024];
    cpl_marker_path(r->out, done, sizeof done);
    if (complete) {
        fprintf(stderr, "coldprep sweep: %s is already complete (%" PRId64 " points)\n", r->out,
                r->last - first + 1);
        close(fd);
        return CPL_EXIT_OK;
    }
    remove(done);

    int64_t todo = r->last - r->next_write + 1, resumed = r->next_write - first;
    long jobs = o->jobs;
    if (jobs > todo)
        jobs = todo > 0 ? (long)todo : 1;
    r->window = (size_t)jobs * WINDOW_PER_JOB;
    r->slot = calloc(r->window, sizeof *r->slot);
    r->slot_len = calloc(r->window, sizeof *r->slot_len);
    pthread_t *threads = calloc((size_t)jobs, sizeof *threads);
    if (r->slot == NULL || r->slot_len == NULL || threads == NULL) {
        fprintf(stderr, "coldprep sweep: out of memory\n");
        free(r->slot);
        free(r->slot_len);
        free(threads);
        close(fd);
        return CPL_EXIT_ERROR;
    }
    r->next_claim = r->next_write;
    struct sigaction sa, old_int, old_term;
    memset(&sa, 0, sizeof sa);
    sa.sa_handler = on_stop_signal;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, &old_int);
    sigaction(SIGTERM, &sa, &old_term);

    double t0 = now_seconds();
    long started = todo > 0 ? start_workers(r, threads, jobs) : 0;
    if (todo > 0 && started == 0)
        fail(r, "cannot start a worker thread");
    int wrc = write_rows(r, fd, isatty(2));
    for (long i = 0; i < started; i++)
        pthread_join(threads[i], NULL);
    double elapsed = now_seconds() - t0;
    sigaction(SIGINT, &old_int, NULL);
    sigaction(SIGTERM, &old_term, NULL);
    for (size_t k = 0; k < r->window; k++)
        free(r->slot[k]);
    free(r->slot);
    free(r->slot_len);
    free(threads);

    int rc = CPL_EXIT_OK;
    int64_t written = r->next_write - first - resumed;
    if (fsync(fd) != 0 && errno != EINVAL && wrc == 0) {
        fprintf(stderr, "coldprep sweep: cannot sync %s: %s\n", r->out, strerror(errno));
        rc = CPL_EXIT_ERROR;
    }
    close(fd);
    if (r->error[0]) {
        fprintf(stderr, "coldprep sweep: %s\n", r->error);
        rc = CPL_EXIT_ERROR;
    }
    fprintf(stderr, "coldprep sweep: %" PRId64 " of %" PRId64 " points in %s (%" PRId64
            " new, %" PRId64 " resumed) in %.2f s, %.1f points/s, %ld job%s\n",
            r->next_write - first, r->last - first + 1, r->out, written, resumed, elapsed,
            elapsed > 0 ? (double)written / elapsed : 0.0, jobs, jobs == 1 ? "" : "s");
    if (r->next_write > r->last && rc == CPL_EXIT_OK) {
        cpl_sweep_marker m = {.points = count, .shard = shard, .shards = shards,
                              .first = first, .last = r->last};
        snprintf(m.format, sizeof m.format, "%s", r->format);
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

int cpl_sweep_main(int argc, char **argv)
{
    sweep_options o = {.jobs = sysconf(_SC_NPROCESSORS_ONLN), .shard = 1, .shards = 1};
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
        int env = shard_from_env(&o.shard, &o.shards, err, sizeof err);
        if (env < 0)
            return usage(err[0] ? err : "a scheduler array variable is not a number", NULL);
    }

    lua_State *L = cpl_new_state();
    if (L == NULL)
        return CPL_EXIT_ERROR;
    if (load_sweep(L, o.file, o.out, NULL) != 0) {
        cpl_report(L, "coldprep sweep");
        lua_close(L);
        return CPL_EXIT_ERROR;
    }
    lua_getfield(L, -1, "count");
    lua_getfield(L, -2, "header");
    lua_getfield(L, -3, "format");
    lua_getfield(L, -4, "out");
    sweep_run r = {.file = o.file, .count = lua_tointeger(L, -4), .header = lua_tostring(L, -3),
                   .format = lua_tostring(L, -2)};
    char out[4096];
    if (o.shards > 1)
        shard_path(lua_tostring(L, -1), o.shard, o.shards, out, sizeof out);
    else
        snprintf(out, sizeof out, "%s", lua_tostring(L, -1));
    r.out = out;
    pthread_mutex_init(&r.mu, NULL);
    pthread_cond_init(&r.row_ready, NULL);
    pthread_cond_init(&r.space_free, NULL);
    int rc = run_sweep(&r, &o, r.count, o.shard, o.shards);
    pthread_cond_destroy(&r.row_ready);
    pthread_cond_destroy(&r.space_free);
    pthread_mutex_destroy(&r.mu);
    lua_close(L);
    return rc;
}
