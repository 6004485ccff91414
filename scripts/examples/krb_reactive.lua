-- Example: fermionic 40K87Rb, a chemically reactive molecule (2 KRb -> K2 + Rb2 is
-- exothermic).  An invented group plans association, STIRAP and a 100 ms hold in the
-- dipole trap with no shielding, so the universal p-wave loss from KRb's C6 sets the
-- pace.  The budget shows which stage limits the plan and why.
-- Run: coldprep scripts/examples/krb_reactive.lua
local cp = require "coldprep"
local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

local plan = cp.plan {
  name = "KRb: reactive molecules held in a dipole trap",
  start = {
    molecule = "40K87Rb", temperature = 300 * u.nK,
    atoms = {
      { atom = "87Rb", number = 2e5, trap_frequencies = { Hz(100), Hz(100), Hz(250) }, beam_power = 2.5 },
      { atom = "40K", number = 1e5, trap_frequencies = { Hz(140), Hz(140), Hz(350) } },
    },
  },
  stages = {
    cp.stages.associate { ramp_rate = 1 * u.G / u.ms },
    cp.stages.transfer { rabi_pump = Hz(2 * u.MHz), rabi_stokes = Hz(3 * u.MHz), width = 10 * u.us,
      delay = 9 * u.us, gamma = Hz(6 * u.MHz), relative_linewidth_hz = 200 },
    cp.stages.remove_atoms { heating_per_atom = 1 * u.nK * cp.consts.kB },
    cp.stages.hold { duration = 100 * u.ms, lifetime = 10 },
  },
}

local budget = plan:run()
budget:print()
return budget
