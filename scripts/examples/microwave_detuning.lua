-- Example: choosing the microwave for shielding.  The Tidewater lab (the invented group of
-- scripts/demo.lua) sweeps the detuning of its blue-detuned, circularly polarised
-- microwave (Rabi frequency 2 pi x 40 MHz) and asks, for each setting, the ratio of
-- elastic to loss collisions the molecules get (cp.collisions.shielded at the start of the
-- evaporation) and the T/T_F the whole plan ends at.  Small detunings give strong effective
-- dipoles (fast thermalisation) but a weaker shield; large ones the reverse.
-- Run: coldprep scripts/examples/microwave_detuning.lua [OUT.png]  (writes the plot when
-- an output file is named; prints the table either way)
local cp = require "coldprep"
local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

local RABI = Hz(40 * u.MHz)

local function plan(detuning)
  local mw = { microwave = { rabi = RABI, detuning = detuning } }
  local function with(t)
    for k, v in pairs(mw) do t[k] = v end
    return t
  end
  return cp.plan {
    name = string.format("Tidewater NaK, microwave detuning 2 pi x %.3g MHz", detuning / Hz(u.MHz)),
    start = {
      molecule = "23Na40K", temperature = 180 * u.nK,
      atoms = {
        { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
        { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } },
      },
    },
    stages = {
      cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms },
      cp.stages.remove_atoms { heating_per_atom = 2 * u.nK * cp.consts.kB, duration = 0.5 * u.ms },
      cp.stages.transfer { rabi_pump = Hz(3 * u.MHz), rabi_stokes = Hz(5 * u.MHz), width = 8 * u.us,
        delay = 7 * u.us, gamma = Hz(6 * u.MHz) },
      cp.stages.change_trap { trap_frequencies = { Hz(60), Hz(70), Hz(200) }, ramp_time = 50 * u.ms },
      cp.stages.hold(with { duration = 20 * u.ms, lifetime = 5 }),
      cp.stages.evaporate(with { eta = 8, keep = 0.5 }),
    },
  }
end

local rows = {}
print(" detuning/2pi   d_eff   elastic/loss at start   final T/T_F")
print("     MHz          D")
for _, mhz in ipairs { 1, 2, 4, 6, 8, 12, 16, 24, 32, 48 } do
  local b = plan(Hz(mhz * u.MHz)):run()
  local start = b.stages[5] -- the sample entering the evaporation
  local r = cp.collisions.shielded { molecule = "23Na40K", temperature = start.temperature,
    microwave = { rabi = RABI, detuning = Hz(mhz * u.MHz) } }
  rows[#rows + 1] = { detuning_mhz = mhz, ratio = r.ratio, t_over_tf = b.final.t_over_tf,
    dipole = r.dipole_debye, degenerate = b.degenerate }
  print(string.format("%10.3g   %7.3f   %18.4g   %12.3f%s", mhz, r.dipole_debye, r.ratio,
    b.final.t_over_tf, r.valid and "" or ("   (" .. r.note .. ")")))
end

local out = ... -- the script's first argument (nil under dofile)
if out then
  local x, ratio, tf = {}, {}, {}
  for i, r in ipairs(rows) do x[i], ratio[i], tf[i] = r.detuning_mhz, r.ratio, r.t_over_tf end
  cp.plot.render { out = out, title = "Microwave shielding of 23Na40K, Rabi 2 pi x 40 MHz",
    panels = {
      { xlabel = "detuning / 2 pi (MHz)", ylabel = "elastic / loss", xlog = true,
        lines = { { x = x, y = ratio, label = "at the start of the evaporation", points = true } } },
      { xlabel = "detuning / 2 pi (MHz)", ylabel = "final T/T_F", xlog = true,
        lines = { { x = x, y = tf, label = "end of the plan", points = true } },
        hlines = { { y = 0.5, label = "degeneracy limit" } } },
    } }
  print("plot written to " .. out)
end
return rows
