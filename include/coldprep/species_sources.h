/*
 * coldprep — where every built-in species number comes from.
 *
 * Each value of the built-in tables (coldprep/species.h) has one provenance entry: the
 * publication it was taken from, whether that paper measured, calculated or the project
 * estimated it (from other tabulated values, by a stated formula), the uncertainty the
 * paper gives, and whether the number was checked against the paper's own text
 * (`verified`).  A value whose paper could not be identified has no reference and says
 * "[M]" (recalled) in its note.  All data are static and owned by the library.
 *
 * Records are named "87Rb", "40K87Rb" and, for resonances, "40K87Rb#1" (1-based, in the
 * order cp_species_resonance lists them); fields by their struct member names.
 */
#ifndef COLDPREP_SPECIES_SOURCES_H
#define COLDPREP_SPECIES_SOURCES_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum cp_data_status {
    CP_DATA_MEASURED = 0,   /* measured in the cited experiment */
    CP_DATA_CALCULATED = 1, /* computed ab initio / from a fitted potential in the paper */
    CP_DATA_ESTIMATED = 2   /* derived here from other cited values; the note says how */
} cp_data_status;

typedef struct cp_reference {
    const char *key;     /* short key used by the provenance entries: "Ni2008" */
    const char *authors; /* "K.-K. Ni, S. Ospelkaus, ..." (first authors, "et al.") */
    const char *journal; /* abbreviated: "Science", "Phys. Rev. A" */
    const char *volume;
    const char *page;    /* first page or article number */
    int year;
    const char *doi;     /* NULL when none is known */
    const char *arxiv;   /* NULL when none is known */
} cp_reference;

typedef struct cp_datum {
    const char *record;    /* "87Rb", "40K87Rb", "40K87Rb#1" */
    const char *field;     /* struct member: "dipole_debye", "b0", ... */
    double uncertainty;    /* one standard uncertainty in the field's unit; 0: none given */
    cp_data_status status;
    int verified;          /* 1: the number was checked against the paper's text */
    const char *reference; /* key into the reference table; NULL only for recalled values */
    const char *note;      /* where in the paper, how derived, or "[M]" */
} cp_datum;

/* The provenance entries and the publications, for iteration (NULL past the end). */
size_t cp_species_datum_count(void);
const cp_datum *cp_species_datum_at(size_t i);
size_t cp_species_reference_count(void);
const cp_reference *cp_species_reference_at(size_t i);

/* The publication with this key, or NULL. */
const cp_reference *cp_species_reference(const char *key);

/* The provenance entry of (record, field), or NULL when there is none. */
const cp_datum *cp_species_datum(const char *record, const char *field);

/* The value of a built-in field in its table unit (`*unit`: "u", "D", "Hz", "a.u.", "T",
 * "m", "J/T", "m^3/s", "K", "1" for flags).  CP_ENOTFOUND for an unknown record or field.
 * A field with no data yields NaN and CP_OK. */
cp_status cp_species_value(const char *record, const char *field, double *value,
                           const char **unit, cp_error *err);

/* The numeric fields every record of a kind carries, NULL-terminated: kind is "atom",
 * "molecule" or "resonance". */
const char *const *cp_species_fields(const char *kind);

#ifdef __cplusplus
}
#endif
#endif
