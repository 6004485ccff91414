-- The coldprep demo: an imagined lab plans its first degenerate Fermi gas of polar
-- molecules, then sees how one changed parameter flips the verdict.
--
-- The Tidewater Polar Molecules Lab (an invented group; every number below is invented
-- but of the size such labs report) makes fermionic 23Na40K.  Their sequence: a
-- sympathetically cooled Na-K mixture in a crossed 1064 nm dipole trap, magnetoassociation
-- on the 138.7 G resonance, a resonant pulse that clears the leftover atoms, STIRAP to
-- the ground state, a move into a rounder evaporation trap, a short hold, and evaporation
-- of the molecules.  Ground-state NaK molecules are lost when two of them meet at short
-- range, so the lab shields them with a blue-detuned, circularly polarised microwave near
-- the J = 0 -> 1 rotational transition; the collision rates (elastic and loss) are
-- predicted for that protection, not typed in.  The second plan shows what happens when
-- the same molecules are evaporated with only a dc field to make them dipolar.
-- Run with `scripts/demo` (or `coldprep scripts/demo.lua`).
local cp = require "coldprep"
local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

-- The plan, with the protection of the molecules (hold and evaporation) as its one free
-- parameter: {microwave = {rabi, detuning}} or {electric_field = V/m}.
local function tidewater_plan(name, protection)
  local function with(t)
    for k, v in pairs(protection) do t[k] = v end
    return t
  end
  return cp.plan {
    name = name,
    start = {
      molecule = "23Na40K", temperature = 180 * u.nK,
      atoms = {
        { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) }, beam_power = 1.2 },
        { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } },
      },
    },
    stages = {
      cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms },
      cp.stages.remove_atoms { heating_per_atom = 2 * u.nK * cp.consts.kB, duration = 0.5 * u.ms },
      cp.stages.transfer { rabi_pump = Hz(3 * u.MHz), rabi_stokes = Hz(5 * u.MHz), width = 8 * u.us,
        delay = 7 * u.us, gamma = Hz(6 * u.MHz), pump_linewidth_hz = 500, stokes_linewidth_hz = 500,
        pump_power = 0.03, stokes_power = 0.06 },
      cp.stages.change_trap { label = "evaporation trap", trap_frequencies = { Hz(60), Hz(70), Hz(200) },
        ramp_time = 50 * u.ms, beam_power = 0.8 },
      cp.stages.hold(with { duration = 20 * u.ms, lifetime = 5 }),
      cp.stages.evaporate(with { eta = 8, keep = 0.5 }),
    },
  }
end

print("The Tidewater Polar Molecules Lab (an imagined group) plans its first degenerate Fermi gas")
print("of 23Na40K molecules: associate, clean, STIRAP, move to an evaporation trap, hold, evaporate")
print("with the molecules shielded by a blue-detuned microwave (rates predicted, not typed in).")
print()
local clock = os.clock()
local shield = { microwave = { rabi = Hz(40 * u.MHz), detuning = Hz(8 * u.MHz) } }
local planned = tidewater_plan("Tidewater lab, first NaK plan (microwave shielding)", shield):run()
planned:print()

print()
print(string.rep("=", 100))
print("What if the microwave amplifier is not ready and the lab evaporates with only a dc field")
print("of 0.6 kV/cm to make the molecules dipolar?  Same plan, protection changed:")
print()
local bare = tidewater_plan("Tidewater lab, NaK plan without shielding (0.6 kV/cm)",
  { electric_field = 0.6e5 }):run()
bare:print()

print()
print(string.format("Verdict with microwave shielding: %s; without: %s.",
  planned.degenerate and "degenerate" or "not degenerate",
  bare.degenerate and "degenerate" or "not degenerate"))
print(string.format("(both plans, with their limiting-stage analyses, took %.2f s of CPU time)",
  os.clock() - clock))
