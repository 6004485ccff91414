-- coldprep.units: scale factors to SI.  Multiply to convert into SI, divide to read a
-- result in a unit: `2*pi*1.5*units.MHz` is an angular frequency in rad/s,
-- `r.temperature / units.nK` reads a temperature in nK.  Frequency units are plain
-- scale factors (Hz = 1): angular frequencies need the explicit 2*pi.
local consts = require("coldprep").consts

local units = {
  Hz = 1, kHz = 1e3, MHz = 1e6, GHz = 1e9,
  G = 1e-4, mG = 1e-7, T = 1,
  nK = 1e-9, uK = 1e-6, mK = 1e-3, K = 1,
  ns = 1e-9, us = 1e-6, ms = 1e-3, s = 1,
  nm = 1e-9, um = 1e-6, mm = 1e-3, cm = 1e-2, m = 1,
  uW = 1e-6, mW = 1e-3, W = 1,
  V_per_m = 1, V_per_cm = 1e2, kV_per_cm = 1e5,
  a0 = consts.a0, debye = consts.debye, Debye = consts.debye, amu = consts.amu,
  cm3 = 1e-6,     -- 1 cm^3 in m^3: a rate coefficient K [cm^3/s] is K * units.cm3 in m^3/s
  per_cm3 = 1e6,  -- 1 cm^-3 in m^-3: a density n [cm^-3] is n * units.per_cm3 in m^-3
}

return units
