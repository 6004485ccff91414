/*
 * Name matching for "did you mean ...?" messages: the Levenshtein distance and the
 * closest of a list of names (contracts in include/coldprep/names.h).
 */
#include "coldprep/names.h"

#include <string.h>

size_t cp_edit_distance(const char *s, const char *t)
{
    if (!s || !t)
        return (size_t)-1;
    size_t ls = strlen(s), lt = strlen(t);
    if (ls > CP_NAME_MAX_LEN || lt > CP_NAME_MAX_LEN)
        return (size_t)-1;
    size_t row[CP_NAME_MAX_LEN + 1]; /* row[j]: distance of s[0..i) to t[0..j) */
    for (size_t j = 0; j <= lt; j++)
        row[j] = j;
    for (size_t i = 1; i <= ls; i++) {
        size_t diag = row[0];
        row[0] = i;
        for (size_t j = 1; j <= lt; j++) {
            size_t up = row[j];
            size_t best = diag + (s[i - 1] != t[j - 1]);
            if (up + 1 < best)
                best = up + 1;
            if (row[j - 1] + 1 < best)
                best = row[j - 1] + 1;
            row[j] = best;
            diag = up;
        }
    }
    return row[lt];
}

const char *cp_closest_name(const char *key, const char *const names[], size_t n)
{
    const char *best = NULL;
    size_t best_d = (size_t)-1;
    if (!key)
        return NULL;
    size_t cutoff = (strlen(key) + 2) / 3; /* a third, rounded up: see names.h */
    for (size_t i = 0; i < n; i++) {
        size_t d = cp_edit_distance(key, names[i]);
        if (d <= cutoff && d < best_d) {
            best_d = d;
            best = names[i];
        }
    }
    return best;
}
