/*
 * `coldprep merge OUT SLICE...`: joins the slices of a sharded sweep into the file an
 * unsharded run would have written.  Every slice must be complete (its PATH.done marker
 * exists), all must come from one sweep (same format, point count, number of slices and
 * header), every slice 1..N must be given exactly once, and each must hold exactly its
 * points in order.  The result is written to OUT.tmp and renamed to OUT at the end.
 */
#include <errno.h>
#include <fcntl.h>
#include <inttypes.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "cli_sweep.h"
#include "fileio.h"

static const char MERGE_USAGE[] =
    "usage: coldprep merge OUT SLICE...\n"
    "\n"
    "Joins the finished slices of a sweep run with --shard K/N (in any order) into OUT,\n"
    "checking that every slice 1..N is there once and complete.\n";

/* The CSV header line of a file (bytes up to and including the first line end). */
static char *read_header(const char *path, char *err, size_t errlen)
{
    int fd = cpl_open_nofollow(path, O_RDONLY, 0);
    FILE *f = fd >= 0 ? fdopen(fd, "rb") : NULL;
    if (f == NULL && fd >= 0)
        close(fd);
    if (f == NULL) {
        snprintf(err, errlen, "cannot open %s: %s", path, strerror(errno));
        return NULL;
    }
    size_t cap = 256, len = 0;
    char *h = malloc(cap);
    int c, quoted = 0;
    while (h && (c = getc(f)) != EOF) {
        if (len + 2 > cap) {
            char *nh = realloc(h, cap *= 2);
            if (nh == NULL) {
                free(h);
                h = NULL;
                break;
            }
            h = nh;
        }
        h[len++] = (char)c;
        if (c == '"')
            quoted = !quoted;
        if (c == '\n' && !quoted)
            break;
    }
    fclose(f);
    if (h == NULL) {
        snprintf(err, errlen, "out of memory");
        return NULL;
    }
    h[len] = '\0';
    return h;
}

static int copy_rows(FILE *dst, const char *path, long skip, char *err, size_t errlen)
{
    FILE *src = fopen(path, "rb");
    if (src == NULL || fseek(src, skip, SEEK_SET) != 0) {
        snprintf(err, errlen, "cannot read %s: %s", path, strerror(errno));
        if (src)
            fclose(src);
        return -1;
    }
    char buf[1 << 16];
    size_t n;
    while ((n = fread(buf, 1, sizeof buf, src)) > 0) {
        if (fwrite(buf, 1, n, dst) != n) {
            snprintf(err, errlen, "cannot write the merged file: %s", strerror(errno));
            fclose(src);
            return -1;
        }
    }
    int bad = ferror(src);
    fclose(src);
    if (bad) {
        snprintf(err, errlen, "cannot read %s", path);
        return -1;
    }
    return 0;
}

static int check_each(char **paths, int n, cpl_sweep_marker *marks, int *order,
                      const char *header, const char *shape, char *err, size_t errlen);

/* Check the slices against each other; fills order[k-1] = index into paths of slice k. */
static int check_slices(char **paths, int n, cpl_sweep_marker *marks, int *order, char **header,
                        char *err, size_t errlen)
{
    for (int i = 0; i < n; i++)
        if (cpl_marker_read(paths[i], &marks[i], err, errlen) != 0)
            return -1;
    int64_t shards = marks[0].shards;
    if (shards != n) {
        snprintf(err, errlen, "the sweep was split into %" PRId64 " slices but %d %s given",
                 shards, n, n == 1 ? "was" : "were");
        if (shards > n) {
            size_t len = strlen(err);
            snprintf(err + len, errlen - len, "; missing:");
            for (int64_t k = 1; k <= shards; k++) {
                int found = 0;
                for (int i = 0; i < n; i++)
                    found |= marks[i].shard == k;
                len = strlen(err);
                if (!found && len + 24 < errlen)
                    snprintf(err + len, errlen - len, " %" PRId64, k);
            }
        }
        return -1;
    }
    for (int i = 0; i < n; i++)
        order[i] = -1;
    *header = read_header(paths[0], err, errlen);
    if (*header == NULL)
        return -1;
    /* the shape every row must have: the CSV header, or the keys of slice 1's first row */
    char *shape = *header;
    if (strcmp(marks[0].format, "csv") != 0) {
        size_t len = strlen(*header);
        shape = malloc(len + 2);
        if (shape != NULL && len == 0)
            shape[0] = '\0'; /* slice 1 is empty (more slices than points): rows are only parsed */
        else if (shape == NULL || cpl_row_keys(*header, len, shape, len + 2) != 0) {
            snprintf(err, errlen, "%s does not start with a JSON Lines row of a sweep", paths[0]);
            free(shape);
            return -1;
        }
    }
    int rc = check_each(paths, n, marks, order, *header, shape, err, errlen);
    if (shape != *header)
        free(shape);
    return rc;
}

