-- cp.uncertainty and cp.random: zero widths reproduce the plain evaluation; the same seed
-- gives the same draws; sample statistics agree with the distributions' moments within
-- their standard errors; the probability of degeneracy agrees with a case computed by
-- hand; Spearman's rho matches the no-ties formula rho = 1 - 6 sum d^2 / (n (n^2 - 1))
-- (Spearman 1904); the ranking puts the dominant input first; bad input is refused.
local T = require "testlib"
local check, raises = T.expect, T.raises_named

-- A plan-like model: molecule number and T/T_F from a ramp rate, a hold and a loss rate.
local function model(p)
  local n = 1e5 * math.exp(-2e3 / p.r) * (1 - math.exp(-4e4 / p.r)) * math.exp(-p.h * p.loss)
  local t = 0.1 + 0.9 * math.exp(-p.h / 0.25)
  return { final = { number = n, t_over_tf = t }, degenerate = t <= 0.5 }
end
local plain = model { r = 1.3e4, h = 0.3, loss = 2 }

-- Zero widths: every draw is the plain plan.
local z = cp.uncertainty{
  parameters = { {name = "r", distribution = "normal", mean = 1.3e4, sd = 0},
                 {name = "h", distribution = "uniform", min = 0.3, max = 0.3},
                 {name = "loss", distribution = "lognormal", median = 2, sigma = 0} },
  evaluate = model, outputs = { "final.number", "final.t_over_tf" }, samples = 50, seed = 7 }
local zn = z.outputs["final.number"]
check("zero widths: every sample equals the plain plan",
  zn.min == plain.final.number and zn.max == plain.final.number and zn.sd == 0, zn.min .. " " .. plain.final.number)
check("zero widths: T/T_F equals the plain plan", z.outputs["final.t_over_tf"].mean == plain.final.t_over_tf)
check("zero widths: nominal equals the plain plan", z.nominal["final.number"] == plain.final.number)
check("zero widths: degeneracy certain", z.probability_degenerate == 1 and z.probability_error == 0)
check("zero widths: no rank correlation", z.ranking["final.number"][1].rank_correlation == nil)

-- Uncertain hold (uniform 0.1 .. 0.4 s) and loss; degenerate when T/T_F <= 0.5, i.e.
-- h >= 0.25 ln(9/4) = 0.2027 s (from the model by hand): P = (0.4 - 0.2027) / 0.3.
local args = {
  parameters = { {name = "r", distribution = "lognormal", median = 1.3e4, sigma = 0.05},
                 {name = "h", distribution = "uniform", min = 0.1, max = 0.4},
                 {name = "loss", distribution = "normal", mean = 2, sd = 0.2} },
  evaluate = model, outputs = { "final.number", "final.t_over_tf" }, samples = 4000, seed = 11 }
local u = cp.uncertainty(args)
local p_hand = (0.4 - 0.25 * math.log(9 / 4)) / 0.3
local se = math.sqrt(p_hand * (1 - p_hand) / 4000)
check("P(degenerate) within 4 standard errors of the hand value",
  math.abs(u.probability_degenerate - p_hand) < 4 * se, u.probability_degenerate .. " vs " .. p_hand)
check("T/T_F is driven by the hold only", u.ranking["final.t_over_tf"][1].parameter == "h"
  and math.abs(u.ranking["final.t_over_tf"][1].rank_correlation + 1) < 1e-12)
check("the hold matters most overall", u.importance[1].parameter == "h")
local again = cp.uncertainty(args)
check("same seed, same result", again.outputs["final.number"].mean == u.outputs["final.number"].mean
  and again.rows[123].r == u.rows[123].r)
args.seed = 12
check("another seed, other draws", cp.uncertainty(args).rows[1].r ~= u.rows[1].r)

-- Summary statistics by hand on five known values (the evaluation returns them in a
-- shuffled order whatever the draw; the first call is the nominal one): sorted 10..50,
-- mean 30, sd sqrt(1000 / 4); quantiles by Hyndman & Fan's type 7, h = 4 q + 1:
-- p05 = 10 + 0.2 * 10 = 12, p16 = 16.4, median 30, p84 = 43.6, p95 = 48.
local fixed, call = {[0] = 0, 40, 10, 50, 30, 20}, -1
local st = cp.uncertainty{parameters = {{name = "x", distribution = "uniform", min = 0, max = 1}},
  evaluate = function() call = call + 1; return {y = fixed[call]} end, outputs = {"y"}, samples = 5}
