/*
 * Tests of the name matching (include/coldprep/names.h) against the textbook values of the
 * Levenshtein distance and against its recursive definition written out here.
 */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <string.h>

#include <cmocka.h>

#include "coldprep/names.h"

/* The recursive definition (Levenshtein, Sov. Phys. Dokl. 10, 707 (1966)): d(s, t) is the
 * least of deleting, inserting or substituting the first byte; exponential, short inputs
 * only.  An independent method, not the one-row table of the library. */
static size_t by_definition(const char *s, const char *t)
{
    if (!*s)
        return strlen(t);
    if (!*t)
        return strlen(s);
    size_t sub = by_definition(s + 1, t + 1) + (*s != *t);
    size_t del = by_definition(s + 1, t) + 1;
    size_t ins = by_definition(s, t + 1) + 1;
    size_t best = sub < del ? sub : del;
    return best < ins ? best : ins;
}

/* NAMES-1: the worked examples of Wagner & Fischer, J. ACM 21, 168 (1974) style tables, as
 * found in every textbook: kitten -> sitting 3, flaw -> lawn 2, empty string -> length. */
static void textbook_values(void **state)
{
    (void)state;
    assert_int_equal(cp_edit_distance("kitten", "sitting"), 3);
    assert_int_equal(cp_edit_distance("flaw", "lawn"), 2);
    assert_int_equal(cp_edit_distance("", "abc"), 3);
    assert_int_equal(cp_edit_distance("duraton", "duration"), 1);
    assert_int_equal(cp_edit_distance("same", "same"), 0);
}

/* NAMES-2: the table method equals the recursive definition on all pairs of a small set. */
static void agrees_with_definition(void **state)
{
    (void)state;
    static const char *const words[] = {"", "a", "ab", "ba", "KRb", "K40Rb87", "40K87Rb",
                                        "NaK", "23Na40K", "temp", "temperature"};
    size_t n = sizeof words / sizeof words[0];
    for (size_t i = 0; i < n; i++)
        for (size_t j = 0; j < n; j++)
            assert_int_equal(cp_edit_distance(words[i], words[j]),
                             by_definition(words[i], words[j]));
}

/* NAMES-3: closest name, ties to the first; too long or NULL inputs are not comparable. */
static void closest_and_limits(void **state)
{
    (void)state;
    static const char *const known[] = {"duration", "lifetime", "label"};
    assert_string_equal(cp_closest_name("duraton", known, 3), "duration");
    assert_string_equal(cp_closest_name("labl", known, 3), "label");
    assert_null(cp_closest_name("x", known, 0));
    char long_name[CP_NAME_MAX_LEN + 2];
    memset(long_name, 'a', sizeof long_name - 1);
    long_name[sizeof long_name - 1] = '\0';
    assert_true(cp_edit_distance(long_name, "a") == (size_t)-1);
    assert_true(cp_edit_distance(NULL, "a") == (size_t)-1);
    long_name[CP_NAME_MAX_LEN] = '\0'; /* exactly the longest name compared */
    assert_int_equal(cp_edit_distance(long_name, ""), CP_NAME_MAX_LEN);
}

/* NAMES-4: the cut-off (names.h): a name is suggested only when it is at most a third of
 * the key's length (rounded up) edits away; the distances at the boundary are checked
 * against the recursive definition above, so the cut-off is what is tested. */
static void closest_cutoff(void **state)
{
    (void)state;
    static const char *const two_away[] = {"abcdXY"}, *const three_away[] = {"abcXYZ"};
    assert_int_equal(by_definition("abcdef", two_away[0]), 2);
    assert_int_equal(by_definition("abcdef", three_away[0]), 3);
    assert_string_equal(cp_closest_name("abcdef", two_away, 1), "abcdXY"); /* 2 <= 6/3 */
    assert_null(cp_closest_name("abcdef", three_away, 1));                 /* 3 > 6/3 */
    static const char *const y[] = {"y"}, *const xyz[] = {"xyz"};
    assert_string_equal(cp_closest_name("x", y, 1), "y"); /* 1 edit: always close */
    assert_null(cp_closest_name("x", xyz, 1));             /* 2 > 1/3 rounded up */
    static const char *const width[] = {"width"}, *const w7[] = {"abcdXYZ"};
    assert_int_equal(by_definition("widht", width[0]), 2);  /* a swap is 2 edits */
    assert_string_equal(cp_closest_name("widht", width, 1), "width"); /* 2 <= 5/3 up */
    assert_int_equal(by_definition("abcdefg", w7[0]), 3);
    assert_string_equal(cp_closest_name("abcdefg", w7, 1), "abcdXYZ"); /* 3 <= 7/3 up */
    static const char *const known[] = {"duration", "lifetime", "label"};
    assert_null(cp_closest_name("zzzzzz", known, 3));    /* matches nothing */
    static const char *const temperature[] = {"temperature"};
    assert_null(cp_closest_name("temp", temperature, 1)); /* 7 edits for 4 bytes */
    /* the nearest within reach wins over a farther one that is also within reach */
    static const char *const both[] = {"t_over_tc", "t_over_tf"};
    assert_string_equal(cp_closest_name("t_over_tff", both, 2), "t_over_tf");
    assert_null(cp_closest_name(NULL, known, 3));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(textbook_values),
        cmocka_unit_test(agrees_with_definition),
        cmocka_unit_test(closest_and_limits),
        cmocka_unit_test(closest_cutoff),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
