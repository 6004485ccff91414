/*
 * coldprep — built-in species data: atoms, ground-state bialkali molecules and the
 * interspecies Feshbach resonances used to associate them.
 *
 * All records are static, read-only data owned by the library; the pointers returned
 * stay valid for the life of the process.  Each number's publication, status (measured,
 * calculated, estimated), uncertainty and whether it was checked against the paper's text
 * are kept per value in coldprep/species_sources.h; `source` here is a one-line summary.
 * A value with no data is NaN.  Users add their own species from Lua (the Lua layer keeps
 * those; this module never changes at run time).
 */
#ifndef COLDPREP_SPECIES_H
#define COLDPREP_SPECIES_H

#include <stddef.h>

#include "coldprep/status.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum cp_statistics { CP_BOSON = 0, CP_FERMION = 1 } cp_statistics;

typedef struct cp_atom {
    const char *name;     /* canonical name, mass number first: "87Rb" */
    const char *symbol;   /* element symbol: "Rb" */
    int protons;          /* Z */
    int mass_number;      /* A */
    double mass_u;        /* atomic mass in unified atomic mass units (AME2020) */
    double nuclear_spin;  /* I */
    double pol_1064_au;   /* ground-state dynamic polarizability at 1064 nm, a.u.; NaN: none */
    double pol_1550_au;   /* the same at 1550 nm, a.u.; NaN when none is built in */
    const char *source;
    double a_bb;              /* intraspecies s-wave scattering length, m (sign kept: < 0 is
                                 attractive); for the hyperfine state and field named in
                                 a_bb_source.  Fermions: between two spin states (identical
                                 fermions in one state have no s-wave scattering). */
    const char *a_bb_source;  /* the state it is for, its published source ("[M]": the
                                 number is recalled, check it) */
} cp_atom;

typedef struct cp_molecule {
    const char *name;        /* canonical name: "40K87Rb" */
    const char *atom_a;      /* canonical atom names */
    const char *atom_b;
    double dipole_debye;     /* permanent dipole moment of X1Sigma+ v=0, debye */
    double rot_const_hz;     /* rotational constant B, Hz (B/h) */
    double c6_au;            /* isotropic molecule-molecule C6 in J=0, atomic units */
    int reactive;            /* 1 if 2AB -> A2 + B2 is exothermic */
    /* dynamic polarizability of X1Sigma+ v=0 at 1064 nm, a.u.: isotropic part and the
     * components parallel / perpendicular to the axis (NaN where none is built in) */
    double pol_1064_au, pol_1064_par_au, pol_1064_perp_au;
    double pol_1550_au;      /* isotropic, 1550 nm, a.u.; NaN when none is built in */
    double loss_rate;        /* two-body loss rate coefficient, no shielding, m^3/s; NaN: none */
    double loss_temperature; /* the temperature it was measured at, K */
    const char *source;
} cp_molecule;

typedef struct cp_resonance {
    const char *molecule;    /* canonical molecule name the pair associates into */
    const char *states;      /* the atomic hyperfine states of the entrance channel */
    double b0;               /* resonance position, T */
    double width;            /* Delta, T (sign as in a(B) = abg (1 - Delta/(B - B0))) */
    double abg;              /* background scattering length, m */
    double dmu;              /* differential magnetic moment of the closed channel, J/T */
    double c6_au;            /* atom-atom C6 of the entrance pair, atomic units */
    int verified;            /* 1 only when b0, width, abg and dmu were all checked against
                                the paper's text (per-value detail: species_sources.h) */
    const char *source;
} cp_resonance;

/* Look up an atom by name ("87Rb", "Rb87", case-insensitive).  On CP_ENOTFOUND the
 * error message lists the closest known names. */
cp_status cp_species_atom(const char *name, const cp_atom **atom, cp_error *err);

/* Look up a molecule by name ("40K87Rb", "K40Rb87", "KRb", "RbK"). */
cp_status cp_species_molecule(const char *name, const cp_molecule **molecule, cp_error *err);

/* The index-th (0-based) resonance listed for a molecule. */
cp_status cp_species_resonance(const char *molecule, int index, const cp_resonance **resonance,
                               cp_error *err);

/* Number of resonances listed for a molecule (0 when none; CP_ENOTFOUND for an unknown
 * molecule). */
cp_status cp_species_resonance_count(const char *molecule, int *count, cp_error *err);

/* Iteration over the tables: count and i-th record (NULL when out of range). */
size_t cp_species_atom_count(void);
const cp_atom *cp_species_atom_at(size_t i);
size_t cp_species_molecule_count(void);
const cp_molecule *cp_species_molecule_at(size_t i);

/* Derived facts. */
double cp_atom_mass(const cp_atom *atom);                    /* kg */
cp_statistics cp_atom_statistics(const cp_atom *atom);       /* from the neutron number */
cp_status cp_molecule_atoms(const cp_molecule *molecule, const cp_atom **a, const cp_atom **b,
                            cp_error *err);
double cp_molecule_mass(const cp_molecule *molecule);        /* kg, sum of the atoms */
cp_statistics cp_molecule_statistics(const cp_molecule *molecule);
double cp_reduced_mass(double mass_a, double mass_b);        /* kg */

/* The ground-state dynamic polarizability (a.u.) of a built-in atom or molecule (the
 * isotropic part for a molecule) at `wavelength` (m), tabulated at 1064 nm and 1550 nm
 * (within 1 nm).  CP_ENOTFOUND, with a message asking for polarizability_au, when the
 * species is unknown or has no value at that wavelength. */
cp_status cp_species_polarizability(const char *name, double wavelength, double *alpha_au,
                                    cp_error *err);

/* Write up to `count` names closest to `name` (edit distance) into buf as
 * "a, b, c".  Used for "did you mean" messages. */
void cp_species_suggest(const char *name, char *buf, size_t size, int count);

#ifdef __cplusplus
}
#endif
#endif
