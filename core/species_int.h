/* Private: the built-in species tables (species_data.c) and their provenance
 * (species_provenance.c).  Not installed. */
#ifndef COLDPREP_SPECIES_INT_H
#define COLDPREP_SPECIES_INT_H

#include "coldprep/species.h"
#include "coldprep/species_sources.h"

extern const cp_atom cp_atom_table[];
extern const size_t cp_atom_table_size;
extern const cp_molecule cp_molecule_table[];
extern const size_t cp_molecule_table_size;
extern const cp_resonance cp_resonance_table[];
extern const size_t cp_resonance_table_size;

/* species_provenance.c */
extern const cp_reference cp_reference_table[];
extern const size_t cp_reference_table_size;
extern const cp_datum cp_datum_table[];
extern const size_t cp_datum_table_size;

#endif
