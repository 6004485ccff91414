-- Example: bosonic 87Rb133Cs, a non-reactive molecule whose degeneracy is judged by T/T_c.
-- An invented group starts from a Rb BEC-adjacent mixture with a small Cs cloud, makes
-- molecules, transfers them with a measured round-trip efficiency, compresses the trap and
-- evaporates with a measured elastic-to-loss ratio (sticky loss suppressed by shielding).
-- Run: coldprep scripts/examples/rbcs_bosons.lua
local cp = require "coldprep"
local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

local plan = cp.plan {
  name = "RbCs: bosonic molecules toward a condensate",
  start = {
    molecule = "87Rb133Cs", temperature = 150 * u.nK,
    atoms = {
      { atom = "87Rb", number = 3e5, trap_frequencies = { Hz(60), Hz(60), Hz(180) }, beam_power = 3 },
      { atom = "133Cs", number = 1e5, trap_frequencies = { Hz(45), Hz(45), Hz(140) } },
    },
  },
  stages = {
    cp.stages.associate { ramp_rate = 0.05 * u.G / u.ms },
    cp.stages.remove_atoms { heating_per_atom = 1 * u.nK * cp.consts.kB },
    cp.stages.transfer { round_trip_efficiency = 0.85 },
    cp.stages.change_trap { label = "compress", trap_frequencies = { Hz(150), Hz(150), Hz(300) },
      ramp_time = 0.1, beam_power = 3 },
    cp.stages.hold { duration = 10 * u.ms, loss_rate = 1e-12 * u.cm3 },
    cp.stages.evaporate { eta = 9, ratio = 2000, keep = 0.2, loss_rate = 1e-12 * u.cm3 },
  },
}

local budget = plan:run()
budget:print()
return budget
