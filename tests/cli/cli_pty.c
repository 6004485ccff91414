/*
 * cli_pty: runs a program on a pseudo-terminal and plays a script against it, so the
 * REPL's terminal behaviour (readline, Tab completion, Ctrl-C, history) can be tested
 * through a real process without expect or python.
 *
 *   usage: cli_pty [-t SECONDS] -- PROGRAM [ARGS...] < SCRIPT
 *
 * Script lines (TEXT may use the escapes \n \r \t \e \\ \xHH):
 *   send TEXT     write TEXT to the terminal, as if typed
 *   expect TEXT   wait until TEXT appears in the output after the previous match
 *   within MS TEXT  expect TEXT, failing unless it appears within MS milliseconds of the
 *                 last send (how fast the program reacts to a key, e.g. Ctrl-C)
 *   sleep MS      wait MS milliseconds (reading output meanwhile)
 *   exit CODE     wait for the program to end; it must exit normally with status CODE
 *   # ...         a comment; empty lines are ignored
 * Each expect and exit waits at most the timeout (-t, default 15 s).  Exit status 0 when
 * every step passed; otherwise 1, with the failing step and the transcript on stderr.
 */
#define _XOPEN_SOURCE 700
#include <errno.h>
#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/ioctl.h>
#include <sys/wait.h>
#include <termios.h>
#include <time.h>
#include <unistd.h>

static int master = -1;
static pid_t child = -1;
static char *out;                /* everything the program wrote */
static size_t out_len, out_cap;  /* ... */
static size_t matched;           /* expect searches from here */
static int out_closed;           /* the program closed the terminal */
static double timeout_s = 15.0;

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static void dump_transcript(void)
{
    fputs("---- terminal output ----\n", stderr);
    for (size_t i = 0; i < out_len; i++) {
        unsigned char c = (unsigned char)out[i];
        if (c == '\n' || (c >= 32 && c < 127))
            fputc(c, stderr);
        else if (c != '\r')
            fprintf(stderr, "\\x%02x", c);
    }
    fputs("\n---- end ----\n", stderr);
}

static void fail(int lineno, const char *what)
{
    fprintf(stderr, "cli_pty: script line %d: %s\n", lineno, what);
    dump_transcript();
    if (child > 0)
        kill(child, SIGKILL);
    exit(1);
}

/* Read what the program wrote, waiting at most wait_ms; returns 0 once it closed. */
static int pump(int wait_ms)
{
    if (out_closed)
        return 0;
    struct pollfd p = {.fd = master, .events = POLLIN};
    int r = poll(&p, 1, wait_ms);
    if (r <= 0)
        return 1;
    if (out_len + 4096 > out_cap) {
        out_cap = out_cap ? 2 * out_cap : 65536;
        out = realloc(out, out_cap);
        if (out == NULL) {
            perror("cli_pty");
            exit(1);
        }
    }
    ssize_t n = read(master, out + out_len, 4096);
    if (n > 0)
        out_len += (size_t)n;
    else if (n == 0 || errno != EINTR)
        out_closed = 1; /* EIO: the last holder of the terminal's other side has gone */
    return !out_closed;
}

/* Decode the escapes of TEXT in place; returns its length. */
static size_t unescape(char *s)
{
    char *w = s;
    for (char *r = s; *r; r++) {
        if (*r != '\\' || r[1] == '\0') {
            *w++ = *r;
            continue;
        }
        r++;
        switch (*r) {
        case 'n': *w++ = '\n'; break;
        case 'r': *w++ = '\r'; break;
        case 't': *w++ = '\t'; break;
        case 'e': *w++ = '\033'; break;
        case 'x': {
            char hex[3] = {r[1], r[1] ? r[2] : '\0', '\0'};
            *w++ = (char)strtol(hex, NULL, 16);
            r += 2;
            break;
        }
        default: *w++ = *r; break;
        }
    }
    *w = '\0';
    return (size_t)(w - s);
}

