-- cp.optimize and cp.optim.nmsimplex: the optimum of a plan-like model (a Feshbach ramp
-- whose efficiency falls for fast ramps and whose losses grow for slow ones, then a hold
-- that cools but loses molecules) under the constraint T/T_F <= 0.5, checked against a
-- dense grid scan done here; an optimum on a bound; the +-10 % sensitivity; bad input.
local T = require "testlib"
local check, raises = T.expect, T.raises_named

-- Plain simplex on a quadratic with its minimum at (1, -2) (by inspection).
local q = cp.optim.nmsimplex{f = function(x) return (x[1] - 1)^2 + 10 * (x[2] + 2)^2 end,
  start = {0, 1}, step = {0.5, 0.5}, tolerance = 1e-9}
check("nmsimplex finds (1, -2)", math.abs(q.x[1] - 1) < 1e-6 and math.abs(q.x[2] + 2) < 1e-6 and q.converged,
  q.x[1] .. " " .. q.x[2])

-- The plan-like model.  r: ramp rate (G/s), h: hold time (s).
local function model(p)
  local n = 1e5 * math.exp(-2e3 / p.r) * (1 - math.exp(-4e4 / p.r)) * math.exp(-p.h / 0.5)
  return { final = { number = n, t_over_tf = 0.1 + 0.9 * math.exp(-p.h / 0.25) } }
end

-- Dense scan (the outside reference): 601 x 601 points, r on a log grid over [1e3, 1e6],
-- h linear over [0, 1]; keep the best feasible point.
local best, br, bh = -math.huge, nil, nil
for i = 0, 600 do
  local r = 1e3 * 1000 ^ (i / 600)
  for j = 0, 600 do
    local h = j / 600
    local m = model { r = r, h = h }
    if m.final.t_over_tf <= 0.5 and m.final.number > best then best, br, bh = m.final.number, r, h end
  end
end

local o = cp.optimize{
  parameters = { {name = "r", min = 1e3, max = 1e6, scale = "log"}, {name = "h", min = 0, max = 1} },
  evaluate = model, merit = "final.number",
  constraints = { {output = "final.t_over_tf", max = 0.5} } }
check("optimum is feasible", o.feasible and o.constraints[1].value <= 0.5 + 1e-6, o.constraints[1].value)
check("merit at least the scan's best (to 1e-6)", o.merit >= best * (1 - 1e-6), o.merit .. " vs " .. best)
-- the scan can miss the true optimum by one grid step: in h, N falls by exp(-h/0.5), i.e.
-- 2/600 = 0.33 % per step; in r the maximum is flat to second order
check("merit within one grid step (0.4 %) of the scan's best", o.merit <= best * 1.004, o.merit .. " vs " .. best)
-- grid steps: r by a factor 1000^(1/600) = 1.0116, h by 1/600
check("r within two grid steps of the scan", math.abs(math.log(o.parameters.r / br)) < 2 * math.log(1000) / 600,
  o.parameters.r .. " vs " .. br)
check("h within two grid steps of the scan", math.abs(o.parameters.h - bh) < 2 / 600, o.parameters.h .. " vs " .. bh)
check("the constraint is active (T/T_F = 0.5 to 1e-4)", math.abs(o.constraints[1].value - 0.5) < 1e-4)

-- Sensitivity: at the optimum r is a smooth maximum, so both sides lose merit; h sits on
-- the constraint, so -10 % of h is infeasible and gains merit, +10 % loses it.
local sr, sh = o.sensitivity[1], o.sensitivity[2]
check("sensitivity to r: both sides lower", sr.parameter == "r" and sr.minus.change < 0 and sr.plus.change < 0)
check("sensitivity to h: -10 % infeasible, +10 % lower",
  sh.minus.feasible == false and sh.plus.feasible and sh.plus.change < 0)
-- +10 % in h multiplies N by exp(-0.1 h / 0.5) (model above): the change by hand
check("sensitivity value by hand", math.abs(sh.plus.change - (math.exp(-0.1 * o.parameters.h / 0.5) - 1)) < 1e-9)

-- An optimum on a bound: maximise x over [0, 3] with merit -(x - 5)^2 -> x = 3.
local b = cp.optimize{ parameters = { {name = "x", min = 0, max = 3} },
  evaluate = function(p) return -(p.x - 5)^2 end }
check("optimum on the upper bound", math.abs(b.parameters.x - 3) < 1e-4, b.parameters.x)
-- Minimising, interior: (x - 2)^2 + 1 has its minimum 1 at x = 2.
local m = cp.optimize{ parameters = { {name = "x", min = 0, max = 10, start = 9} }, goal = "min",
  evaluate = function(p) return (p.x - 2)^2 + 1 end }
check("minimum at x = 2", math.abs(m.parameters.x - 2) < 1e-3 and math.abs(m.merit - 1) < 1e-6, m.parameters.x)
-- Failing evaluations are avoided, not fatal.
local f = cp.optimize{ parameters = { {name = "x", min = 0, max = 3} },
  evaluate = function(p) if p.x > 2.5 then error("plan fails") end return p.x end }
check("a failing region is avoided", f.parameters.x <= 2.5 and f.parameters.x > 2.49, f.parameters.x)

raises("unknown key", "did you mean 'constraints'", cp.optimize, { parameters = { {name = "x", min = 0, max = 1} },
  evaluate = function() return 1 end, constrains = {} })
