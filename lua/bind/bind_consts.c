/* Lua binding: coldprep.consts, the CODATA 2018 constants of include/coldprep/consts.h. */
#include <lauxlib.h>
#include <lua.h>

#include "args.h"
#include "coldprep/consts.h"
#include "coldprep/limits.h"

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
    lua_createtable(L, 0, (int)(sizeof table / sizeof table[0]) + 1);
    for (size_t i = 0; i < sizeof table / sizeof table[0]; i++)
        cpl_set_number(L, table[i].name, table[i].value);
    /* consts.limits: the shared input limits of coldprep/limits.h, for the Lua library */
    lua_createtable(L, 0, 9);
    cpl_set_number(L, "min_beam_power", CP_MIN_BEAM_POWER);
    cpl_set_number(L, "max_beam_power", CP_MAX_BEAM_POWER);
    cpl_set_number(L, "min_c6_au", CP_MIN_C6_AU);
    cpl_set_number(L, "min_duration", CP_MIN_DURATION);
    cpl_set_number(L, "min_temperature", CP_MIN_TEMPERATURE);
    cpl_set_number(L, "max_temperature", CP_MAX_TEMPERATURE);
    cpl_set_number(L, "min_trap_omega", CP_MIN_TRAP_OMEGA);
    cpl_set_number(L, "max_trap_omega", CP_MAX_TRAP_OMEGA);
    cpl_set_number(L, "work_seconds", CP_WORK_LIMIT_S);
    lua_setfield(L, -2, "limits");
    return 1;
}
