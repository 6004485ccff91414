/*
 * Heating of molecules in a lattice by photon scattering of the lattice light.
 *
 * Scattering rate Gamma_sc = Im(alpha) I / (hbar eps0 c) (Grimm, Weidemueller,
 * Ovchinnikov, Adv. At. Mol. Opt. Phys. 42, 95 (2000), Sec. 2.1 [M]).  Each scattering
 * deposits 2 E_rec on average (one recoil from the absorbed and one from the emitted
 * photon), so dE/dt = 2 E_rec Gamma_sc and, in a 3D harmonic trap (E = 3 kB T),
 * dT/dt = 2 E_rec Gamma_sc / (3 kB) (docs/models/lattice.md).  The rate of excitation out of the
 * lowest band is derived in lattice.h (cp_lattice_heating).
 */
#include <math.h>

#include "check_int.h"
#include "coldprep/consts.h"
#include "coldprep/lattice.h"

static const char *const CTX_SCATTER = "lattice.scattering rate";
static const char *const CTX_HEATING = "lattice.heating";

cp_status cp_lattice_scattering_rate(double alpha_imag, cp_polarizability_unit unit,
                                     double intensity, double *rate, cp_error *err)
{
    *rate = NAN;
    double alpha;
    CP_TRY(cp_lattice_polarizability_si(alpha_imag, unit, &alpha, err));
    CP_TRY(cp_check_range(err, CTX_SCATTER, "imaginary polarizability",
                          alpha / CP_AU_POLARIZABILITY, "a.u.", 0.0, 1e7, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX_SCATTER, "intensity", intensity, "W/m^2", 0.0, 1e14,
                          CP_CLOSED));
    *rate = alpha * intensity / (CP_HBAR * CP_EPS0 * CP_C);
    return CP_OK;
}

cp_status cp_lattice_heating(double scattering_rate, double recoil, double depth_er,
                             cp_lattice_heating_result *r, cp_error *err)
{
    r->energy_rate = r->temperature_rate = r->band_excitation_rate = r->lamb_dicke = NAN;
    r->flags = 0;
    CP_TRY(cp_check_range(err, CTX_HEATING, "scattering rate", scattering_rate, "1/s", 0.0,
                          1e9, CP_CLOSED));
    CP_TRY(cp_check_range(err, CTX_HEATING, "recoil", recoil, "J", 0.0, 1e-20, CP_LO_OPEN));
    CP_TRY(cp_check_range(err, CTX_HEATING, "depth", depth_er, "E_r", 0.0,
                          CP_LATTICE_MAX_DEPTH_ER, CP_LO_OPEN));
    double eta;
    CP_TRY(cp_lattice_site(depth_er, 1.0, NULL, &eta, err));
    r->energy_rate = 2.0 * recoil * scattering_rate;
    r->temperature_rate = r->energy_rate / (3.0 * CP_KB);
    r->band_excitation_rate = scattering_rate * eta * eta / 3.0;
    r->lamb_dicke = eta;
    /* below ~3 E_r eta^2 ~ 0.3-0.5: not Lamb-Dicke, the well not harmonic (common practice,
     * no source, for the boundary) */
    if (depth_er < 3.0)
        r->flags = CP_LATTICE_FLAG_SHALLOW;
    return CP_OK;
}