static void start(char **argv)
{
    master = posix_openpt(O_RDWR | O_NOCTTY);
    if (master < 0 || grantpt(master) != 0 || unlockpt(master) != 0) {
        perror("cli_pty: posix_openpt");
        exit(1);
    }
    const char *slave_name = ptsname(master);
    struct winsize ws = {.ws_row = 24, .ws_col = 80};
    child = fork();
    if (child < 0) {
        perror("cli_pty: fork");
        exit(1);
    }
    if (child == 0) {
        setsid(); /* a new session whose controlling terminal is the pty */
        int slave = open(slave_name, O_RDWR);
        if (slave < 0)
            _exit(127);
        ioctl(slave, TIOCSCTTY, 0);
        ioctl(slave, TIOCSWINSZ, &ws);
        dup2(slave, 0);
        dup2(slave, 1);
        dup2(slave, 2);
        if (slave > 2)
            close(slave);
        close(master);
        execvp(argv[0], argv);
        _exit(127);
    }
}

static void wait_exit(int lineno, int want)
{
    double deadline = now() + timeout_s;
    int status;
    for (;;) {
        pid_t r = waitpid(child, &status, WNOHANG);
        if (r == child)
            break;
        if (now() > deadline)
            fail(lineno, "the program did not exit within the timeout");
        if (!pump(50))
            poll(NULL, 0, 10);
    }
    child = -1;
    while (pump(0))
        ;
    char msg[80];
    if (WIFSIGNALED(status)) {
        snprintf(msg, sizeof msg, "the program was killed by signal %d", WTERMSIG(status));
        fail(lineno, msg);
    }
    if (WEXITSTATUS(status) != want) {
        snprintf(msg, sizeof msg, "the program exited with status %d, want %d",
                 WEXITSTATUS(status), want);
        fail(lineno, msg);
    }
}

static double last_send; /* when the last send was written, s */

static void expect(int lineno, const char *pattern, size_t len, double deadline)
{
    for (;;) {
        for (size_t i = matched; i + len <= out_len; i++) {
            if (memcmp(out + i, pattern, len) == 0) {
                matched = i + len;
                return;
            }
        }
        char msg[600];
        double left = deadline - now();
        if (out_closed || left <= 0) {
            snprintf(msg, sizeof msg, "%s \"%.500s\"",
                     out_closed ? "the program closed the terminal before" : "timed out waiting for",
                     pattern);
            fail(lineno, msg);
        }
        pump((int)(left * 1000) + 1);
    }
}

int main(int argc, char **argv)
{
    int first = 1;
    if (first + 1 < argc && strcmp(argv[first], "-t") == 0) {
        timeout_s = atof(argv[first + 1]);
        first += 2;
    }
    if (first < argc && strcmp(argv[first], "--") == 0)
        first++;
    if (first >= argc) {
        fputs("usage: cli_pty [-t SECONDS] -- PROGRAM [ARGS...] < SCRIPT\n", stderr);
        return 2;
    }
    start(argv + first);

    char line[4096];
    int lineno = 0;
    while (fgets(line, sizeof line, stdin)) {
        lineno++;
        line[strcspn(line, "\n")] = '\0';
        char *arg = strchr(line, ' ');
        if (arg)
            *arg++ = '\0';
        else
            arg = line + strlen(line);
        if (line[0] == '\0' || line[0] == '#') {
            continue;
        } else if (strcmp(line, "send") == 0) {
            size_t len = unescape(arg);
            for (size_t done = 0; done < len;) {
                ssize_t n = write(master, arg + done, len - done);
                if (n < 0 && errno != EINTR)
                    fail(lineno, "cannot write to the terminal");
                if (n > 0)
                    done += (size_t)n;
            }
            last_send = now();
            pump(0);
        } else if (strcmp(line, "expect") == 0) {
            size_t len = unescape(arg);
            expect(lineno, arg, len, now() + timeout_s);
        } else if (strcmp(line, "within") == 0) {
            char *text = strchr(arg, ' ');
            if (text == NULL)
                fail(lineno, "within needs MS and TEXT");
            *text++ = '\0';
            size_t len = unescape(text);
            expect(lineno, text, len, last_send + atof(arg) / 1000.0);
        } else if (strcmp(line, "sleep") == 0) {
            double until = now() + atof(arg) / 1000.0;
            while (now() < until)
                if (!pump((int)((until - now()) * 1000) + 1))
                    poll(NULL, 0, 10);
        } else if (strcmp(line, "exit") == 0) {
            wait_exit(lineno, atoi(arg));
        } else {
            fail(lineno, "unknown command (send, expect, within, sleep, exit)");
        }
    }
    if (child > 0) { /* the script did not wait for the end: stop the program */
        kill(child, SIGKILL);
        waitpid(child, NULL, 0);
    }
    free(out);
    return 0;
}
