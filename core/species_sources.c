/*
 * Lookups over the provenance of the built-in species data (species_provenance.c): the
 * entry of a (record, field) pair, the value a field holds, and the ground-state dynamic
 * polarizability of a named species at a tabulated trap wavelength.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "check_int.h"
#include "species_int.h"

/* Tabulated trap wavelengths and how close a request must come to one of them. */
#define LAMBDA_1064 1064e-9
#define LAMBDA_1550 1550e-9
#define LAMBDA_TOL 1e-9

size_t cp_species_datum_count(void) { return cp_datum_table_size; }

const cp_datum *cp_species_datum_at(size_t i)
{
    return i < cp_datum_table_size ? &cp_datum_table[i] : NULL;
}

size_t cp_species_reference_count(void) { return cp_reference_table_size; }

const cp_reference *cp_species_reference_at(size_t i)
{
    return i < cp_reference_table_size ? &cp_reference_table[i] : NULL;
}

const cp_reference *cp_species_reference(const char *key)
{
    for (size_t i = 0; key && i < cp_reference_table_size; i++)
        if (strcmp(cp_reference_table[i].key, key) == 0)
            return &cp_reference_table[i];
    return NULL;
}

const cp_datum *cp_species_datum(const char *record, const char *field)
{
    for (size_t i = 0; record && field && i < cp_datum_table_size; i++)
        if (strcmp(cp_datum_table[i].record, record) == 0 &&
            strcmp(cp_datum_table[i].field, field) == 0)
            return &cp_datum_table[i];
    return NULL;
}

static const char *const atom_fields[] = {"mass_u", "nuclear_spin", "pol_1064_au",
                                          "pol_1550_au", NULL};
static const char *const molecule_fields[] = {
    "dipole_debye", "rot_const_hz",   "c6_au",       "reactive",  "pol_1064_au",
    "pol_1064_par_au", "pol_1064_perp_au", "pol_1550_au", "loss_rate", "loss_temperature", NULL};
static const char *const resonance_fields[] = {"b0", "width", "abg", "dmu", "c6_au", NULL};

const char *const *cp_species_fields(const char *kind)
{
    if (!kind)
        return NULL;
    if (strcmp(kind, "atom") == 0)
        return atom_fields;
    if (strcmp(kind, "molecule") == 0)
        return molecule_fields;
    if (strcmp(kind, "resonance") == 0)
        return resonance_fields;
    return NULL;
}

typedef struct field_value {
    const char *name;
    double value;
    const char *unit;
} field_value;

static int pick(const field_value *list, size_t n, const char *field, double *value,
                const char **unit)
{
    for (size_t i = 0; i < n; i++)
        if (strcmp(list[i].name, field) == 0) {
            *value = list[i].value;
            *unit = list[i].unit;
            return 1;
        }
    return 0;
}

static int atom_value(const char *record, const char *field, double *value, const char **unit)
{
    for (size_t i = 0; i < cp_atom_table_size; i++) {
        const cp_atom *a = &cp_atom_table[i];
        if (strcmp(a->name, record) != 0)
            continue;
        const field_value v[] = {{"mass_u", a->mass_u, "u"},
                                 {"nuclear_spin", a->nuclear_spin, "1"},
                                 {"pol_1064_au", a->pol_1064_au, "a.u."},
                                 {"pol_1550_au", a->pol_1550_au, "a.u."}};
        return pick(v, sizeof v / sizeof v[0], field, value, unit);
    }
    return 0;
}

static int molecule_value(const char *record, const char *field, double *value,
                          const char **unit)
{
    for (size_t i = 0; i < cp_molecule_table_size; i++) {
        const cp_molecule *m = &cp_molecule_table[i];
        if (strcmp(m->name, record) != 0)
            continue;
        const field_value v[] = {{"dipole_debye", m->dipole_debye, "D"},
                                 {"rot_const_hz", m->rot_const_hz, "Hz"},
                                 {"c6_au", m->c6_au, "a.u."},
                                 {"reactive", (double)m->reactive, "1"},
                                 {"pol_1064_au", m->pol_1064_au, "a.u."},
                                 {"pol_1064_par_au", m->pol_1064_par_au, "a.u."},
                                 {"pol_1064_perp_au", m->pol_1064_perp_au, "a.u."},
                                 {"pol_1550_au", m->pol_1550_au, "a.u."},
                                 {"loss_rate", m->loss_rate, "m^3/s"},
                                 {"loss_temperature", m->loss_temperature, "K"}};
        return pick(v, sizeof v / sizeof v[0], field, value, unit);
    }
    return 0;
}

/* "40K87Rb#2": the second resonance listed for 40K87Rb. */
static int resonance_value(const char *record, const char *field, double *value,
                           const char **unit)
{
    const char *hash = strchr(record, '#');
    if (!hash || hash == record)
        return 0;
    size_t len = (size_t)(hash - record);
    char *end;
    long index = strtol(hash + 1, &end, 10);
    if (*end != '\0' || index < 1)
        return 0;
    long seen = 0;
    for (size_t i = 0; i < cp_resonance_table_size; i++) {
        const cp_resonance *r = &cp_resonance_table[i];
        if (strlen(r->molecule) != len || strncmp(r->molecule, record, len) != 0)
            continue;
        if (++seen != index)
            continue;
        const field_value v[] = {{"b0", r->b0, "T"},
                                 {"width", r->width, "T"},
                                 {"abg", r->abg, "m"},
                                 {"dmu", r->dmu, "J/T"},
                                 {"c6_au", r->c6_au, "a.u."}};
        return pick(v, sizeof v / sizeof v[0], field, value, unit);
    }
    return 0;
}

cp_status cp_species_value(const char *record, const char *field, double *value,
                           const char **unit, cp_error *err)
{
    *value = NAN;
    *unit = NULL;
    if (!record || !field)
        return cp_fail(err, CP_EINVAL, "species.value: record or field name is NULL");
    if (atom_value(record, field, value, unit) || molecule_value(record, field, value, unit) ||
        resonance_value(record, field, value, unit))
        return CP_OK;
    return cp_fail(err, CP_ENOTFOUND, "species.value: no built-in field \"%s\" of \"%s\"", field,
                   record);
}

cp_status cp_species_polarizability(const char *name, double wavelength, double *alpha_au,
                                    cp_error *err)
{
    static const char ctx[] = "species.polarizability";
    *alpha_au = NAN;
    CP_TRY(cp_check_range(err, ctx, "wavelength", wavelength, "m", 1e-7, 1e-4, CP_CLOSED));
    int at_1064 = fabs(wavelength - LAMBDA_1064) <= LAMBDA_TOL;
    int at_1550 = fabs(wavelength - LAMBDA_1550) <= LAMBDA_TOL;
    const cp_atom *a = NULL;
    const cp_molecule *m = NULL;
    const char *canonical;
    double alpha = NAN;
    if (cp_species_atom(name, &a, NULL) == CP_OK) {
        canonical = a->name;
        alpha = at_1064 ? a->pol_1064_au : at_1550 ? a->pol_1550_au : NAN;
    } else {
        CP_TRY(cp_species_molecule(name, &m, err));
        canonical = m->name;
        alpha = at_1064 ? m->pol_1064_au : at_1550 ? m->pol_1550_au : NAN;
    }
    if (!isfinite(alpha))
        return cp_fail(err, CP_ENOTFOUND,
                       "%s: no published polarizability of %s at %.6g nm is built in; give "
                       "polarizability_au (a.u.) for this species and wavelength",
                       ctx, canonical, wavelength * 1e9);
    *alpha_au = alpha;
    return CP_OK;
}
