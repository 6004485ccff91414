-- One limit, one answer: the shared input limits (coldprep/limits.h, exported as
-- cp.consts.limits) are accepted and refused alike by every model that reads a trap
-- frequency or a temperature.  The values are the project's own choice, documented in
-- the header; this test checks that no model keeps a different copy of them.
local T = dofile("testlib.lua")
local cp = require "coldprep"
local L = cp.consts.limits

T.check(L.min_trap_omega < L.max_trap_omega and L.min_temperature < L.max_temperature,
  "limits are ordered")

local mass = cp.species.atom("87Rb").mass
local function cloud(w) return { atom = "87Rb", number = 1e5, omega_x = w, omega_y = w, omega_z = w,
  profile = "thermal" } end
local calls = {
  ["thermo.fermi"] = function(w, t) return cp.thermo.fermi { number = 1e5, omega_bar = w, mass = mass,
    temperature = t } end,
  ["feshbach.overlap_density"] = function(w, t) return cp.feshbach.overlap_density { a = cloud(w),
    b = cloud(w), temperature = t } end,
}
for name, call in pairs(calls) do
  -- 7e6 rad/s, below the cap, was refused by one model and accepted by another before
  T.check(pcall(call, 7e6, 1e-4), name .. ": 7e6 rad/s accepted")
  T.check(pcall(call, L.max_trap_omega, 1e-4), name .. ": the cap itself accepted")
  T.raises(function() call(L.max_trap_omega * 1.01, 1e-4) end, { "rad/s" }, name .. ": above the cap refused")
  T.raises(function() call(2 * math.pi * 100, L.max_temperature * 1.01) end, { "temperature" },
    name .. ": above the temperature cap refused")
end

-- Tiny inputs inside the old ranges gave silent inf or NaN (sag inf for a 1e-300 W beam, a
-- barrier of inf for C6 = 1.6e-296 a.u., NaN for a 5e-324 s ramp); the ranges now start at
-- physical floors (coldprep/limits.h) and such inputs are refused, naming the parameter.
T.raises(function() cp.lattice.depth { power = 1e-300, waist = 1e-4, wavelength = 1064e-9,
  polarizability_au = 700, mass = 2e-25 } end, { "power", "W", "allowed" }, "a 1e-300 W beam")
T.raises(function() cp.collisions.pwave_barrier { c6_au = 1.6e-296, mass = 1e-25 } end,
  { "c6_au", "a.u.", "allowed" }, "a vanishing C6")
T.raises(function() cp.collisions.mean_scattering_length { c6_au = 1e-300, mass = 1e-25 } end,
  { "c6_au", "allowed" }, "a vanishing C6 for the mean scattering length")
T.raises(function() cp.lattice.loading { shape = "linear", start_er = 0, end_er = 20,
  duration = 4.9e-324, mass = 2e-25, wavelength = 1064e-9 } end, { "duration", "s", "allowed" },
  "a denormal ramp duration")
T.check(cp.lattice.depth { power = L.min_beam_power, waist = 1e-4, wavelength = 1064e-9,
  polarizability_au = 700, mass = 2e-25 }.sag < math.huge, "the weakest allowed beam gives a finite sag")

-- A NaN with its sign bit set (0/0 on x86 is one) reads "NaN" on every platform, not "-nan".
local ok, msg = pcall(cp.thermo.fermi, { number = 1e5, omega_bar = 100, mass = mass, temperature = -(0 / 0) })
T.check(not ok and msg:find("temperature NaN K is not a number", 1, true) and not msg:find("-nan", 1, true), "NaN spelled NaN: " .. tostring(msg))
T.done()