raises("max below min", "must be larger than min", cp.optimize, { parameters = { {name = "x", min = 1, max = 0} },
  evaluate = function() return 1 end })
raises("log scale through 0", "needs min > 0", cp.optimize, { parameters = { {name = "x", min = 0, max = 1, scale = "log"} },
  evaluate = function() return 1 end })
raises("start outside", "outside", cp.optimize, { parameters = { {name = "x", min = 0, max = 1, start = 2} },
  evaluate = function() return 1 end })
raises("NaN bound", "min NaN SI units is not a number", cp.optimize, { parameters = { {name = "x", min = 0 / 0, max = 1} },
  evaluate = function() return 1 end })
raises("nothing evaluates", "no parameter set could be evaluated", cp.optimize,
  { parameters = { {name = "x", min = 0, max = 1} }, evaluate = function() error("always") end })
raises("nmsimplex: step count", "give one step per coordinate", cp.optim.nmsimplex,
  { f = function() return 0 end, start = {0, 0}, step = {1} })
raises("nmsimplex: objective error propagates", "boom", cp.optim.nmsimplex,
  { f = function() error("boom") end, start = {0}, step = {1} })
-- max_evaluations is a cap on calls of evaluate (the +-10 % report adds 2 per parameter):
-- counted here, outside the optimiser.
local calls = 0
local capped = cp.optimize{ parameters = { {name = "x", min = -3, max = 3}, {name = "y", min = -3, max = 3} },
  evaluate = function(p) calls = calls + 1; return -(p.x - 1)^2 - (p.y - 0.5)^2 end, max_evaluations = 30 }
check("max_evaluations caps the calls of evaluate", calls <= 30 + 2 * 2 and capped.evaluations <= 30,
  calls .. " calls, " .. capped.evaluations .. " reported")
-- A budget smaller than the starting simplex still reports its best point.
local many = {}
for i = 1, 12 do many[i] = { name = "x" .. i, min = 0, max = 1 } end
local tiny = cp.optimize{ parameters = many, max_evaluations = 10,
  evaluate = function(p) return p.x1 end }
check("a budget below the starting simplex returns its best point", tiny.merit ~= nil and tiny.parameters.x1 > 0.5,
  tiny.merit)
-- Any other error inside the simplex (here a constraint's getter failing after the
-- starting simplex) still goes up.
local getter_calls = 0
raises("an error inside the simplex propagates", "getter boom", cp.optimize,
  { parameters = { {name = "x", min = 0, max = 1} }, evaluate = function(p) return { n = p.x } end,
    merit = "n", constraints = { { max = 1, output = function(r)
      getter_calls = getter_calls + 1
      if getter_calls > 5 then error("getter boom") end
      return r.n
    end } } })

-- A misspelt merit or constraint path stops the search with a message naming it, the point,
-- the keys there and the closest (one edit away, by inspection), instead of every point
-- looking infeasible or failed.
local pars = {{name = "r", min = 1e3, max = 1e6, scale = "log"}, {name = "h", min = 0, max = 1}}
raises("misspelt constraint", "optimize: constraints[1].output 'final.t_over_tff' is missing from evaluate's result "
  .. "at r = ", cp.optimize, {parameters = pars, evaluate = model, merit = "final.number",
  constraints = {{output = "final.t_over_tff", max = 0.5}}, max_evaluations = 50})
raises("misspelt constraint: the closest", "('final' has the keys number, t_over_tf); did you mean 'final.t_over_tf'?",
  cp.optimize, {parameters = pars, evaluate = model, merit = "final.number",
  constraints = {{output = "final.t_over_tff", max = 0.5}}, max_evaluations = 50})
raises("misspelt merit", "optimize: merit 'final.numbr' is missing from evaluate's result at r = ", cp.optimize,
  {parameters = pars, evaluate = model, merit = "final.numbr", max_evaluations = 50})
raises("merit path into a number", "merit 'final.number.x' is missing at r = ", cp.optimize,
  {parameters = pars, evaluate = model, merit = "final.number.x", max_evaluations = 50})
-- "name?" (or a key the result declares in __fields) may be absent: an absent constraint
-- value is a violated constraint, so the optimum keeps to where it is present (h >= 0.5).
local function gappy(p)
  local m = model(p)
  if p.h < 0.5 then m.final.t_over_tf = nil end
  return setmetatable(m, {__fields = {final = {t_over_tf = true}}})
end
for _, spec in ipairs { "final.t_over_tf?", "final.t_over_tf" } do
  local g = cp.optimize{parameters = pars, evaluate = gappy, merit = "final.number",
    constraints = {{output = spec, max = 0.5}}, max_evaluations = 600}
  check("absent constraint value allowed (" .. spec .. ")", g.feasible and g.parameters.h >= 0.5
    and g.constraints[1].output == "final.t_over_tf", g.parameters.h)
end

raises("interrupt_note: text must be a string", "optim.interrupt_note: argument 'text' must be a string or nil, got number",
  cp.optim.interrupt_note, 3)
raises("interrupt_note: text missing", "argument 'text' must be a string or nil, got nothing", cp.optim.interrupt_note)
check("interrupt_note: a string and nil accepted", pcall(cp.optim.interrupt_note, "x") and pcall(cp.optim.interrupt_note, nil))
check("help texts", cp.get_help(cp.optimize.run) ~= nil and cp.get_help(cp.optim.nmsimplex) ~= nil)

T.done()