local sy = st.outputs.y
local function near(a, b) return math.abs(a - b) < 1e-12 end
check("summary by hand", sy.n == 5 and near(sy.mean, 30) and near(sy.sd, math.sqrt(250)) and sy.min == 10
  and sy.max == 50 and near(sy.p05, 12) and near(sy.p16, 16.4) and near(sy.median, 30) and near(sy.p84, 43.6)
  and near(sy.p95, 48), string.format("%g %g %g %g %g %g", sy.mean, sy.sd, sy.p05, sy.p16, sy.p84, sy.p95))

-- Moments of the generators: mean within 4 standard errors (n = 20000).
local g = cp.random.generator{seed = 5}
local n, s1, s2, below = 20000, 0, 0, 0
for _ = 1, n do
  local x = g:normal{mean = 3, sd = 2}
  s1, s2 = s1 + x, s2 + x * x
end
local mean = s1 / n
check("normal: mean 3 within 4 standard errors", math.abs(mean - 3) < 4 * 2 / math.sqrt(n), mean)
check("normal: sd 2 within 3 %", math.abs(math.sqrt(s2 / n - mean^2) / 2 - 1) < 0.03)
for _ = 1, n do if g:lognormal{median = 5, sigma = 0.7} < 5 then below = below + 1 end end
check("lognormal: half below the median", math.abs(below / n - 0.5) < 4 * 0.5 / math.sqrt(n), below / n)
local su = 0
for _ = 1, n do su = su + g:uniform{min = -1, max = 3} end
-- uniform on [-1, 3]: mean 1, sd 4/sqrt(12)
check("uniform: mean 1 within 4 standard errors", math.abs(su / n - 1) < 4 * (4 / math.sqrt(12)) / math.sqrt(n))

-- Spearman's rho against the no-ties formula: d = (-1, 1, -1, 1, 0), rho = 1 - 24/120.
check("Spearman rho = 0.8", math.abs(cp.uncertainty.rank_correlation{x = {1, 2, 3, 4, 5}, y = {2, 1, 4, 3, 5}}.rho - 0.8) < 1e-15)
-- With ties (average ranks): x = 1..4, y = {1, 2, 2, 3} -> ranks 1, 2.5, 2.5, 4; Pearson of
-- ranks = 4.5 / sqrt(5 * 4.5) = 0.9486832980505138 (by hand).
check("Spearman rho with ties", math.abs(cp.uncertainty.rank_correlation{x = {1, 2, 3, 4}, y = {1, 2, 2, 3}}.rho - 4.5 / math.sqrt(22.5)) < 1e-15)

-- Failing evaluations are counted, not fatal.
local f = cp.uncertainty{ parameters = { {name = "x", distribution = "uniform", min = 0, max = 1} },
  evaluate = function(p) if p.x > 0.5 then error("no") end return {y = p.x} end, outputs = {"y"},
  samples = 400, seed = 3 }
check("failures counted", f.failed > 150 and f.failed < 250 and f.outputs.y.n == 400 - f.failed)
check("no degeneracy flag, no probability", f.probability_degenerate == nil)

raises("unknown distribution", "normal, uniform or lognormal", cp.uncertainty,
  { parameters = { {name = "x", distribution = "gauss", mean = 0, sd = 1} }, evaluate = model, outputs = {"y"} })
