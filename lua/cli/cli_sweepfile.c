/*
 * Sweep output files as `coldprep sweep --resume` and `coldprep merge` read them: a
 * scanner that checks the row numbering and finds where the last complete row ends (a
 * row torn by SIGKILL has no line end yet), the reader of the journal PATH.pending (rows
 * finished out of order), the balanced shard ranges, and the PATH.done marker written once
 * a file is complete.  CSV rows end with CRLF outside quotes; JSON
 * Lines rows end with LF (JSON strings escape line breaks).
 */
#include <ctype.h>
#include <errno.h>
#include <fcntl.h>
#include <inttypes.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli_sweep.h"
#include "fileio.h"

void cpl_shard_range(int64_t count, int64_t k, int64_t n, int64_t *first, int64_t *last)
{
    /* shard k covers points floor((k-1) count / n) + 1 .. floor(k count / n), computed
     * as k q + floor(k r / n) with count = q n + r so that nothing overflows (n < 2^31). */
    int64_t q = count / n, r = count % n;
    *first = (k - 1) * q + ((k - 1) * r) / n + 1;
    *last = k * q + (k * r) / n;
}

void cpl_marker_path(const char *path, char *buf, size_t n)
{
    snprintf(buf, n, "%s.done", path);
}

/* Read the point number at the start of a row: "123," (CSV) or {"point":123, (JSON). */
static int row_point(const char *row, size_t len, const char *format, int64_t *point)
{
    size_t i = 0;
    if (strcmp(format, "jsonl") == 0) {
        static const char prefix[] = "{\"point\":";
        if (len < sizeof prefix - 1 || memcmp(row, prefix, sizeof prefix - 1) != 0)
            return -1;
        i = sizeof prefix - 1;
    }
    int64_t v = 0;
    size_t start = i;
    while (i < len && row[i] >= '0' && row[i] <= '9' && i - start < 18)
        v = v * 10 + (row[i++] - '0');
    if (i == start || i >= len || row[i] != ',')
        return -1;
    *point = v;
    return 0;
}

/* The fields of a CSV record row[0..len) that ends with CRLF, counted; -1 if it breaks
 * RFC 4180 section 2 (a quote inside an unquoted field, text after a closing quote, a bare
 * CR or LF outside quotes, no CRLF at the end). */
static long csv_fields(const char *row, size_t len)
{
    if (len < 2 || row[len - 2] != '\r' || row[len - 1] != '\n')
        return -1;
    len -= 2;
    long fields = 1;
    size_t i = 0;
    for (;;) {
        if (i < len && row[i] == '"') {
            for (i++;; i++) {
                if (i >= len)
                    return -1;
                if (row[i] == '"') {
                    if (i + 1 < len && row[i + 1] == '"')
                        i++;
                    else
                        break;
                }
            }
            i++;
        } else {
            while (i < len && row[i] != ',' && row[i] != '"' && row[i] != '\r' && row[i] != '\n')
                i++;
        }
        if (i == len)
            return fields;
        if (row[i] != ',')
            return -1;
        fields++;
        i++;
    }
}

/* The length of the valid UTF-8 sequence at s[0..n) (strict: no overlong forms, no
 * surrogates, nothing beyond U+10FFFF, as Lua's utf8.len checks), or 0. */
static size_t utf8_sequence(const unsigned char *s, size_t n)
{
    size_t len = s[0] < 0x80 ? 1 : s[0] >= 0xC2 && s[0] <= 0xDF ? 2 : s[0] >= 0xE0 && s[0] <= 0xEF ? 3
                 : s[0] >= 0xF0 && s[0] <= 0xF4 ? 4 : 0;
    if (len == 0 || len > n)
        return 0;
    for (size_t k = 1; k < len; k++)
        if ((s[k] & 0xC0) != 0x80)
            return 0;
    if ((s[0] == 0xE0 && s[1] < 0xA0) || (s[0] == 0xED && s[1] > 0x9F)
        || (s[0] == 0xF0 && s[1] < 0x90) || (s[0] == 0xF4 && s[1] > 0x8F))
        return 0;
    return len;
}

/* The value of the four hexadecimal digits at s, or -1. */
static long hex4(const char *s, size_t n)
{
    long v = 0;
    if (n < 4)
        return -1;
    for (int k = 0; k < 4; k++) {
        int c = (unsigned char)s[k];
        int d = c >= '0' && c <= '9' ? c - '0' : c >= 'a' && c <= 'f' ? c - 'a' + 10
                : c >= 'A' && c <= 'F' ? c - 'A' + 10 : -1;
        if (d < 0)
            return -1;
        v = 16 * v + d;
    }
    return v;
}

