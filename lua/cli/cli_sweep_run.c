/*
 * The parallel engine of `coldprep sweep`: N worker threads, each with its own Lua state
 * that loads the sweep file itself (cp.sweep.load), compute rows and deposit them; the
 * file receives them strictly in point order.  Workers claim points in increasing order
 * and never more than `window` points ahead of the first row not yet in the file, so
 * memory stays bounded.
 *
 * Durability: a row is written when it is deposited, either to the output file (when it
 * is the next one, followed by every consecutive row waiting) or, when an earlier point is
 * still being computed, to the journal PATH.pending.  A finished row is therefore on disk
 * whatever kills the process; --resume reads the journal back.  Every write holds whole
 * rows; the journal is emptied whenever no row waits, compacted when it grows, and removed
 * when the sweep is complete.  All file writes happen under the run's mutex.
 *
 * Stopping: the signal the main thread takes (Ctrl-C, SIGTERM) is every worker's cancel
 * flag, registered in its Lua state as the flag the long C computations poll, and checked
 * by a count hook every 1000 Lua instructions of a point (raised again at every instruction
 * so that a pcall in the sweep file cannot swallow it).  No point that ends after the
 * signal is written (its row may hold a caught "interrupted" as its error); --resume
 * computes it.
 */
#include <errno.h>
#include <fcntl.h>
#include <inttypes.h>
#include <stdint.h>
#include <lauxlib.h>
#include <lualib.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "args.h"
#include "cli.h"
#include "cli_sweep.h"
#include "fileio.h"

enum { JOURNAL_COMPACT_FACTOR = 8 };

