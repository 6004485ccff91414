/*
 * Species lookup by name and the facts derived from the tables (mass, statistics).
 *
 * Names are matched case-insensitively after dropping '-', '_' and spaces, against the
 * forms users write: "87Rb" or "Rb87" for atoms; "40K87Rb", "K40Rb87", "KRb" (and the
 * atoms in either order) for molecules.  An unknown name yields CP_ENOTFOUND with the
 * closest known names (Levenshtein distance) in the message.
 */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/names.h"
#include "species_int.h"

enum { NAME_MAX_LEN = 64, MAX_FORMS = 6 };

/* Lower-case s into out, dropping separators; returns 0 if it does not fit. */
static int normalise(const char *s, char out[NAME_MAX_LEN])
{
    size_t n = 0;
    for (; *s; s++) {
        if (*s == '-' || *s == '_' || *s == ' ')
            continue;
        if (n + 1 >= NAME_MAX_LEN)
            return 0;
        out[n++] = (char)tolower((unsigned char)*s);
    }
    out[n] = '\0';
    return 1;
}

static void atom_forms(const cp_atom *a, char forms[MAX_FORMS][NAME_MAX_LEN], int *count)
{
    char tmp[NAME_MAX_LEN];
    snprintf(tmp, sizeof tmp, "%d%s", a->mass_number, a->symbol);
    normalise(tmp, forms[0]);
    snprintf(tmp, sizeof tmp, "%s%d", a->symbol, a->mass_number);
    normalise(tmp, forms[1]);
    *count = 2;
}

static void molecule_forms(const cp_molecule *m, char forms[MAX_FORMS][NAME_MAX_LEN], int *count)
{
    const cp_atom *a = NULL, *b = NULL;
    *count = 0;
    if (cp_molecule_atoms(m, &a, &b, NULL) != CP_OK)
        return;
    const cp_atom *order[2][2] = {{a, b}, {b, a}};
    char tmp[NAME_MAX_LEN];
    for (int k = 0; k < 2; k++) {
        const cp_atom *x = order[k][0], *y = order[k][1];
        snprintf(tmp, sizeof tmp, "%d%s%d%s", x->mass_number, x->symbol, y->mass_number,
                 y->symbol);
        normalise(tmp, forms[(*count)++]);
        snprintf(tmp, sizeof tmp, "%s%d%s%d", x->symbol, x->mass_number, y->symbol,
                 y->mass_number);
        normalise(tmp, forms[(*count)++]);
        snprintf(tmp, sizeof tmp, "%s%s", x->symbol, y->symbol);
        normalise(tmp, forms[(*count)++]);
    }
}

static const cp_atom *find_atom(const char *key)
{
    for (size_t i = 0; i < cp_atom_table_size; i++) {
        char forms[MAX_FORMS][NAME_MAX_LEN];
        int n;
        atom_forms(&cp_atom_table[i], forms, &n);
        for (int k = 0; k < n; k++)
            if (strcmp(forms[k], key) == 0)
                return &cp_atom_table[i];
    }
    return NULL;
}

static const cp_molecule *find_molecule(const char *key)
{
    for (size_t i = 0; i < cp_molecule_table_size; i++) {
        char forms[MAX_FORMS][NAME_MAX_LEN];
        int n;
        molecule_forms(&cp_molecule_table[i], forms, &n);
        for (int k = 0; k < n; k++)
            if (strcmp(forms[k], key) == 0)
                return &cp_molecule_table[i];
    }
    return NULL;
}

typedef struct candidate {
    const char *name;
    size_t distance;
} candidate;

static void consider(candidate *best, int count, const char *name, size_t d)
{
    for (int i = 0; i < count; i++) {
        if (best[i].name == NULL || d < best[i].distance) {
            for (int j = count - 1; j > i; j--)
                best[j] = best[j - 1];
            best[i].name = name;
            best[i].distance = d;
            return;
        }
    }
}

static size_t min_distance(const char *key, char forms[MAX_FORMS][NAME_MAX_LEN], int n)
{
    size_t d = (size_t)-1;
    for (int k = 0; k < n; k++) {
        size_t dk = cp_edit_distance(key, forms[k]);
        if (dk < d)
            d = dk;
    }
    return d;
}

void cp_species_suggest(const char *name, char *buf, size_t size, int count)
{
    enum { MAX_SUGGEST = 8 };
    candidate best[MAX_SUGGEST] = {{0}};
    char key[NAME_MAX_LEN];
    if (count > MAX_SUGGEST)
        count = MAX_SUGGEST;
    if (size == 0)
        return;
    buf[0] = '\0';
    if (count <= 0 || !name || !normalise(name, key))
        return;
    for (size_t i = 0; i < cp_atom_table_size; i++) {
        char forms[MAX_FORMS][NAME_MAX_LEN];
        int n;
        atom_forms(&cp_atom_table[i], forms, &n);
        consider(best, count, cp_atom_table[i].name, min_distance(key, forms, n));
    }
    for (size_t i = 0; i < cp_molecule_table_size; i++) {
        char forms[MAX_FORMS][NAME_MAX_LEN];
        int n;
        molecule_forms(&cp_molecule_table[i], forms, &n);
        consider(best, count, cp_molecule_table[i].name, min_distance(key, forms, n));
    }
    size_t used = 0;
    for (int i = 0; i < count && best[i].name; i++) {
        int w = snprintf(buf + used, size - used, "%s%s", i ? ", " : "", best[i].name);
        if (w < 0 || (size_t)w >= size - used)
            break;
        used += (size_t)w;
    }
}