/* The end of the JSON string literal starting at row[i] (a quote), or 0 when it is not a
 * valid one (RFC 8259 section 7: escapes, no raw control characters, valid UTF-8, UTF-16
 * surrogates only in pairs) -- what coldprep.decode accepts. */
static size_t json_string_end(const char *row, size_t len, size_t i)
{
    for (i++; i < len;) {
        unsigned char c = (unsigned char)row[i];
        if (c == '"')
            return i + 1;
        if (c < 0x20)
            return 0;
        if (c != '\\') {
            size_t n = utf8_sequence((const unsigned char *)row + i, len - i);
            if (n == 0)
                return 0;
            i += n;
            continue;
        }
        if (i + 1 >= len)
            return 0;
        char e = row[i + 1];
        if (e != 'u') {
            if (strchr("\"\\/bfnrt", e) == NULL || e == '\0')
                return 0;
            i += 2;
            continue;
        }
        long u = hex4(row + i + 2, len - i - 2);
        if (u < 0 || (u >= 0xDC00 && u <= 0xDFFF))
            return 0;
        i += 6;
        if (u >= 0xD800 && u <= 0xDBFF) { /* must be followed by a low surrogate */
            long lo = i + 1 < len && row[i] == '\\' && row[i + 1] == 'u'
                          ? hex4(row + i + 2, len - i - 2) : -1;
            if (lo < 0xDC00 || lo > 0xDFFF)
                return 0;
            i += 6;
        }
    }
    return 0;
}

/* The end of a JSON number, true, false or null at row[i], or 0: numbers per RFC 8259
 * section 6, and finite as doubles. */
static size_t json_scalar_end(const char *row, size_t len, size_t i) /* row[len] is LF */
{
    static const char *const words[] = {"true", "false", "null"};
    for (int w = 0; w < 3; w++) {
        size_t n = strlen(words[w]);
        if (len - i >= n && memcmp(row + i, words[w], n) == 0)
            return i + n;
    }
    size_t start = i;
    if (i < len && row[i] == '-')
        i++;
    if (i < len && row[i] == '0')
        i++;
    else if (i < len && row[i] >= '1' && row[i] <= '9')
        while (i < len && isdigit((unsigned char)row[i]))
            i++;
    else
        return 0;
    if (i < len && row[i] == '.') {
        size_t d = ++i;
        while (i < len && isdigit((unsigned char)row[i]))
            i++;
        if (i == d)
            return 0;
    }
    if (i < len && (row[i] == 'e' || row[i] == 'E')) {
        i++;
        if (i < len && (row[i] == '+' || row[i] == '-'))
            i++;
        size_t d = i;
        while (i < len && isdigit((unsigned char)row[i]))
            i++;
        if (i == d)
            return 0;
    }
    /* strtod reads the same digits (the row ends with its LF, so it stops in the row) */
    return isfinite(strtod(row + start, NULL)) ? i : 0;
}

int cpl_row_keys(const char *row, size_t len, char *keys, size_t size)
{
    size_t i = 1, k = 0;
    if (len < 3 || row[0] != '{' || row[len - 1] != '\n' || size == 0)
        return -1;
    len--;
    for (;;) {
        size_t e = row[i] == '"' ? json_string_end(row, len, i) : 0;
        if (e == 0 || e >= len || row[e] != ':' || k + (e - i) + 2 > size)
            return -1;
        if (k > 0)
            keys[k++] = ',';
        memcpy(keys + k, row + i, e - i);
        k += e - i;
        i = e + 1;
        i = i < len && row[i] == '"' ? json_string_end(row, len, i)
                                     : json_scalar_end(row, len, i);
        if (i == 0)
            return -1;
        if (i + 1 == len && row[i] == '}')
            break;
        if (i >= len || row[i] != ',')
            return -1;
        i++;
    }
    keys[k] = '\0';
    return 0;
}

int cpl_row_fits(const char *row, size_t len, const char *format, const char *shape)
{
    if (strcmp(format, "csv") == 0) {
        long want = csv_fields(shape, strlen(shape));
        return want > 0 && csv_fields(row, len) == want;
    }
    size_t n = strlen(shape) + 2;
    char *keys = malloc(n);
    int ok = keys && cpl_row_keys(row, len, keys, n) == 0
             && (shape[0] == '\0' || strcmp(keys, shape) == 0);
    free(keys);
    return ok;
}

/* fopen(path, "rb") without following a symbolic link as the last component. */
static FILE *open_read(const char *path)
{
    int fd = cpl_open_nofollow(path, O_RDONLY, 0);
    FILE *f = fd >= 0 ? fdopen(fd, "rb") : NULL;
    if (f == NULL && fd >= 0)
        close(fd);
    return f;
}

