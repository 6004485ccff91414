/*
 * Finding and opening the modules loaded on first use (modpath.h).  The directory of the
 * binary holding this code comes from the dynamic loader's map of it: the executable's own
 * path (/proc/self/exe) when that is the main program, else the path the Lua C module was
 * opened from.
 */
#define _GNU_SOURCE /* dladdr1, Dl_info, struct link_map */
#include "modpath.h"

#include <dlfcn.h>
#include <limits.h>
#include <link.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

static const char anchor; /* an object of this binary, for dladdr1 */

/* The directory of this binary in dir[size]; 0 on success. */
static int own_directory(char *dir, size_t size)
{
    Dl_info info;
    struct link_map *map = NULL;
    char path[PATH_MAX];
    if (!dladdr1(&anchor, &info, (void **)&map, RTLD_DL_LINKMAP) || map == NULL)
        return -1;
    if (map->l_name == NULL || map->l_name[0] == '\0') { /* the main program */
        ssize_t n = readlink("/proc/self/exe", path, sizeof path - 1);
        if (n <= 0)
            return -1;
        path[n] = '\0';
    } else if (!realpath(map->l_name, path)) {
        return -1;
    }
    char *slash = strrchr(path, '/');
    if (!slash || (size_t)(slash - path) >= size)
        return -1;
    memcpy(dir, path, (size_t)(slash - path));
    dir[slash - path] = '\0';
    return 0;
}

void *cpl_module_function(const char *const dirs[], const char *file, const char *symbol,
                          char *err, size_t size)
{
    char here[PATH_MAX], path[PATH_MAX + 256];
    if (own_directory(here, sizeof here) != 0) {
        snprintf(err, size, "cannot load %s: the directory of the coldprep binary is unknown",
                 file);
        return NULL;
    }
    for (int i = 0; dirs[i]; i++) {
        snprintf(path, sizeof path, "%s/%s/%s", here, dirs[i], file);
        if (access(path, R_OK) != 0)
            continue;
        void *lib = dlopen(path, RTLD_NOW | RTLD_LOCAL);
        if (!lib) {
            snprintf(err, size, "cannot load %s: %s", path, dlerror());
            return NULL;
        }
        void *fn = dlsym(lib, symbol);
        if (!fn)
            snprintf(err, size, "cannot load %s: it has no %s", path, symbol);
        return fn;
    }
    int n = snprintf(err, size, "cannot find %s (looked in", file);
    for (int i = 0; dirs[i] && n >= 0 && (size_t)n < size; i++)
        n += snprintf(err + n, size - (size_t)n, "%s %s/%s", i ? "," : "", here, dirs[i]);
    if (n >= 0 && (size_t)n < size)
        snprintf(err + n, size - (size_t)n, "); is the coldprep build or install complete?");
    return NULL;
}