/* Check every slice against slice 1's marker, header and row shape. */
static int check_each(char **paths, int n, cpl_sweep_marker *marks, int *order,
                      const char *header, const char *shape, char *err, size_t errlen)
{
    int64_t shards = marks[0].shards;
    for (int i = 0; i < n; i++) {
        cpl_sweep_marker *m = &marks[i];
        if (m->shards != shards || m->points != marks[0].points
            || strcmp(m->format, marks[0].format) != 0) {
            snprintf(err, errlen, "%s and %s are slices of different sweeps", paths[0], paths[i]);
            return -1;
        }
        if (m->shard < 1 || m->shard > shards || order[m->shard - 1] >= 0) {
            snprintf(err, errlen, "slice %" PRId64 " of %" PRId64 " is given twice (%s)", m->shard,
                     shards, paths[i]);
            return -1;
        }
        order[m->shard - 1] = i;
        int64_t first, last, next;
        cpl_shard_range(m->points, m->shard, shards, &first, &last);
        off_t good_end, torn;
        const char *h = strcmp(m->format, "csv") == 0 ? header : "";
        int bad = m->first != first || m->last != last;
        if (!bad && cpl_sweep_scan(paths[i], m->format, h, shape, first, &next, &good_end, &torn,
                                   err, errlen) != 0)
            return -1; /* its message says which row is wrong */
        if (bad || next != last + 1 || torn != 0) {
            snprintf(err, errlen, "%s should hold points %" PRId64 " to %" PRId64
                     " (slice %" PRId64 " of %" PRId64 ") and does not", paths[i], first, last,
                     m->shard, shards);
            return -1;
        }
    }
    return 0;
}

int cpl_merge_main(int argc, char **argv)
{
    if (argc >= 2 && (strcmp(argv[1], "-h") == 0 || strcmp(argv[1], "--help") == 0)) {
        fputs(MERGE_USAGE, stdout);
        return CPL_EXIT_OK;
    }
    for (int i = 1; i < argc; i++) {
        if (argv[i][0] == '-' && argv[i][1] != '\0') {
            fprintf(stderr, "coldprep merge: unknown option %s; allowed -h (--help) alone "
                    "(a file whose name starts with '-' is given as ./%s)\n"
                    "Try 'coldprep merge --help'.\n", argv[i], argv[i]);
            return CPL_EXIT_USAGE;
        }
    }
    if (argc < 3) {
        fprintf(stderr, "coldprep merge: give the output file and the slices\n%s", MERGE_USAGE);
        return CPL_EXIT_USAGE;
    }
    const char *out = argv[1];
    int n = argc - 2;
    char **paths = argv + 2;
    char err[8400] = "", tmp[4200], lock[4200] = "";
    int lfd = -1;
    cpl_sweep_marker *marks = calloc((size_t)n, sizeof *marks);
    int *order = calloc((size_t)n, sizeof *order);
    char *header = NULL;
    int rc = CPL_EXIT_ERROR;
    FILE *dst = NULL;
    if (marks == NULL || order == NULL) {
        snprintf(err, sizeof err, "out of memory");
        goto done;
    }
    for (int i = 0; i < n; i++) {
        /* the same file under another name (./m.csv, a link) counts too */
        if (strcmp(paths[i], out) == 0 || cpl_same_file(paths[i], out)) {
            snprintf(err, sizeof err, "the output %s is also given as a slice (%s)", out,
                     paths[i]);
            goto done;
        }
    }
    lfd = cpl_lock_take(out, lock, sizeof lock, err, sizeof err);
    if (lfd < 0)
        goto done;
    if (check_slices(paths, n, marks, order, &header, err, sizeof err) != 0)
        goto done;
    int csv = strcmp(marks[0].format, "csv") == 0;
    snprintf(tmp, sizeof tmp, "%s.tmp", out);
    int tfd = cpl_create_temp(tmp);
    dst = tfd >= 0 ? fdopen(tfd, "wb") : NULL;
    if (dst == NULL) {
        snprintf(err, sizeof err, "cannot write %s: %s", tmp, strerror(errno));
        if (tfd >= 0)
            close(tfd);
        goto done;
    }
    if (csv && fputs(header, dst) == EOF) {
        snprintf(err, sizeof err, "cannot write %s: %s", tmp, strerror(errno));
        goto done;
    }
    for (int k = 0; k < n; k++)
        if (copy_rows(dst, paths[order[k]], csv ? (long)strlen(header) : 0, err, sizeof err))
            goto done;
    int bad = fflush(dst) != 0 || fsync(fileno(dst)) != 0;
    bad |= fclose(dst) != 0;
    dst = NULL;
    char done[4096];
    cpl_marker_path(out, done, sizeof done);
    remove(done); /* an older OUT's marker must not describe the new OUT */
    if (bad || rename(tmp, out) != 0) {
        snprintf(err, sizeof err, "cannot write %s: %s", out, strerror(errno));
        goto done;
    }
    cpl_sweep_marker whole = marks[0];
    whole.shard = whole.shards = 1;
    whole.first = 1;
    whole.last = whole.points;
    if (cpl_marker_write(out, &whole, err, sizeof err) != 0)
        goto done;
    fprintf(stderr, "coldprep merge: %d slices, %" PRId64 " points -> %s\n", n, whole.points, out);
    rc = CPL_EXIT_OK;
done:
    if (dst) {
        fclose(dst);
        remove(tmp);
    }
    cpl_lock_release(lfd, lock);
    if (rc != CPL_EXIT_OK)
        fprintf(stderr, "coldprep merge: %s\n", err);
    free(header);
    free(marks);
    free(order);
    return rc;
}