static cp_status not_found(cp_error *err, const char *what, const char *name)
{
    char hint[160];
    cp_species_suggest(name, hint, sizeof hint, 4);
    return cp_fail(err, CP_ENOTFOUND, "species: unknown %s \"%s\"; closest known names: %s", what,
                   name, hint);
}

cp_status cp_species_atom(const char *name, const cp_atom **atom, cp_error *err)
{
    char key[NAME_MAX_LEN];
    *atom = NULL;
    if (!name || !normalise(name, key) || key[0] == '\0')
        return cp_fail(err, CP_EINVAL, "species: atom name is empty or longer than %d characters",
                       NAME_MAX_LEN - 1);
    *atom = find_atom(key);
    return *atom ? CP_OK : not_found(err, "atom", name);
}

cp_status cp_species_molecule(const char *name, const cp_molecule **molecule, cp_error *err)
{
    char key[NAME_MAX_LEN];
    *molecule = NULL;
    if (!name || !normalise(name, key) || key[0] == '\0')
        return cp_fail(err, CP_EINVAL,
                       "species: molecule name is empty or longer than %d characters",
                       NAME_MAX_LEN - 1);
    *molecule = find_molecule(key);
    return *molecule ? CP_OK : not_found(err, "molecule", name);
}

cp_status cp_species_resonance_count(const char *molecule, int *count, cp_error *err)
{
    const cp_molecule *m;
    *count = 0;
    CP_TRY(cp_species_molecule(molecule, &m, err));
    for (size_t i = 0; i < cp_resonance_table_size; i++)
        if (strcmp(cp_resonance_table[i].molecule, m->name) == 0)
            (*count)++;
    return CP_OK;
}

cp_status cp_species_resonance(const char *molecule, int index, const cp_resonance **resonance,
                               cp_error *err)
{
    const cp_molecule *m;
    *resonance = NULL;
    CP_TRY(cp_species_molecule(molecule, &m, err));
    int seen = 0;
    for (size_t i = 0; i < cp_resonance_table_size; i++) {
        if (strcmp(cp_resonance_table[i].molecule, m->name) != 0)
            continue;
        if (seen++ == index) {
            *resonance = &cp_resonance_table[i];
            return CP_OK;
        }
    }
    if (seen == 0)
        return cp_fail(err, CP_ENOTFOUND,
                       "species: no Feshbach resonance is listed for %s; give b0, width, abg "
                       "and dmu explicitly",
                       m->name);
    return cp_fail(err, CP_ENOTFOUND, "species: resonance index %d for %s is out of range; "
                   "allowed [0, %d]", index, m->name, seen - 1);
}

size_t cp_species_atom_count(void) { return cp_atom_table_size; }

const cp_atom *cp_species_atom_at(size_t i)
{
    return i < cp_atom_table_size ? &cp_atom_table[i] : NULL;
}

size_t cp_species_molecule_count(void) { return cp_molecule_table_size; }

const cp_molecule *cp_species_molecule_at(size_t i)
{
    return i < cp_molecule_table_size ? &cp_molecule_table[i] : NULL;
}

double cp_atom_mass(const cp_atom *atom) { return atom->mass_u * CP_AMU; }

/* A neutral atom holds 2Z + N fermions (electrons, protons, neutrons): it is a composite
 * boson when the neutron number N = A - Z is even. */
cp_statistics cp_atom_statistics(const cp_atom *atom)
{
    return ((atom->mass_number - atom->protons) % 2 == 0) ? CP_BOSON : CP_FERMION;
}

cp_status cp_molecule_atoms(const cp_molecule *molecule, const cp_atom **a, const cp_atom **b,
                            cp_error *err)
{
    CP_TRY(cp_species_atom(molecule->atom_a, a, err));
    return cp_species_atom(molecule->atom_b, b, err);
}

double cp_molecule_mass(const cp_molecule *molecule)
{
    const cp_atom *a, *b;
    if (cp_molecule_atoms(molecule, &a, &b, NULL) != CP_OK)
        return NAN;
    return cp_atom_mass(a) + cp_atom_mass(b);
}

/* A molecule's statistics follow from the parity of its total neutron number. */
cp_statistics cp_molecule_statistics(const cp_molecule *molecule)
{
    const cp_atom *a, *b;
    if (cp_molecule_atoms(molecule, &a, &b, NULL) != CP_OK)
        return CP_BOSON;
    return cp_atom_statistics(a) == cp_atom_statistics(b) ? CP_BOSON : CP_FERMION;
}

double cp_reduced_mass(double mass_a, double mass_b)
{
    return mass_a * mass_b / (mass_a + mass_b);
}
