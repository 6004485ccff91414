/* Lua binding: coldprep.consts, the CODATA 2018 constants of include/coldprep/consts.h. */
#include <lauxlib.h>
#include <lua.h>

#include "args.h"
#include "coldprep/consts.h"

int cpl_open_consts(lua_State *L);

int cpl_open_consts(lua_State *L)
{
    static const struct {
        const char *name;
        double value;
    } table[] = {
        {"h", CP_H},       {"hbar", CP_HBAR}, {"kB", CP_KB},         {"amu", CP_AMU},
        {"a0", CP_A0},     {"c", CP_C},       {"eps0", CP_EPS0},     {"muB", CP_MUB},
        {"debye", CP_DEBYE}, {"g", CP_G},     {"e", CP_E},           {"me", CP_ME},
        {"Eh", CP_EH},     {"pi", CP_PI},     {"au_polarizability", CP_AU_POLARIZABILITY},
        {"au_dipole", CP_AU_DIPOLE},          {"au_c6", CP_AU_C6},
    };
    lua_createtable(L, 0, (int)(sizeof table / sizeof table[0]));
    for (size_t i = 0; i < sizeof table / sizeof table[0]; i++)
        cpl_set_number(L, table[i].name, table[i].value);
    return 1;
}