int cpl_sweep_scan(const char *path, const char *format, const char *header, const char *shape,
                   int64_t first, int64_t *next, off_t *good_end, off_t *torn, char *err,
                   size_t errlen)
{
    FILE *f = open_read(path);
    if (f == NULL) {
        snprintf(err, errlen, "cannot open %s: %s", path,
                 errno == ELOOP ? "it is a symbolic link" : strerror(errno));
        return -1;
    }
    int csv = strcmp(format, "csv") == 0, rc = 0;
    size_t hlen = strlen(header);
    off_t pos = 0, row_start = 0;
    *next = first;
    *good_end = 0;

    /* The header must be there whole and identical; a torn header counts as empty. */
    char *hbuf = malloc(hlen + 1);
    size_t got = hbuf ? fread(hbuf, 1, hlen, f) : 0;
    if (hbuf == NULL) {
        snprintf(err, errlen, "out of memory");
        rc = -1;
    } else if (got < hlen) {
        if (memcmp(hbuf, header, got) != 0) {
            snprintf(err, errlen, "%s does not start with this sweep's header", path);
            rc = -1;
        }
        pos = (off_t)got;
    } else if (memcmp(hbuf, header, hlen) != 0) {
        snprintf(err, errlen, "%s has another header than this sweep's (%.*s): it is not "
                 "this sweep's output", path, (int)(hlen > 2 ? hlen - 2 : hlen), header);
        rc = -1;
    } else {
        pos = row_start = *good_end = (off_t)hlen;
    }
    free(hbuf);

    /* Rows, each read whole: its point number and its shape are checked. */
    char *row = NULL;
    size_t row_len = 0, row_cap = 0;
    int quoted = 0, c;
    while (rc == 0 && got == hlen && (c = getc(f)) != EOF) {
        pos++;
        if (row_len == row_cap) {
            char *nr = realloc(row, row_cap = 2 * row_cap + 256);
            if (nr == NULL) {
                snprintf(err, errlen, "out of memory reading %s", path);
                rc = -1;
                break;
            }
            row = nr;
        }
        row[row_len++] = (char)c;
        if (csv && c == '"')
            quoted = !quoted;
        if (c != '\n' || quoted)
            continue;
        int64_t point;
        int numbered = row_point(row, row_len, format, &point) == 0 && point == *next;
        if (!numbered || !cpl_row_fits(row, row_len, format, shape)) {
            char shown[41];
            size_t n = row_len < 40 ? row_len : 40;
            while (n > 0 && (row[n - 1] == '\n' || row[n - 1] == '\r'))
                n--;
            memcpy(shown, row, n);
            shown[n] = '\0';
            if (numbered)
                snprintf(err, errlen, "%s: the row at byte %jd (point %" PRId64 ", \"%s...\") "
                         "does not have this sweep's columns: the file is not this sweep's "
                         "output, or was edited", path, (intmax_t)row_start, point, shown);
            else
                snprintf(err, errlen, "%s: the row at byte %jd should be point %" PRId64
                         " but reads \"%s\": the file is not this sweep's (or shard's) output",
                         path, (intmax_t)row_start, *next, shown);
            rc = -1;
            break;
        }
        (*next)++;
        row_start = *good_end = pos;
        row_len = 0;
    }
    free(row);
    if (rc == 0 && ferror(f)) {
        snprintf(err, errlen, "cannot read %s: %s", path, strerror(errno));
        rc = -1;
    }
    *torn = pos - *good_end;
    fclose(f);
    return rc;
}

int cpl_marker_write(const char *path, const cpl_sweep_marker *m, char *err, size_t errlen)
{
    char done[4096], tmp[4200];
    cpl_marker_path(path, done, sizeof done);
    snprintf(tmp, sizeof tmp, "%s.tmp", done);
    int fd = cpl_create_temp(tmp);
    FILE *f = fd >= 0 ? fdopen(fd, "wb") : NULL;
    if (f == NULL) {
        snprintf(err, errlen, "cannot write %s: %s", tmp, strerror(errno));
        if (fd >= 0)
            close(fd);
        return -1;
    }
    fprintf(f,
            "{\"format\":\"%s\",\"points\":%" PRId64 ",\"shard\":%" PRId64 ",\"shards\":%" PRId64
            ",\"first\":%" PRId64 ",\"last\":%" PRId64 "}\n",
            m->format, m->points, m->shard, m->shards, m->first, m->last);
    int bad = fflush(f) != 0 || fsync(fileno(f)) != 0;
    bad |= fclose(f) != 0;
    if (bad || rename(tmp, done) != 0) {
        snprintf(err, errlen, "cannot write %s: %s", done, strerror(errno));
        remove(tmp);
        return -1;
    }
    return 0;
}