-- sigma is 4 edits from sd and mean, more than a third of its length: no suggestion
-- (cp.names.closest's cut-off), the keys a normal distribution takes instead.
raises("key of another distribution", "unknown argument 'sigma' (known: name, distribution, mean, sd)", cp.uncertainty,
  { parameters = { {name = "x", distribution = "normal", mean = 0, sigma = 1} }, evaluate = model, outputs = {"y"} })
raises("negative width", "widths must be >= 0", cp.uncertainty,
  { parameters = { {name = "x", distribution = "normal", mean = 0, sd = -1} }, evaluate = model, outputs = {"y"} })
raises("NaN mean", "mean NaN SI units is not a number", cp.uncertainty,
  { parameters = { {name = "x", distribution = "normal", mean = 0 / 0, sd = 1} }, evaluate = model, outputs = {"y"} })
raises("one sample", "samples 1 is out of range; allowed [2,", cp.uncertainty,
  { parameters = { {name = "x", distribution = "normal", mean = 0, sd = 1} }, evaluate = model, outputs = {"y"}, samples = 1 })
-- A draw with a non-finite output is a failed draw, kept out of the statistics: here
-- y = NaN above x = 1, so the statistics are those of the draws below 1 (checked by hand
-- against the rows).
local half = cp.uncertainty{parameters = {{name = "x", distribution = "normal", mean = 1, sd = 0.1}},
  evaluate = function(p) return {y = p.x > 1 and 0 / 0 or p.x} end, outputs = {"y"}, samples = 200}
local below, top = 0, -math.huge
for _, r in ipairs(half.rows) do
  if r.x <= 1 then below, top = below + 1, math.max(top, r.x) end
end
check("NaN outputs are failed draws", half.failed == 200 - below and half.outputs.y.n == below
  and half.outputs.y.max == top and half.outputs.y.mean == half.outputs.y.mean, half.failed)
raises("degenerate: max must be a number", "argument 'max' must be a number", cp.uncertainty,
  {parameters = {{name = "x", distribution = "normal", mean = 1, sd = 0.1}}, outputs = {"y"},
   evaluate = function(p) return {y = p.x} end, degenerate = {output = "y", max = "0.5"}})
-- A named value missing from a result is refused, never read as nil: the message names the
-- value, the point, the keys there and the closest (one edit away here, by inspection).
local one = {{name = "x", distribution = "normal", mean = 1, sd = 0.1}}
raises("misspelt output", "uncertainty: output 'final.numbr' is missing from evaluate's result at the nominal point "
  .. "('final' has the keys number, t_over_tf); did you mean 'final.number'?", cp.uncertainty,
  {parameters = one, evaluate = function() return plain end, outputs = {"final.numbr"}, samples = 10})
raises("misspelt degenerate", "uncertainty: degenerate 'degenerat' is missing from evaluate's result at the nominal "
  .. "point (the result has the keys degenerate, final); did you mean 'degenerate'?", cp.uncertainty,
  {parameters = one, evaluate = function() return plain end, outputs = {"final.number"}, degenerate = "degenerat",
   samples = 10})
raises("misspelt degenerate.output", "degenerate.output 'final.t_over_t' is missing", cp.uncertainty,
  {parameters = one, evaluate = function() return plain end, outputs = {"final.number"},
   degenerate = {output = "final.t_over_t", max = 0.5}, samples = 10})
raises("output not a name", "uncertainty: outputs[2] must be a result name (string), got number", cp.uncertainty,
  {parameters = one, evaluate = function() return plain end, outputs = {"final.number", 3}, samples = 10})
raises("output only a '?'", "uncertainty: output must be a result name (string), got '?'", cp.uncertainty,
  {parameters = one, evaluate = function() return plain end, outputs = {"?"}, samples = 10})
raises("first draw lacking an output", "output 'y' is missing from evaluate's result at draw 1", cp.uncertainty,
  {parameters = one, evaluate = function(p) return {y = p.x == 1 and 1 or nil} end, outputs = {"y"}, samples = 10})
-- "y?" (or a key the result declares in __fields) may be absent: that draw fails, as a
-- non-finite output does; the output keeps its name without the "?".
local gaps = cp.uncertainty{parameters = {{name = "x", distribution = "uniform", min = 0, max = 2}},
  evaluate = function(p) return {y = p.x <= 1 and p.x or nil} end, outputs = {"y?"}, samples = 200, seed = 5}
local low = 0
for _, r in ipairs(gaps.rows) do if r.x <= 1 then low = low + 1 end end
check("an optional output absent: a failed draw", gaps.failed == 200 - low and gaps.outputs.y.n == low, gaps.failed)
local fields = {__fields = {y = true}}
local decl = cp.uncertainty{parameters = {{name = "x", distribution = "uniform", min = 0, max = 2}},
  evaluate = function(p) return setmetatable({y = p.x <= 1 and p.x or nil}, fields) end, outputs = {"y"},
  samples = 200, seed = 5}
check("a declared output absent: a failed draw", decl.failed == gaps.failed, decl.failed)
check("the absent output named in the row", gaps.rows[1].x <= 1 or gaps.rows[1].error == "output 'y' is absent")
raises("rank correlation: lengths", "equal length", cp.uncertainty.rank_correlation, {x = {1, 2}, y = {1}})
raises("generator: negative sd", "negative", g.normal, g, {mean = 0, sd = -1})
raises("generator: bad seed", "seed", cp.random.generator, {seed = -1})
check("help texts", cp.get_help(cp.uncertainty.run) ~= nil and cp.get_help(cp.random.generator) ~= nil)

T.done()
