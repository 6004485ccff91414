/*
 * The interactive session, built with repl_complete.c and repl_history.c into the module
 * coldprep_repl.so, which main.c opens when a session starts, so that other runs of the
 * program never open readline (its functions call back into the program).  An entry is
 * first compiled as an expression ("return " .. entry) and, if that fails, as a statement;
 * when either reading fails only because the input ended too early, the entry is
 * incomplete and the next line continues it under the secondary prompt.
 * The values an entry returns are shown through coldprep.pretty (strings as they are),
 * separated by tabs, or by newlines when one of them takes several lines.
 *
 * On a terminal, lines come from readline's callback interface driven by pselect, so that
 * SIGINT can be blocked everywhere except while waiting for a key: Ctrl-C at the prompt
 * then cancels the line (and a pending multi-line statement) without any race with
 * readline's own state.  While an entry runs, cpl_pcall turns Ctrl-C into an
 * "interrupted" error.  Ctrl-D on an empty line leaves.  When stdin is not a terminal,
 * lines are read plainly and no prompt or banner is written, so piped sessions give
 * clean output; errors there still do not end the session, but make the exit status 1.
 */
#include <errno.h>
#include <lauxlib.h>
#include <readline/history.h>
#include <readline/readline.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/select.h>
#include <time.h>
#include <unistd.h>

#include "cli.h"
#include "repl_int.h"
#include "coldprep/status.h"

static const char PROMPT[] = "coldprep> ";
static const char PROMPT2[] = "      ... ";
static const char FORMATTER_KEY[] = "coldprep.repl.format"; /* registry: pretty.format */

typedef enum { LINE_OK, LINE_EOF, LINE_INTERRUPTED } line_status;

typedef struct session {
    lua_State *L;
    int tty;
    sigset_t wait_mask; /* signal mask while waiting for a key: SIGINT open */
} session;

/* A growing text buffer for the entry being typed. */
typedef struct text {
    char *data;
    size_t len, cap;
} text;

static int text_append(text *t, const char *s, size_t n)
{
    if (t->len + n + 1 > t->cap) {
        size_t cap = t->cap ? t->cap : 256;
        while (cap < t->len + n + 1)
            cap *= 2;
        char *p = realloc(t->data, cap);
        if (p == NULL)
            return 0;
        t->data = p;
        t->cap = cap;
    }
    memcpy(t->data + t->len, s, n);
    t->len += n;
    t->data[t->len] = '\0';
    return 1;
}

/* ---- reading a line -------------------------------------------------------------- */

static volatile sig_atomic_t sigint_at_prompt;
static char *accepted_line;
static int line_finished;

static void on_prompt_sigint(int sig)
{
    (void)sig;
    sigint_at_prompt = 1;
}

static void on_line(char *line)
{
    accepted_line = line;
    line_finished = 1;
    rl_callback_handler_remove();
}

/* Ctrl-C at the prompt: drop what was typed, restore the terminal, go to a fresh line. */
static void cancel_line(void)
{
    rl_free_line_state();
    rl_callback_sigcleanup();
    rl_cleanup_after_signal();
    rl_callback_handler_remove();
    using_history();
    fputc('\n', rl_outstream);
    fflush(rl_outstream);
}

/* A Ctrl-C that came while SIGINT was blocked stays pending, and pselect does not
 * deliver it when input is ready at once (keys typed after it): take it here.  (A Ctrl-C
 * in the instant between this check and readline's read of a key that the terminal then
 * discards leaves readline waiting; the next key brings the cancellation.) */
static int take_pending_sigint(void)
{
    sigset_t pending, sigint;
    sigpending(&pending);
    if (!sigismember(&pending, SIGINT))
        return 0;
    sigemptyset(&sigint);
    sigaddset(&sigint, SIGINT);
    struct timespec now = {0, 0};
    sigtimedwait(&sigint, NULL, &now);
    return 1;
}

