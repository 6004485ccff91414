/*
 * `coldprep sweep` and `coldprep merge` (docs/cli-sweep.md), and the sweep output files
 * they share: a data file (CSV with a header, or JSON Lines, one row per point, first
 * column "point") plus, once the run is complete, a small marker PATH.done recording which
 * slice of which sweep the file holds.
 */
#ifndef COLDPREP_CLI_SWEEP_H
#define COLDPREP_CLI_SWEEP_H

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

/* Scan an existing sweep file: it must start with `header` (CSV; "" for JSON Lines) and
 * hold rows numbered first, first + 1, ...  On success *next is the next point to compute,
 * *good_end the byte offset just past the last complete row and *torn the number of
 * bytes of an incomplete last row after it.  Returns 0, or -1 with a message in err. */
int cpl_sweep_scan(const char *path, const char *format, const char *header, int64_t first,
                   int64_t *next, off_t *good_end, off_t *torn, char *err, size_t errlen);

/* Write PATH.done atomically (temporary file + rename); read it back.  0 or -1 + err. */
int cpl_marker_write(const char *path, const cpl_sweep_marker *m, char *err, size_t errlen);
int cpl_marker_read(const char *path, cpl_sweep_marker *m, char *err, size_t errlen);

/* PATH.done for a data file PATH, in a buffer of size n. */
void cpl_marker_path(const char *path, char *buf, size_t n);

#endif
