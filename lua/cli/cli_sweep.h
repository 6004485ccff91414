/*
 * `coldprep sweep` and `coldprep merge` (docs/cli.md, "Sweeps"), and the sweep output files
 * they share: a data file (CSV with a header, or JSON Lines, one row per point, first
 * column "point"), while it runs a journal PATH.pending of rows finished ahead of an
 * earlier point, and once the run is complete a small marker PATH.done recording which
 * slice of which sweep the file holds.
 */
#ifndef COLDPREP_CLI_SWEEP_H
#define COLDPREP_CLI_SWEEP_H

#include <lua.h>
#include <pthread.h>
#include <signal.h>
#include <stdint.h>
#include <stdio.h>
#include <sys/types.h>

/* Entry points; argv[0] is the subcommand name.  Return an exit code (cli.h). */
int cpl_sweep_main(int argc, char **argv);
int cpl_merge_main(int argc, char **argv);

/* What PATH.done says about a finished sweep file. */
typedef struct cpl_sweep_marker {
    char format[8];   /* "csv" or "jsonl" */
    int64_t points;   /* points in the whole sweep */
    int64_t shard;    /* this slice, 1..shards */
    int64_t shards;
    int64_t first;    /* first and last point of the slice (1-based, inclusive) */
    int64_t last;
} cpl_sweep_marker;

/* The first and last point (1-based) of shard k of n over `count` points: contiguous,
 * balanced slices; an empty slice has last = first - 1. */
void cpl_shard_range(int64_t count, int64_t k, int64_t n, int64_t *first, int64_t *last);

/* The shape of a row: for CSV the header line (rows have as many fields), for JSON Lines
 * the keys as written, quoted and joined by commas ("point","x","error").  cpl_row_fits
 * is 1 when row[0..len) (with its line end) is a well-formed row of that shape: CSV per
 * RFC 4180 section 2 ending with CRLF, JSON one flat object with exactly those keys in
 * order, ending with LF.  cpl_row_keys writes a JSON row's keys in that form to keys[size];
 * 0, or -1 when the row is not such an object or keys is too small. */
int cpl_row_fits(const char *row, size_t len, const char *format, const char *shape);
int cpl_row_keys(const char *row, size_t len, char *keys, size_t size);

/* Scan an existing sweep file: it must start with `header` (CSV; "" for JSON Lines) and
 * hold rows of `shape` numbered first, first + 1, ...  On success *next is the next point
 * to compute, *good_end the byte offset just past the last complete row and *torn the
 * number of bytes of an incomplete last row after it.  Neither the file nor the journal
 * is read through a symbolic link.  Returns 0, or -1 with a message in err. */
int cpl_sweep_scan(const char *path, const char *format, const char *header, const char *shape,
                   int64_t first, int64_t *next, off_t *good_end, off_t *torn, char *err,
                   size_t errlen);

/* One finished row: its point number and its text (with its line end), malloc'd. */
typedef struct cpl_row {
    int64_t point;
    char *text;
    size_t len;
} cpl_row;

/* Read the complete rows of a journal PATH.pending whose points lie in [lo, hi], sorted by
 * point, duplicates dropped; an incomplete last row is ignored, and so are rows that are
 * not of `shape` (counted in *dropped: their points are computed again).  *rows is
 * malloc'd (free each text and the array); a missing file gives no rows.  0, or -1 with
 * err. */
int cpl_journal_read(const char *path, const char *format, const char *shape, int64_t lo,
                     int64_t hi, cpl_row **rows, size_t *n, size_t *dropped, char *err,
                     size_t errlen);

/* Rows each worker may run ahead of the first row not yet written. */
enum { CPL_SWEEP_WINDOW_PER_JOB = 64 };

/* A run of the engine in cli_sweep_run.c.  The caller fills the first block, with the
 * output open for appending after its finished rows and the journal open for appending
 * and holding exactly the recovered rows (journal_rows of them); the engine owns the
 * recovered rows' texts. */
typedef struct cpl_sweep_run {
    const char *file, *out, *journal, *format, *header, *shape;
    const struct cpl_sandbox *sandbox; /* the workers' caps and rules when sandbox->on */
    int64_t count, last, next_write; /* next_write: the first point not yet in the file */
    int fd, jfd;
    cpl_row *recovered;
    size_t nrecovered;
    long journal_rows;

    /* the engine's own state */
    long jobs_used;
    double elapsed;
    char error[1024]; /* the first error; "" if none */
    int64_t next_claim;
    size_t window, waiting, rec_write, rec_claim;
    struct { char *text; size_t len; } *slot; /* row of point i at slot[i % window] */
    char *batch;
    size_t batch_len, batch_cap;
    int stop, workers_alive;
    volatile sig_atomic_t *cancel; /* the stop signal: the workers' cancel flag */
    int out_broken;     /* a write to the output failed: nothing more is appended to it */
    int journal_broken; /* likewise for the journal (a torn row there must stay last) */
    pthread_mutex_t mu;
    pthread_cond_t space_free, progress;
} cpl_sweep_run;

/* Compute every point from next_write to last on `jobs` threads (fewer if fewer points
 * remain), appending rows in point order, until done, an error, or *stop_signal becomes
 * non-zero.  *stop_signal is each worker's cancel flag: the points in progress stop within
 * a few milliseconds (the long C computations poll it, and a count hook raises
 * "interrupted" in Lua code) and are not written; every finished row is on disk, in the
 * file or the journal, so --resume completes the run.  Draws a progress bar on stderr when
 * tty.  Returns 0, or -1 with r->error. */
int cpl_sweep_execute(cpl_sweep_run *r, long jobs, volatile sig_atomic_t *stop_signal, int tty);

/* Run a sweep file in L (cp.sweep.load) and leave the compiled sweep on the stack; 0, or -1
 * with the error message on the stack. */
int cpl_sweep_load(lua_State *L, const char *file, const char *out, const char *format);

/* write(2) all of buf, retrying after EINTR; 0 or -1 (errno set). */
int cpl_write_all(int fd, const char *buf, size_t len);

/* Write PATH.done atomically (temporary file + rename); read it back.  0 or -1 + err. */
int cpl_marker_write(const char *path, const cpl_sweep_marker *m, char *err, size_t errlen);
int cpl_marker_read(const char *path, cpl_sweep_marker *m, char *err, size_t errlen);

/* PATH.done for a data file PATH, in a buffer of size n. */
void cpl_marker_path(const char *path, char *buf, size_t n);

#endif