static line_status read_tty(session *s, const char *prompt, char **line)
{
    int fd = fileno(rl_instream);
    line_finished = 0;
    accepted_line = NULL;
    rl_callback_handler_install(prompt, on_line);
    while (!line_finished) {
        fd_set in;
        FD_ZERO(&in);
        FD_SET(fd, &in);
        int ready = pselect(fd + 1, &in, NULL, NULL, NULL, &s->wait_mask);
        if (ready < 0 && errno != EINTR) {
            rl_callback_handler_remove();
            return LINE_EOF;
        }
        if (sigint_at_prompt || take_pending_sigint()) {
            sigint_at_prompt = 0;
            cancel_line();
            return LINE_INTERRUPTED;
        }
        if (ready < 0) {
            rl_check_signals(); /* e.g. a window resize caught by readline */
            continue;
        }
        rl_callback_read_char();
    }
    *line = accepted_line;
    return accepted_line ? LINE_OK : LINE_EOF;
}

static line_status read_plain(char **line)
{
    size_t cap = 0;
    *line = NULL;
    ssize_t n = getline(line, &cap, stdin);
    if (n < 0) {
        free(*line);
        *line = NULL;
        return LINE_EOF;
    }
    while (n > 0 && ((*line)[n - 1] == '\n' || (*line)[n - 1] == '\r'))
        (*line)[--n] = '\0';
    return LINE_OK;
}

/* ---- compiling and running an entry ---------------------------------------------- */

/* Whether the load error message on top says the input ended too early. */
static int at_eof(lua_State *L, int status)
{
    if (status != LUA_ERRSYNTAX)
        return 0;
    size_t len;
    const char *msg = lua_tolstring(L, -1, &len);
    static const char *const marks[] = {"<eof>", "'<eof>'"}; /* the second: long strings */
    for (int i = 0; i < 2; i++) {
        size_t ml = strlen(marks[i]);
        if (msg && len >= ml && strcmp(msg + len - ml, marks[i]) == 0)
            return 1;
    }
    return 0;
}

/* Compiles the entry as an expression ("return " .. entry), else as a statement, and
 * leaves the chunk or an error message on the stack.  *more is set when either reading is
 * unfinished (a syntax error at the end of the input): `{`, `f(1,` and `for i = 1, 2 do`
 * all continue on the next line.  The message kept is the statement's, unless only the
 * expression reading was unfinished. */
static int compile(lua_State *L, const text *entry, int *more)
{
    static const char EXPR_PREFIX[] = "return ";
    text expr = {0};
    int expr_more = 0;
    if (text_append(&expr, EXPR_PREFIX, sizeof EXPR_PREFIX - 1) &&
        text_append(&expr, entry->data, entry->len)) {
        int status = luaL_loadbuffer(L, expr.data, expr.len, "=stdin");
        free(expr.data);
        if (status == LUA_OK) {
            *more = 0;
            return status;
        }
        expr_more = at_eof(L, status);
    } else {
        free(expr.data);
        lua_pushliteral(L, "");
    }
    int status = luaL_loadbuffer(L, entry->data, entry->len, "=stdin");
    int stmt_more = at_eof(L, status);
    *more = status != LUA_OK && (expr_more || stmt_more);
    lua_remove(L, status != LUA_OK && expr_more && !stmt_more ? -1 : -2);
    return status;
}

/* Protected: writes its arguments, each through the formatter (strings as they are). */
static int show_values(lua_State *L)
{
    int n = lua_gettop(L);
    int multiline = 0;
    lua_getfield(L, LUA_REGISTRYINDEX, FORMATTER_KEY);
    for (int i = 1; i <= n; i++) {
        if (lua_type(L, i) == LUA_TSTRING || lua_type(L, -1) != LUA_TFUNCTION) {
            luaL_tolstring(L, i, NULL);
        } else {
            lua_pushvalue(L, n + 1);
            lua_pushvalue(L, i);
            lua_call(L, 1, 1);
        }
        lua_replace(L, i);
        if (strchr(lua_tostring(L, i), '\n'))
            multiline = 1;
    }
    for (int i = 1; i <= n; i++) {
        size_t len;
        const char *s = lua_tolstring(L, i, &len);
        fwrite(s, 1, len, stdout);
        fputc(i < n ? (multiline ? '\n' : '\t') : '\n', stdout);
    }
    return 0;
}

/* Remember coldprep.pretty's format function for show_values; without it values are
 * shown with tostring. */
