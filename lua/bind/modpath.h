/*
 * The parts of coldprep loaded on first use: the plot module (PLplot and the libraries it
 * brings) and the interactive session (readline).  Opening them at every start cost more
 * than everything else a start does, so they are separate shared objects, built and
 * installed beside the coldprep files and opened with dlopen when first needed; they are
 * looked for only in the directories the build and the install put them in, relative to
 * the binary that asks (the coldprep executable or the Lua C module), never on a system
 * search path.
 */
#ifndef COLDPREP_MODPATH_H
#define COLDPREP_MODPATH_H

#include <stddef.h>

/* Open the shared object `file` from the first of the directories dirs[] (NULL-terminated;
 * relative to the directory of the binary holding this code) that has it, and return its
 * function `symbol` (a lua_CFunction or another function, to be cast by the caller).
 * Loaded objects stay loaded.  NULL on failure, with a message naming the file, the
 * directories tried and the loader's reason in err[size]. */
void *cpl_module_function(const char *const dirs[], const char *file, const char *symbol,
                          char *err, size_t size);

#endif
