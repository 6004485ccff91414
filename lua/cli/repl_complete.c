/*
 * Tab completion for the REPL.  The word before the cursor is split at its last '.' or
 * ':' into a path and a prefix: the path (`cp.species`) is resolved from the globals one
 * field at a time, reading raw fields and following __index tables, so completing runs no
 * Lua code except the __load of a library module loaded on first use (cp.plot, ...: see
 * lua/coldprep/library.lua), which requires it; the candidates are the identifier keys of
 * the value (and of its __index tables) that start with the prefix — only functions after
 * ':'.  A word without a path
 * completes global names and keywords.  Inside a string readline completes file names.
 * The listing shown on a double Tab gives the field names without the repeated path.
 */
#include <lauxlib.h>
#include <readline/readline.h>
#include <stdlib.h>
#include <string.h>

#include "repl_int.h"

enum { MAX_INDEX_HOPS = 16 }; /* bounds a chain (or loop) of __index tables */

static lua_State *complete_state;
static char **candidates;
static size_t candidate_count, next_candidate;

static const char *const KEYWORDS[] = {
    "and",    "break", "do",   "else", "elseif", "end",   "false", "for",  "function",
    "goto",   "if",    "in",   "local", "nil",   "not",   "or",    "repeat", "return",
    "then",   "true",  "until", "while", NULL,
};

static int is_identifier(const char *s, size_t len)
{
    if (len == 0 || !(s[0] == '_' || ((s[0] | 32) >= 'a' && (s[0] | 32) <= 'z')))
        return 0;
    for (size_t i = 1; i < len; i++) {
        char c = s[i];
        if (!(c == '_' || (c >= '0' && c <= '9') || ((c | 32) >= 'a' && (c | 32) <= 'z')))
            return 0;
    }
    return 1;
}

/* The library's plumbing rather than its interface, left out of the candidates as help()
 * leaves it out of its listing: cp.set_help, cp.get_help and cp.species.builtin_*. */
static int is_internal(const char *key, size_t len)
{
    static const char builtin[] = "builtin_";
    size_t nb = sizeof builtin - 1;
    return (len >= nb && memcmp(key, builtin, nb) == 0) ||
           (len == 8 && (memcmp(key, "set_help", 8) == 0 || memcmp(key, "get_help", 8) == 0));
}

/* Replace the table to search (top of stack) by its metatable's __index if that is a
 * table; returns 0 (popping it) when there is none. */
static int next_index_table(lua_State *L)
{
    if (!lua_getmetatable(L, -1)) {
        lua_pop(L, 1);
        return 0;
    }
    lua_pushliteral(L, "__index");
    lua_rawget(L, -2);
    lua_remove(L, -2);
    lua_remove(L, -2);
    if (lua_type(L, -1) != LUA_TTABLE) {
        lua_pop(L, 1);
        return 0;
    }
    return 1;
}

/* If the table on top is a module placeholder (a metatable with a __load function), replace
 * it by the module its __load returns (an error propagates to the protected caller). */
static void load_placeholder(lua_State *L)
{
    if (lua_type(L, -1) != LUA_TTABLE || !lua_getmetatable(L, -1))
        return;
    lua_pushliteral(L, "__load");
    if (lua_rawget(L, -2) != LUA_TFUNCTION) {
        lua_pop(L, 2);
        return;
    }
    lua_remove(L, -2);
    lua_call(L, 0, 1);
    lua_remove(L, -2);
}

/* Replace the value on top by its field `name` (raw, then through __index tables);
 * returns 0 (popping it) if the field is nil. */
static int lookup(lua_State *L, const char *name, size_t len)
{
    for (int hop = 0; hop < MAX_INDEX_HOPS; hop++) {
        if (lua_type(L, -1) == LUA_TTABLE) {
            lua_pushlstring(L, name, len);
            if (lua_rawget(L, -2) != LUA_TNIL) {
                lua_remove(L, -2);
                load_placeholder(L);
                return 1;
            }
            lua_pop(L, 1);
        }
        if (!next_index_table(L))
            return 0;
    }
    lua_pop(L, 1);
    return 0;
}

/* Append to the list at index `out` base..key for every identifier key of the value on
 * top (and its __index tables) starting with `prefix`; pops the value. */
static void add_fields(lua_State *L, int out, const char *base, size_t base_len,
                       const char *prefix, int only_functions)
{
    size_t prefix_len = strlen(prefix);
    for (int hop = 0; hop < MAX_INDEX_HOPS; hop++) {
        if (lua_type(L, -1) == LUA_TTABLE) {
            lua_pushnil(L);
            while (lua_next(L, -2)) {
                size_t klen;
                /* check the type first: lua_tolstring would turn a number key into a
                 * string and confuse lua_next */
                const char *key = lua_type(L, -2) == LUA_TSTRING ? lua_tolstring(L, -2, &klen)
                                                                : NULL;
                if (key && klen >= prefix_len && memcmp(key, prefix, prefix_len) == 0 &&
                    is_identifier(key, klen) && !is_internal(key, klen) &&
                    (!only_functions || lua_type(L, -1) == LUA_TFUNCTION)) {
                    lua_pushlstring(L, base, base_len);
                    lua_pushvalue(L, -3);
                    lua_concat(L, 2);
                    lua_rawseti(L, out, (lua_Integer)lua_rawlen(L, out) + 1);
                }
                lua_pop(L, 1);
            }
        }
        if (!next_index_table(L))
            return;
    }
    lua_pop(L, 1);
}

