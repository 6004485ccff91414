-- A sweep of the demo plan (scripts/demo.lua: the Tidewater lab's 23Na40K sequence) over
-- the two settings its verdict is most sensitive to: the Feshbach ramp rate and the dc
-- electric field of the final evaporation, with a loss rate the lab measured (it overrides
-- the predicted one; the elastic cross section is still predicted for the field).
-- 100 x 100 = 10 000 points.
--   coldprep sweep scripts/examples/sweep_tidewater.lua --out tidewater.csv
--   cp.plot.map{data = "tidewater.csv", x = "ramp_rate", y = "electric_field",
--               z = "final.t_over_tf", xlog = true, out = "tidewater.png",
--               zlog = true, xlabel = "ramp rate (T/s)", ylabel = "electric field (V/m)",
--               zlabel = "T/T_F"}
-- Points whose plan fails (e.g. an evaporation that never reaches its target temperature)
-- keep their row, with the reason in the `error` column and empty outputs.
local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

-- The demo's plan with the ramp rate (T/s) and the evaporation field (V/m) left free.
local function tidewater_plan(p)
  return cp.plan {
    name = "Tidewater NaK",
    start = {
      molecule = "23Na40K", temperature = 180 * u.nK,
      atoms = {
        { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) }, beam_power = 1.2 },
        { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } },
      },
    },
    stages = {
      cp.stages.associate { ramp_rate = p.ramp_rate },
      cp.stages.remove_atoms { heating_per_atom = 2 * u.nK * cp.consts.kB, duration = 0.5 * u.ms },
      cp.stages.transfer { rabi_pump = Hz(3 * u.MHz), rabi_stokes = Hz(5 * u.MHz), width = 8 * u.us,
        delay = 7 * u.us, gamma = Hz(6 * u.MHz), pump_linewidth_hz = 500, stokes_linewidth_hz = 500,
        pump_power = 0.03, stokes_power = 0.06 },
      cp.stages.change_trap { label = "evaporation trap", trap_frequencies = { Hz(60), Hz(70), Hz(200) },
        ramp_time = 50 * u.ms, beam_power = 0.8 },
      cp.stages.hold { duration = 20 * u.ms, lifetime = 5, loss_rate = 5e-14 * u.cm3 },
      cp.stages.evaporate { eta = 8, final_temperature = 60 * u.nK, electric_field = p.electric_field,
        loss_rate = 5e-14 * u.cm3 },
    },
  }
end

return {
  parameters = {
    { name = "ramp_rate", from = 0.1 * u.G / u.ms, to = 100 * u.G / u.ms, points = 100, scale = "log" },
    { name = "electric_field", from = 0.1e5, to = 1e5, points = 100 },
  },
  evaluate = tidewater_plan,   -- the returned plan is run
  outputs = { "final.number", "final.temperature", "final.t_over_tf", "degenerate", "limiting_stage" },
}
