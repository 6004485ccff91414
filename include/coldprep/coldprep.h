/*
 * coldprep — umbrella header: includes every public header of the library.
 * Link with -lcoldprep (pkg-config coldprep, or find_package(coldprep) in CMake).
 */
#ifndef COLDPREP_COLDPREP_H
#define COLDPREP_COLDPREP_H

#include "coldprep/status.h"
#include "coldprep/consts.h"
#include "coldprep/limits.h"
#include "coldprep/names.h"
#include "coldprep/species.h"
#include "coldprep/species_sources.h"
#include "coldprep/lattice.h"
#include "coldprep/thermo.h"
#include "coldprep/collisions.h"
#include "coldprep/feshbach.h"
#include "coldprep/raman.h"
#include "coldprep/fields.h"

#endif