static int marker_field(const char *text, const char *key, int64_t *v)
{
    char pattern[32];
    snprintf(pattern, sizeof pattern, "\"%s\":", key);
    const char *p = strstr(text, pattern);
    if (p == NULL)
        return -1;
    char *end;
    long long x = strtoll(p + strlen(pattern), &end, 10);
    if (end == p + strlen(pattern))
        return -1;
    *v = x;
    return 0;
}

int cpl_marker_read(const char *path, cpl_sweep_marker *m, char *err, size_t errlen)
{
    char done[4096], text[512];
    cpl_marker_path(path, done, sizeof done);
    FILE *f = open_read(done);
    if (f == NULL) {
        snprintf(err, errlen, "%s is not complete (no %s): finish it with `coldprep sweep "
                 "... --resume`", path, done);
        return -1;
    }
    size_t n = fread(text, 1, sizeof text - 1, f);
    fclose(f);
    text[n] = '\0';
    const char *fmt = strstr(text, "\"format\":\"");
    if (fmt == NULL || marker_field(text, "points", &m->points) || marker_field(text, "shard", &m->shard)
        || marker_field(text, "shards", &m->shards) || marker_field(text, "first", &m->first)
        || marker_field(text, "last", &m->last)) {
        snprintf(err, errlen, "%s is not a sweep completion marker", done);
        return -1;
    }
    fmt += strlen("\"format\":\"");
    snprintf(m->format, sizeof m->format, "%.*s", (int)strcspn(fmt, "\""), fmt);
    return 0;
}

static int row_order(const void *a, const void *b)
{
    int64_t pa = ((const cpl_row *)a)->point, pb = ((const cpl_row *)b)->point;
    return (pa > pb) - (pa < pb);
}

int cpl_journal_read(const char *path, const char *format, const char *shape, int64_t lo,
                     int64_t hi, cpl_row **rows, size_t *n, size_t *dropped, char *err,
                     size_t errlen)
{
    *rows = NULL;
    *n = 0;
    *dropped = 0;
    err[0] = '\0';
    FILE *f = open_read(path);
    if (f == NULL && errno == ENOENT)
        return 0;
    if (f == NULL) {
        snprintf(err, errlen, "cannot open %s: %s", path,
                 errno == ELOOP ? "it is a symbolic link" : strerror(errno));
        return -1;
    }
    char *text = NULL;
    size_t len = 0, cap = 0, got;
    char buf[1 << 16];
    int rc = 0;
    while ((got = fread(buf, 1, sizeof buf, f)) > 0) {
        if (len + got > cap) {
            cap = 2 * (len + got);
            char *t = realloc(text, cap);
            if (t == NULL) {
                rc = -1;
                break;
            }
            text = t;
        }
        memcpy(text + len, buf, got);
        len += got;
    }
    fclose(f);
    int csv = strcmp(format, "csv") == 0, quoted = 0;
    size_t start = 0, cap_rows = 0;
    for (size_t i = 0; rc == 0 && i < len; i++) {
        if (csv && text[i] == '"')
            quoted = !quoted;
        if (text[i] != '\n' || quoted)
            continue;
        int64_t point;
        size_t rlen = i + 1 - start;
        if (row_point(text + start, rlen, format, &point) != 0
            || !cpl_row_fits(text + start, rlen, format, shape)) {
            (*dropped)++; /* not a row of this sweep: its point is computed again */
        } else if (point >= lo && point <= hi) {
            if (*n == cap_rows) {
                cap_rows = 2 * cap_rows + 16;
                cpl_row *nr = realloc(*rows, cap_rows * sizeof *nr);
                if (nr == NULL) {
                    rc = -1;
                    break;
                }
                *rows = nr;
            }
            char *copy = malloc(rlen);
            if (copy == NULL) {
                rc = -1;
                break;
            }
            memcpy(copy, text + start, rlen);
            (*rows)[(*n)++] = (cpl_row){point, copy, rlen};
        }
        start = i + 1;
    }
    free(text);
    if (rc != 0) {
        if (!err[0])
            snprintf(err, errlen, "out of memory reading %s", path);
        for (size_t i = 0; i < *n; i++)
            free((*rows)[i].text);
        free(*rows);
        *rows = NULL;
        *n = 0;
        return -1;
    }
    if (*n > 1)
        qsort(*rows, *n, sizeof **rows, row_order);
    size_t kept = 0;
    for (size_t i = 0; i < *n; i++) {
        if (kept > 0 && (*rows)[kept - 1].point == (*rows)[i].point) {
            free((*rows)[i].text);
            continue;
        }
        (*rows)[kept++] = (*rows)[i];
    }
    *n = kept;
    return 0;
}
