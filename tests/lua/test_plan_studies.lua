-- cp.optimize, cp.uncertainty and cp.sweep on a real plan (the demo's 23Na40K sequence of
-- scripts/demo.lua, with the final evaporation temperature free):
--  STUDY-1 the optimiser's optimum (most molecules with T/T_F <= 0.5) against a dense scan
--          done here: the molecule number grows with the final temperature and so does
--          T/T_F, so the optimum is the highest feasible temperature; it must lie between
--          the scan's best feasible point and the next (infeasible) one;
--  STUDY-2 uncertainty with zero widths reproduces the plain plan exactly;
--  STUDY-3 a sweep row holds the plan's own numbers.
local T = require "testlib"
local u = cp.units
local function Hz(f) return 2 * math.pi * f end

local function plan(p)
  return cp.plan {
    start = { molecule = "23Na40K", temperature = 180 * u.nK,
      atoms = { { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
                { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } } } },
    stages = {
      cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms },
      cp.stages.remove_atoms { heating_per_atom = 2 * u.nK * cp.consts.kB, duration = 0.5 * u.ms },
      cp.stages.transfer { rabi_pump = Hz(3 * u.MHz), rabi_stokes = Hz(5 * u.MHz), width = 8 * u.us,
        delay = 7 * u.us, gamma = Hz(6 * u.MHz), pump_linewidth_hz = 500, stokes_linewidth_hz = 500 },
      cp.stages.change_trap { label = "evaporation trap", trap_frequencies = { Hz(60), Hz(70), Hz(200) },
        ramp_time = 50 * u.ms },
      cp.stages.evaporate { eta = 8, final_temperature = p.final_temperature, electric_field = 0.6e5,
        loss_rate = 5e-14 * u.cm3 },
    },
  }
end
local function run(p) return plan(p):run { limiting = false } end

-- STUDY-1: dense scan, 88.5 .. 97.5 nK in steps of 1.5 nK (the boundary lies near 94.1 nK,
-- between two scan points).
local step, best_t, best_n = 1.5 * u.nK, nil, -1
for i = 0, 6 do
  local t = 88.5 * u.nK + i * step
  local b = run { final_temperature = t }
  if b.final.t_over_tf <= 0.5 and b.final.number > best_n then best_t, best_n = t, b.final.number end
end
T.check(best_t ~= nil and best_t < 97.5 * u.nK, "STUDY-1 the scan brackets the T/T_F = 0.5 boundary")
local o = cp.optimize {
  parameters = { { name = "final_temperature", min = 40 * u.nK, max = 140 * u.nK, start = 80 * u.nK } },
  evaluate = run, merit = "final.number", constraints = { { output = "final.t_over_tf", max = 0.5 } },
  tolerance = 1e-3, max_evaluations = 30 }
local topt = o.parameters.final_temperature
T.check(o.feasible, "STUDY-1 the optimum satisfies T/T_F <= 0.5")
T.check(topt >= best_t - 1e-3 * u.nK and topt < best_t + step,
  string.format("STUDY-1 optimum %.2f nK within the scan's bracket [%.2f, %.2f) nK", topt / u.nK,
    best_t / u.nK, (best_t + step) / u.nK))
T.check(o.merit >= best_n * (1 - 1e-9), "STUDY-1 at least as many molecules as the scan's best")
-- 130 nK and above make the evaporation fail (final number above the initial one): the
-- search passes through there without stopping
T.check(o.sensitivity[1].plus.feasible == false, "STUDY-1 +10 % breaks the constraint")

-- STUDY-2: zero widths reproduce the plain plan.
local plain = run { final_temperature = 70 * u.nK }
local z = cp.uncertainty {
  parameters = { { name = "final_temperature", distribution = "normal", mean = 70 * u.nK, sd = 0 } },
  evaluate = run, outputs = { "final.number", "final.t_over_tf" }, samples = 2, seed = 3 }
T.check(z.outputs["final.number"].min == plain.final.number and z.outputs["final.number"].max == plain.final.number,
  "STUDY-2 zero widths: every draw gives the plain plan's number")
T.check(z.outputs["final.t_over_tf"].mean == plain.final.t_over_tf, "STUDY-2 zero widths: T/T_F too")
T.check(z.probability_degenerate == (plain.degenerate and 1 or 0), "STUDY-2 degeneracy as in the plain plan")

-- STUDY-3: a sweep row of the plan (evaluate returns the plan; the sweep runs it).
local s = cp.sweep { parameters = { { name = "final_temperature", values = { 70 * u.nK } } },
  evaluate = plan, outputs = { "final.number", "degenerate" } }
T.check(s.rows[1]["final.number"] == plain.final.number and s.rows[1].degenerate == plain.degenerate,
  "STUDY-3 the sweep's row holds the plan's numbers")
-- STUDY-4: outputs of a plan's budget.  A key the budget may lack (t_over_tc: the
-- 23Na40K molecules are fermions, which have t_over_tf) is an empty cell; a misspelt one
-- stops the sweep with the closest name.
local s4 = cp.sweep { parameters = { { name = "final_temperature", values = { 70 * u.nK } } },
  evaluate = plan, outputs = { "final.t_over_tc", "final.t_over_tf" } }
T.check(s4.rows[1]["final.t_over_tc"] == nil and s4.rows[1]["final.t_over_tf"] == plain.final.t_over_tf
  and s4.rows[1].error == nil, "STUDY-4 a key the budget declares is empty where absent")
T.raises(function() cp.sweep { parameters = { { name = "final_temperature", values = { 70 * u.nK } } },
  evaluate = plan, outputs = { "final.t_over_tff" } } end,
  { "output 'final.t_over_tff' is missing from evaluate's result at point 1", "did you mean 'final.t_over_tf'?" },
  "STUDY-4 a misspelt budget output stops the sweep")
T.done()
