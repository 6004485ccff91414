/* Private: the built-in species tables defined in species_data.c.  Not installed. */
#ifndef COLDPREP_SPECIES_INT_H
#define COLDPREP_SPECIES_INT_H

#include "coldprep/species.h"

extern const cp_atom cp_atom_table[];
extern const size_t cp_atom_table_size;
extern const cp_molecule cp_molecule_table[];
extern const size_t cp_molecule_table_size;
extern const cp_resonance cp_resonance_table[];
extern const size_t cp_resonance_table_size;

#endif
