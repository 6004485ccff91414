/*
 * coldprep — name matching for "did you mean ...?" messages: one edit distance for the
 * species lookup, the argument readers of the bindings and the Lua library.
 */
#ifndef COLDPREP_NAMES_H
#define COLDPREP_NAMES_H

#include <stddef.h>

/* Longest name (bytes, without the terminating NUL) cp_edit_distance compares. */
#define CP_NAME_MAX_LEN 63

/* Levenshtein distance between s and t (insertions, deletions and substitutions of single
 * bytes, each costing 1; Levenshtein, Sov. Phys. Dokl. 10, 707 (1966)), computed with one
 * row of the Wagner–Fischer table.  Returns (size_t)-1 when either string is NULL or longer
 * than CP_NAME_MAX_LEN bytes.  Pure function: no allocation, thread-safe. */
size_t cp_edit_distance(const char *s, const char *t);

/* The entry of names[0..n-1] closest to key by cp_edit_distance (the first of equals), if
 * it is close enough to be a likely misspelling: at most a third of key's length (in
 * bytes, rounded up) edits away, so 1 edit always is and a swap of two letters (2 edits)
 * is from 4 bytes on.  NULL when none is
 * (a name that matches nothing gets no far-off suggestion), when n is 0 or when no entry
 * is comparable.  The pointer returned is one of names. */
const char *cp_closest_name(const char *key, const char *const names[], size_t n);

#endif
