/*
 * Persistent history of the REPL, kept by readline's history library in the file
 * $XDG_STATE_HOME/coldprep/history (or ~/.local/state/coldprep/history when XDG_STATE_HOME
 * is unset or not absolute, as the XDG base-directory convention says).  Each entry is
 * appended as soon as it is entered; the file is trimmed to HISTORY_MAX entries when the
 * session ends.  The file holds one line per entry, so a statement typed over several
 * lines is stored joined by spaces when that means the same Lua code, else line by line.
 * Failing to read or save history never ends the session: it is a warning, given once.
 */
#include <errno.h>
#include <readline/history.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "repl_int.h"

enum { HISTORY_MAX = 1000 };

static char *history_path; /* NULL: not saving */
static int warned;

static void warn(const char *fmt, ...)
{
    if (warned)
        return;
    warned = 1;
    va_list ap;
    va_start(ap, fmt);
    fputs("coldprep: warning: ", stderr);
    vfprintf(stderr, fmt, ap);
    fputs("; history will not be saved\n", stderr);
    va_end(ap);
}

static char *concat(const char *a, const char *b)
{
    size_t la = strlen(a), lb = strlen(b);
    char *s = malloc(la + lb + 1);
    if (s) {
        memcpy(s, a, la);
        memcpy(s + la, b, lb + 1);
    }
    return s;
}

static char *choose_path(void)
{
    const char *state = getenv("XDG_STATE_HOME");
    if (state && state[0] == '/')
        return concat(state, "/coldprep/history");
    const char *home = getenv("HOME");
    if (home && home[0])
        return concat(home, "/.local/state/coldprep/history");
    return NULL;
}

/* mkdir -p of the directory part of path, new directories private (0700). */
static int make_parents(const char *path)
{
    char *dir = strdup(path);
    if (dir == NULL)
        return ENOMEM;
    int err = 0;
    for (char *p = dir + 1; *p && !err; p++) {
        if (*p != '/')
            continue;
        *p = '\0';
        if (mkdir(dir, 0700) != 0 && errno != EEXIST)
            err = errno;
        *p = '/';
    }
    if (!err) { /* the directory must now exist (EEXIST may have been a plain file) */
        char *slash = strrchr(dir, '/');
        *slash = '\0';
        struct stat st;
        if (stat(dir, &st) != 0)
            err = errno;
        else if (!S_ISDIR(st.st_mode))
            err = ENOTDIR;
    }
    free(dir);
    return err;
}

void cpl_history_open(void)
{
    stifle_history(HISTORY_MAX);
    history_path = choose_path();
    if (history_path == NULL) {
        warn("neither XDG_STATE_HOME nor HOME is set");
        return;
    }
    int err = make_parents(history_path);
    if (err) {
        warn("cannot create the directory of %s: %s", history_path, strerror(err));
        free(history_path);
        history_path = NULL;
        return;
    }
    err = read_history(history_path);
    if (err && err != ENOENT)
        warn("cannot read %s: %s", history_path, strerror(err));
}

static void remember(const char *line)
{
    if (line[strspn(line, " \t")] == '\0')
        return;
    HIST_ENTRY *last = history_length > 0 ? history_get(history_base + history_length - 1) : NULL;
    if (last && strcmp(last->line, line) == 0)
        return;
    add_history(line);
    if (history_path == NULL)
        return;
    int err = append_history(1, history_path);
    if (err == ENOENT) /* no file yet: write creates it (mode 0600) */
        err = write_history(history_path);
    if (err)
        warn("cannot write %s: %s", history_path, strerror(err));
}

/* Joining lines with spaces changes nothing outside comments and long strings, and a
 * backslash-newline inside a short string. */
static int joinable(const char *entry)
{
    return strstr(entry, "--") == NULL && strstr(entry, "[[") == NULL &&
           strstr(entry, "[=") == NULL && strstr(entry, "\\\n") == NULL;
}

void cpl_history_add(const char *entry)
{
    char *copy = strdup(entry);
    if (copy == NULL)
        return;
    if (joinable(copy)) {
        for (char *p = copy; *p; p++)
            if (*p == '\n')
                *p = ' ';
        remember(copy);
    } else {
        for (char *line = strtok(copy, "\n"); line; line = strtok(NULL, "\n"))
            remember(line);
    }
    free(copy);
    using_history(); /* the next Up starts from the newest entry */
}

void cpl_history_close(void)
{
    if (history_path)
        history_truncate_file(history_path, HISTORY_MAX);
    free(history_path);
    history_path = NULL;
    clear_history();
}