/* Protected: argument 1 is the word (a light userdata pointing to a C string); returns a
 * list of the full candidate words. */
static int collect(lua_State *L)
{
    const char *word = lua_touserdata(L, 1);
    lua_newtable(L);
    int out = lua_gettop(L);
    const char *sep = NULL;
    for (const char *p = word; *p; p++)
        if (*p == '.' || *p == ':')
            sep = p;

    lua_pushglobaltable(L);
    if (sep == NULL) {
        add_fields(L, out, "", 0, word, 0);
        size_t len = strlen(word);
        for (const char *const *k = KEYWORDS; *k; k++) {
            if (strncmp(*k, word, len) == 0) {
                lua_pushstring(L, *k);
                lua_rawseti(L, out, (lua_Integer)lua_rawlen(L, out) + 1);
            }
        }
        return 1;
    }
    if (sep == word) /* ".x" after a call or a string: nothing known to complete */
        return 1;
    for (const char *seg = word; seg < sep;) { /* walk the path a.b.c before sep */
        const char *end = seg;
        while (end < sep && *end != '.' && *end != ':')
            end++;
        if (*end == ':' && end != sep) /* a method call cannot be followed by a field */
            return 1;
        if (!is_identifier(seg, (size_t)(end - seg)) || !lookup(L, seg, (size_t)(end - seg)))
            return 1;
        seg = end + 1;
    }
    add_fields(L, out, word, (size_t)(sep - word) + 1, sep + 1, *sep == ':');
    return 1;
}

static void free_candidates(void)
{
    for (size_t i = 0; i < candidate_count; i++)
        free(candidates[i]);
    free(candidates);
    candidates = NULL;
    candidate_count = next_candidate = 0;
}

static char *generate(const char *text, int state)
{
    (void)text; /* candidates were already filtered by collect */
    if (state == 0)
        next_candidate = 0;
    if (next_candidate >= candidate_count)
        return NULL;
    return strdup(candidates[next_candidate++]);
}

static char **complete(const char *text, int start, int end)
{
    (void)end;
    rl_completion_append_character = '\0';
    rl_completion_suppress_append = 1;
    if (start > 0 && (rl_line_buffer[start - 1] == '"' || rl_line_buffer[start - 1] == '\'')) {
        rl_attempted_completion_over = 0; /* inside a string: let readline offer files */
        return NULL;
    }
    rl_attempted_completion_over = 1;

    lua_State *L = complete_state;
    int top = lua_gettop(L);
    free_candidates();
    lua_pushcfunction(L, collect);
    lua_pushlightuserdata(L, (void *)text);
    if (lua_pcall(L, 1, 1, 0) == LUA_OK) {
        size_t n = lua_rawlen(L, -1);
        candidates = n ? calloc(n, sizeof *candidates) : NULL;
        for (size_t i = 0; candidates && i < n; i++) {
            lua_rawgeti(L, -1, (lua_Integer)i + 1);
            candidates[i] = strdup(lua_tostring(L, -1));
            lua_pop(L, 1);
            if (candidates[i] == NULL)
                break;
            candidate_count = i + 1;
        }
    }
    lua_settop(L, top);
    return candidate_count ? rl_completion_matches(text, generate) : NULL;
}

/* List the matches by their last component: `atom  list  molecule`, not the full paths. */
static void display_matches(char **matches, int count, int max_length)
{
    const char *last = matches[1];
    size_t strip = 0;
    for (const char *p = last; *p; p++)
        if (*p == '.' || *p == ':')
            strip = (size_t)(p - last) + 1;
    char **shown = malloc(((size_t)count + 2) * sizeof *shown);
    if (shown == NULL)
        return;
    shown[0] = matches[0];
    for (int i = 1; i <= count; i++)
        shown[i] = matches[i] + (strlen(matches[i]) >= strip ? strip : 0);
    shown[count + 1] = NULL;
    rl_display_match_list(shown, count, max_length - (int)strip);
    rl_forced_update_display();
    free(shown);
}

void cpl_complete_install(lua_State *L)
{
    complete_state = L;
    rl_basic_word_break_characters = " \t\n\"'`@$><=;|&{}()[],+-*/%^~#";
    rl_attempted_completion_function = complete;
    rl_completion_display_matches_hook = display_matches;
}
