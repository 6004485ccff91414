-- Example: a lattice-loading study for fermionic 23Na40K.  The same molecules are loaded
-- into a 1064 nm cubic lattice with ramps from 0.2 ms to 50 ms; the table shows the
-- fraction left in excited bands, the entropy per molecule after loading, the temperature
-- in the lattice that adiabatic loading alone would give and the bands it fills, the
-- probabilities of one and of two or more molecules on the central site, and the degeneracy
-- (of the same entropy in the envelope trap) after loading and after a 50 ms hold with
-- photon-scattering heating.  Every number is read from the budget's fields (the
-- load_lattice record's `lattice` table), none from the notes.
-- Run: coldprep scripts/examples/lattice_loading.lua
local cp = require "coldprep"
local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

local function plan_with_ramp(ramp_time)
  return cp.plan {
    name = string.format("NaK lattice loading, %.3g ms ramp", ramp_time / u.ms),
    start = {
      molecule = "23Na40K", temperature = 200 * u.nK,
      atoms = {
        { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
        { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } },
      },
    },
    stages = {
      cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms, max_efficiency = 0.15 },
      cp.stages.remove_atoms {},
      cp.stages.transfer { round_trip_efficiency = 0.8 },
      cp.stages.load_lattice { wavelength = 1064 * u.nm, power = 0.6, waist = 180 * u.um,
        polarizability_au = 700, imag_polarizability_au = 2e-5, ramp_time = ramp_time },
      cp.stages.hold { duration = 50 * u.ms, loss_rate = 1e-13 * u.cm3 },
    },
  }
end

local rows = {}
print(string.format("%10s %9s %9s %13s %6s %9s %9s %12s %11s", "ramp (ms)", "excited", "S/N (kB)",
  "T_lat,ad (nK)", "bands", "centre 1", "centre 2+", "T/T_F loaded", "T/T_F held"))
for _, ramp in ipairs { 0.2 * u.ms, 1 * u.ms, 5 * u.ms, 50 * u.ms } do
  local b = plan_with_ramp(ramp):run()
  local load, held = b.stages[4], b.stages[5]
  local lat = load.lattice -- the lattice state the load_lattice stage records
  rows[#rows + 1] = { ramp = ramp, entropy = load.entropy_per_particle, loaded = load.degeneracy,
    held = held.degeneracy, lattice = lat, budget = b }
  print(string.format("%10.3g %8.2g%% %9.3g %13.4g %6d %9.3g %9.2g %12.3g %11.3g", ramp / u.ms,
    100 * lat.excited_fraction, load.entropy_per_particle, lat.temperature / u.nK, lat.bands,
    lat.filling.single, lat.filling.multiple, load.degeneracy, held.degeneracy))
end
print()
rows[#rows].budget:print()
return rows