static int load_formatter(lua_State *L)
{
    lua_getglobal(L, "require");
    lua_pushliteral(L, "coldprep.pretty");
    lua_call(L, 1, 1);
    lua_getfield(L, -1, "format");
    lua_setfield(L, LUA_REGISTRYINDEX, FORMATTER_KEY);
    return 0;
}

/* Runs the chunk compiled with `status` on top of the stack and shows its values; returns
 * whether all went well. */
static int run_entry(lua_State *L, int status)
{
    int base = lua_gettop(L) - 1;
    if (status == LUA_OK)
        status = cpl_pcall(L, 0, LUA_MULTRET);
    if (status == LUA_OK && lua_gettop(L) > base) {
        lua_pushcfunction(L, show_values);
        lua_insert(L, base + 1);
        status = cpl_pcall(L, lua_gettop(L) - base - 1, 0);
    }
    if (status != LUA_OK)
        cpl_report(L, NULL);
    lua_settop(L, base);
    fflush(stdout);
    return status == LUA_OK;
}

/* ---- the loop -------------------------------------------------------------------- */

static line_status read_line(session *s, const char *prompt, char **line)
{
    return s->tty ? read_tty(s, prompt, line) : read_plain(line);
}

/* Reads and runs entries until end of input; returns whether all succeeded. */
static int loop(session *s)
{
    lua_State *L = s->L;
    int all_ok = 1;
    text entry = {0};
    for (;;) {
        char *line;
        line_status ls = read_line(s, entry.len ? PROMPT2 : PROMPT, &line);
        if (ls == LINE_INTERRUPTED) {
            entry.len = 0;
            continue;
        }
        if (ls == LINE_EOF) {
            int more;
            if (entry.len) { /* input ended inside an entry: say what is missing */
                if (compile(L, &entry, &more) != LUA_OK) {
                    cpl_report(L, NULL);
                    all_ok = 0;
                } else {
                    lua_pop(L, 1);
                }
            }
            break;
        }
        int ok = (entry.len == 0 || text_append(&entry, "\n", 1)) &&
                 text_append(&entry, line, strlen(line));
        free(line);
        if (!ok) {
            fputs("coldprep: out of memory; entry dropped\n", stderr);
            entry.len = 0;
            all_ok = 0;
            continue;
        }
        int more;
        int status = compile(L, &entry, &more);
        if (more) {
            lua_pop(L, 1);
            continue;
        }
        if (s->tty)
            cpl_history_add(entry.data);
        if (!run_entry(L, status))
            all_ok = 0;
        entry.len = 0;
    }
    free(entry.data);
    return all_ok;
}

static void start_tty(session *s)
{
    rl_readline_name = "coldprep"; /* for $if coldprep in ~/.inputrc */
    rl_catch_signals = 0;          /* SIGINT is ours (see the top of this file) */
    rl_change_environment = 0;     /* leave LINES and COLUMNS alone */
    rl_instream = stdin;
    rl_outstream = isatty(1) ? stdout : stderr;
    cpl_complete_install(s->L);
    cpl_history_open();

    struct sigaction sa = {0};
    sa.sa_handler = on_prompt_sigint;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, NULL);
    sigset_t sigint;
    sigemptyset(&sigint);
    sigaddset(&sigint, SIGINT);
    sigprocmask(SIG_BLOCK, &sigint, &s->wait_mask);
    sigdelset(&s->wait_mask, SIGINT);

    fprintf(rl_outstream, "coldprep %s: help() lists the library, Tab completes, Ctrl-D leaves\n",
            cp_version());
}

static void stop_tty(void)
{
    fputc('\n', rl_outstream);
    cpl_history_close();
    sigset_t sigint;
    sigemptyset(&sigint);
    sigaddset(&sigint, SIGINT);
    sigprocmask(SIG_UNBLOCK, &sigint, NULL);
    signal(SIGINT, SIG_DFL);
}

int cpl_repl(lua_State *L)
{
    session s = {.L = L, .tty = isatty(0)};
    lua_pushcfunction(L, load_formatter);
    if (lua_pcall(L, 0, 0, 0) != LUA_OK)
        cpl_report(L, "coldprep: results will be shown with tostring");
    if (s.tty)
        start_tty(&s);
    int all_ok = loop(&s);
    if (s.tty)
        stop_tty();
    return all_ok || s.tty ? CPL_EXIT_OK : CPL_EXIT_ERROR;
}
