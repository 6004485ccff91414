-- The coldprep demo.  Until the preparation budget lands this shows the species data and
-- constants at work for an imagined lab's first look at its molecule.
local cp = require "coldprep"
local u = cp.units

local m = cp.species.molecule("NaK")
print(string.format("%s: %s, mass %.4f u, dipole %.2f D, B = %.4f GHz, C6 = %.3g a.u., %s",
  m.name, m.statistics, m.mass_u, m.dipole_debye, m.rot_const_hz / 1e9, m.c6_au,
  m.reactive and "reactive" or "non-reactive"))
local r = cp.species.resonance("NaK")
print(string.format("association resonance: %s at %.2f G (width %.2f G, abg %.0f a0)%s",
  r.states, r.b0 / u.G, r.width / u.G, r.abg / u.a0, r.verified and "" or " [verify]"))
-- the rotational splitting 2B in temperature units
print(string.format("2B/kB = %.1f mK: the first rotational level is far above any gas temperature",
  2 * cp.consts.h * m.rot_const_hz / cp.consts.kB / u.mK))