static double now_seconds(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

int cpl_write_all(int fd, const char *buf, size_t len)
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

/* Record the first error and stop everything; called with the lock held. */
static void fail_locked(cpl_sweep_run *r, const char *msg)
{
    if (r->error[0] == '\0')
        snprintf(r->error, sizeof r->error, "%.1000s", msg);
    r->stop = 1;
    pthread_cond_broadcast(&r->space_free);
    pthread_cond_broadcast(&r->progress);
}

static void fail(cpl_sweep_run *r, const char *msg)
{
    pthread_mutex_lock(&r->mu);
    fail_locked(r, msg);
    pthread_mutex_unlock(&r->mu);
}

static void write_failed(cpl_sweep_run *r, const char *path)
{
    char msg[1200];
    snprintf(msg, sizeof msg, "cannot write %s: %s", path, strerror(errno));
    fail_locked(r, msg);
}

/* Append bytes to the batch buffer; 0 or -1 (out of memory). */
static int batch_add(cpl_sweep_run *r, const char *text, size_t len)
{
    if (r->batch_len + len > r->batch_cap) {
        size_t cap = 2 * (r->batch_len + len) + 4096;
        char *b = realloc(r->batch, cap);
        if (b == NULL)
            return -1;
        r->batch = b;
        r->batch_cap = cap;
    }
    memcpy(r->batch + r->batch_len, text, len);
    r->batch_len += len;
    return 0;
}

/* Write every consecutive finished row from next_write on (from the window or from the
 * rows recovered from an earlier run's journal), a window's worth per write.  A row
 * leaves memory only once its write succeeded; after a failed write (disk full) nothing
 * more is appended, so the file never gets a gap that --resume would refuse. */
static void drain(cpl_sweep_run *r)
{
    while (!r->out_broken && r->next_write <= r->last) {
        /* collect at most `window` rows: beyond that a slot would be read twice */
        int64_t p = r->next_write;
        size_t rec = r->rec_write;
        r->batch_len = 0;
        while (p <= r->last && p - r->next_write < (int64_t)r->window) {
            size_t k = (size_t)(p % (int64_t)r->window);
            cpl_row *rr = rec < r->nrecovered ? &r->recovered[rec] : NULL;
            if (r->slot[k].text) {
                if (batch_add(r, r->slot[k].text, r->slot[k].len) != 0)
                    break;
            } else if (rr && rr->point == p) {
                if (batch_add(r, rr->text, rr->len) != 0)
                    break;
                rec++;
            } else {
                break;
            }
            p++;
        }
        if (p == r->next_write)
            break;
        if (cpl_write_all(r->fd, r->batch, r->batch_len) != 0) {
            r->out_broken = 1;
            write_failed(r, r->out);
            break;
        }
        for (; r->next_write < p; r->next_write++) {
            size_t k = (size_t)(r->next_write % (int64_t)r->window);
            if (r->slot[k].text) {
                free(r->slot[k].text);
                r->slot[k].text = NULL;
                r->waiting--;
            } else {
                free(r->recovered[r->rec_write].text);
                r->recovered[r->rec_write++].text = NULL;
            }
        }
    }
    if (r->next_write > r->last)
        pthread_cond_broadcast(&r->progress);
    pthread_cond_broadcast(&r->space_free);
}

/* Rewrite the journal with exactly the rows still waiting (temporary file + rename). */
static int journal_rewrite(cpl_sweep_run *r)
{
    char tmp[4200];
    snprintf(tmp, sizeof tmp, "%s.tmp", r->journal);
    int fd = cpl_create_temp(tmp);
    if (fd < 0)
        return -1;
    int bad = 0;
    for (size_t k = 0; k < r->window && !bad; k++)
        if (r->slot[k].text)
            bad = cpl_write_all(fd, r->slot[k].text, r->slot[k].len) != 0;
    for (size_t i = r->rec_write; i < r->nrecovered && !bad; i++)
        bad = cpl_write_all(fd, r->recovered[i].text, r->recovered[i].len) != 0;
    if (bad || rename(tmp, r->journal) != 0) {
        close(fd);
        unlink(tmp);
        return -1;
    }
    close(r->jfd);
    r->jfd = fd;
    r->journal_rows = (long)r->waiting + (long)(r->nrecovered - r->rec_write);
    return 0;
}

/* After a drain: empty the journal when nothing waits, compact it when it has grown. */
static void journal_tidy(cpl_sweep_run *r)
{
    if (r->journal_rows == 0 || r->out_broken || r->journal_broken)
        return;
    if (r->waiting == 0 && r->rec_write == r->nrecovered) {
        if (ftruncate(r->jfd, 0) != 0)
            write_failed(r, r->journal);
        r->journal_rows = 0;
    } else if (r->journal_rows > JOURNAL_COMPACT_FACTOR * (long)r->window) {
        if (journal_rewrite(r) != 0)
            write_failed(r, r->journal);
    }
}

/* Hand over the finished row of point i (text owned by the run from now on). */
static void deposit(cpl_sweep_run *r, int64_t i, char *text, size_t len)
{
    pthread_mutex_lock(&r->mu);
    size_t k = (size_t)(i % (int64_t)r->window);
    r->slot[k].text = text;
    r->slot[k].len = len;
    r->waiting++;
    if (i != r->next_write || r->out_broken) {
        /* an earlier point is still running (or the file takes no more rows): keep this
         * row on disk meanwhile */
        if (!r->journal_broken) {
            if (cpl_write_all(r->jfd, text, len) != 0) {
                r->journal_broken = 1; /* a later row would join the torn one */
                write_failed(r, r->journal);
            }
            r->journal_rows++;
        }
    } else {
        drain(r);
        journal_tidy(r);
    }
    pthread_mutex_unlock(&r->mu);
}

/* The next point to compute, or -1 when there is none (done or stopping). */
static int64_t claim(cpl_sweep_run *r)
{
    int64_t i = -1;
    pthread_mutex_lock(&r->mu);
    for (;;) {
        /* points recovered from the journal are already computed */
        while (r->rec_claim < r->nrecovered && r->recovered[r->rec_claim].point < r->next_claim)
            r->rec_claim++;
        while (r->rec_claim < r->nrecovered && r->recovered[r->rec_claim].point == r->next_claim) {
            r->next_claim++;
            r->rec_claim++;
        }
        if (r->stop || r->next_claim > r->last)
            break;
        if (r->next_claim < r->next_write + (int64_t)r->window) {
            i = r->next_claim++;
            break;
        }
        pthread_cond_wait(&r->space_free, &r->mu);
    }
    pthread_mutex_unlock(&r->mu);
    return i;
}

int cpl_sweep_load(lua_State *L, const char *file, const char *out, const char *format)
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

int luaopen_coldprep(lua_State *L);

static int open_worker_libraries(lua_State *L)
{
    luaL_openlibs(L);
    luaL_requiref(L, "coldprep", luaopen_coldprep, 0);
    lua_pushvalue(L, -1);
    lua_setglobal(L, "coldprep");
    lua_setglobal(L, "cp");
    return 0;
}

/* A worker's Lua state: the standard libraries and `cp`, as in scripts, but not built by
 * cpl_new_state, whose Ctrl-C machinery keeps process-wide records meant for the one
 * interactive thread (workers never see signals: the main thread takes them).  In the
 * sandbox (sb->on) the state has the caps of sb, which must outlive it. */
static lua_State *worker_state(cpl_sandbox *sb)
{
    lua_State *L = sb->on ? cpl_sandbox_newstate(sb) : luaL_newstate();
    if (L == NULL)
        return NULL;
    lua_pushcfunction(L, open_worker_libraries);
    if (lua_pcall(L, 0, 0, 0) != LUA_OK || (sb->on && cpl_sandbox_enter(L, sb) != 0)) {
        lua_close(L);
        return NULL;
    }
    return L;
}

/* Raises "interrupted" in a point once the run's stop signal has come, and again at every
 * following instruction (the sandbox's deadline hook checks the flag the same way). */
static void cancel_hook(lua_State *L, lua_Debug *ar)
{
    (void)ar;
    const cp_cancel_flag *flag = cpl_cancel_flag(L);
    if (flag && *flag) {
        lua_sethook(L, cancel_hook, LUA_MASKCOUNT | LUA_MASKLINE, 1);
        luaL_error(L, "interrupted");
    }
}

/* One worker: its own Lua state, then claim, compute and deposit rows until done. */
static void *worker(void *arg)
{
    cpl_sweep_run *r = arg;
    char msg[1024];
    cpl_sandbox sb = {0};
    if (r->sandbox != NULL)
        sb = *r->sandbox;
    lua_State *L = worker_state(&sb);
    if (L == NULL) {
        fail(r, "a worker could not create its Lua state (out of memory?)");
        goto out;
    }
    lua_pushlightuserdata(L, (void *)(uintptr_t)r->cancel); /* the C computations poll it */
    lua_setfield(L, LUA_REGISTRYINDEX, CPL_CANCEL_KEY);
    if (sb.on)
        cpl_sandbox_arm(L);
    int loaded = cpl_sweep_load(L, r->file, r->out, r->format);
    if (sb.on)
        cpl_sandbox_disarm(L);
    if (loaded != 0) {
        const char *why = lua_tostring(L, -1);
        snprintf(msg, sizeof msg, "%s", why ? why : "the sweep file raised a non-string error");
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

    int64_t i;
    while ((i = claim(r)) >= 0) {
        lua_pushvalue(L, row_fn);
        lua_pushinteger(L, i);
        if (sb.on)
            cpl_sandbox_arm(L); /* the time cap is per point; its hook checks the flag too */
        else
            lua_sethook(L, cancel_hook, LUA_MASKCOUNT, 1000);
        int status = lua_pcall(L, 1, 1, 0);
        if (sb.on)
            cpl_sandbox_disarm(L);
        else
            lua_sethook(L, NULL, 0, 0);
        /* stopped by the signal: not written (the sweep file may have caught a C
         * computation's "interrupted" as the point's error), --resume computes it */
        if (r->cancel && *r->cancel)
            break;
        if (status != LUA_OK) {
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
        deposit(r, i, copy, len);
    }
out:
    if (L)
        lua_close(L);
    pthread_mutex_lock(&r->mu);
    r->workers_alive--;
    pthread_cond_broadcast(&r->progress);
    pthread_mutex_unlock(&r->mu);
    return NULL;
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

/* Start the workers with every signal blocked (the main thread takes SIGINT/SIGTERM). */
static long start_workers(cpl_sweep_run *r, pthread_t *threads, long jobs)
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

int cpl_sweep_execute(cpl_sweep_run *r, long jobs, volatile sig_atomic_t *stop_signal, int tty)
{
    int64_t todo = r->last - r->next_write + 1, start = r->next_write;
    if (jobs > todo)
        jobs = todo > 0 ? (long)todo : 1;
    r->window = (size_t)jobs * CPL_SWEEP_WINDOW_PER_JOB;
    r->slot = calloc(r->window, sizeof *r->slot);
    pthread_t *threads = calloc((size_t)jobs, sizeof *threads);
    if (r->slot == NULL || threads == NULL) {
        snprintf(r->error, sizeof r->error, "out of memory");
        free(r->slot);
        free(threads);
        r->slot = NULL;
        return -1;
    }
    r->jobs_used = jobs;
    pthread_mutex_init(&r->mu, NULL);
    pthread_cond_init(&r->space_free, NULL);
    pthread_cond_init(&r->progress, NULL);
    r->next_claim = r->next_write;
    r->cancel = stop_signal;

    pthread_mutex_lock(&r->mu);
    drain(r); /* rows recovered from the journal that continue the file */
    journal_tidy(r);
    pthread_mutex_unlock(&r->mu);

    double t0 = now_seconds(), last_draw = 0;
    long started = (todo > 0 && !r->stop) ? start_workers(r, threads, jobs) : 0;
    if (todo > 0 && started == 0 && !r->stop)
        fail(r, "cannot start a worker thread");

    pthread_mutex_lock(&r->mu);
    while (r->next_write <= r->last && r->workers_alive > 0) {
        if (*stop_signal && !r->stop) {
            r->stop = 1;
            pthread_cond_broadcast(&r->space_free);
        }
        struct timespec until;
        clock_gettime(CLOCK_REALTIME, &until);
        until.tv_nsec += 200 * 1000 * 1000;
        if (until.tv_nsec >= 1000000000L) {
            until.tv_sec++;
            until.tv_nsec -= 1000000000L;
        }
        pthread_cond_timedwait(&r->progress, &r->mu, &until);
        double t = now_seconds();
        if (tty && t - last_draw > 0.2) {
            show_progress(r->next_write - start, todo, t - t0);
            last_draw = t;
        }
    }
    pthread_mutex_unlock(&r->mu);
    for (long i = 0; i < started; i++)
        pthread_join(threads[i], NULL);
    r->elapsed = now_seconds() - t0;
    if (tty && todo > 0) {
        show_progress(r->next_write - start, todo, r->elapsed);
        fputc('\n', stderr);
    }
    for (size_t k = 0; k < r->window; k++)
        free(r->slot[k].text);
    free(r->slot);
    r->slot = NULL;
    free(threads);
    free(r->batch);
    r->batch = NULL;
    pthread_cond_destroy(&r->space_free);
    pthread_cond_destroy(&r->progress);
    pthread_mutex_destroy(&r->mu);
    return r->error[0] ? -1 : 0;
}
