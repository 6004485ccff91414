-- coldprep.optimize: the best settings of a plan.  cp.optimize maximises (or minimises) a
-- figure of merit over named parameters within bounds, subject to constraints on other
-- outputs, with GSL's Nelder-Mead simplex (cp.optim.nmsimplex, lua/bind/bind_optim.c).
--  * Bounds by transformation: the simplex moves an unbounded u per parameter, mapped to
--    x = lo + (hi - lo) / (1 + exp(-u)) (on log x for scale = "log"), so every trial point
--    lies inside the bounds (a standard device, e.g. Nocedal & Wright, Numerical
--    Optimization, 2nd ed., section 17; [M]).
--  * Constraints by an exact (L1) penalty: minimise -merit/scale + penalty * sum of the
--    relative violations; with a penalty weight above the constraint's Lagrange multiplier
--    the constrained optimum is a minimum of the penalised function (Nocedal & Wright
--    section 17.2 [M]).  scale = the largest |merit| on the starting simplex.
--  * Restarts: Nelder-Mead can stall; the search is restarted from its best point until a
--    restart improves the objective by less than the tolerance (common practice, no source).
--  * Ctrl-C: no Lua runs after an interruption, so the best point so far is kept as text in
--    a progress table that cp.optim.nmsimplex leaves for the program's "interrupted" message;
--    while the starting points and the +-10 % report are evaluated (outside the simplex)
--    the same text is kept current with cp.optim.interrupt_note.
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local RP = require "coldprep.result_path"

local M = {}

local function logistic(u) return 1 / (1 + math.exp(-u)) end

local function parse_parameters(fname, list)
  if type(list) ~= "table" or #list == 0 then
    A.fail(fname, "parameters must be a non-empty list of {name = ..., min = ..., max = ...}")
  end
  local params, seen = {}, {}
  for i, spec in ipairs(list) do
    if type(spec) ~= "table" then A.fail(fname, "parameters[%d] must be a table", i) end
    A.table(fname, spec, { "name", "min", "max", "start", "scale" })
    local name = spec.name
    if type(name) ~= "string" or name == "" or seen[name] then
      A.fail(fname, "parameters[%d] needs a unique name, got %s", i, tostring(name))
    end
    seen[name] = true
    local lo, hi = A.number(fname, spec, "min", "SI units"), A.number(fname, spec, "max", "SI units")
    local scale = A.option(fname, spec, "scale", { "linear", "log" }, "linear")
    if not (hi > lo) then
      A.fail(fname, "parameter '%s': max %s must be larger than min %s", name, hi, lo)
    end
    if scale == "log" and lo <= 0 then
      A.fail(fname, "parameter '%s': a logarithmic scale needs min > 0, got %s", name, lo)
    end
    local start = A.number(fname, spec, "start", "SI units",
      { optional = true, default = scale == "log" and math.sqrt(lo * hi) or (lo + hi) / 2 })
    if start < lo or start > hi then
      A.fail(fname, "parameter '%s': start %s is outside [%s, %s]", name, start, lo, hi)
    end
    local a, b = lo, hi
    if scale == "log" then a, b = math.log(lo), math.log(hi) end
    local p = { name = name, min = lo, max = hi, scale = scale }
    function p.from_u(u)
      local x = a + (b - a) * logistic(u)
      if scale == "log" then x = math.exp(x) end
      return math.min(hi, math.max(lo, x))
    end
    function p.to_u(x)
      local t = ((scale == "log" and math.log(x) or x) - a) / (b - a)
      t = math.min(1 - 1e-9, math.max(1e-9, t))
      return math.log(t / (1 - t))
    end
    p.start = start
    params[i] = p
  end
  return params
end

local function parse_constraints(fname, list)
  local out = {}
  if list == nil then return out end
  if type(list) ~= "table" then A.fail(fname, "constraints must be a list") end
  for i, c in ipairs(list) do
    if type(c) ~= "table" then A.fail(fname, "constraints[%d] must be a table", i) end
    A.table(fname, c, { "output", "min", "max" })
    if c.min == nil and c.max == nil then
      A.fail(fname, "constraints[%d] needs min or max", i)
    end
    local get, name = RP.compile(fname, string.format("constraints[%d].output", i), c.output, true)
    out[i] = {
      label = name or ("constraint " .. i),
      get = get,
      min = c.min ~= nil and A.number(fname, c, "min", "SI units") or nil,
      max = c.max ~= nil and A.number(fname, c, "max", "SI units") or nil,
    }
  end
  return out
end

-- How far `hi` exceeds `lo`, relative to the limit (absolute when the limit is 0).
local function relative_excess(hi, lo, limit)
  return (hi - lo) / (limit ~= 0 and math.abs(limit) or 1)
end

local function optimize(args)
  local fname = "optimize"
  A.table(fname, args, { "parameters", "evaluate", "merit", "goal", "constraints",
    "tolerance", "max_evaluations", "penalty" })
  local params = parse_parameters(fname, args.parameters)
  local evaluate = A.typed(fname, args, "evaluate", "function")
  -- merit_path: a merit named by a path, read outside the pcall (a misspelt name stops
  -- the search); a merit function's error fails only that point
  local merit_of = args.merit ~= nil and RP.compile(fname, "merit", args.merit, true) or nil
  local merit_path = type(args.merit) == "string"
  local goal = A.option(fname, args, "goal", { "max", "min" }, "max")
  local sign = goal == "max" and 1 or -1
  local constraints = parse_constraints(fname, args.constraints)
  local tol = A.number(fname, args, "tolerance", "SI units",
    { optional = true, default = 1e-5, positive = true })
  local max_evals = A.integer(fname, args, "max_evaluations", 4000, 10, 100000000)
  local penalty = A.number(fname, args, "penalty", "SI units",
    { optional = true, default = 100, positive = true })

  local function point_of(x)
    local p = {}
    for i, par in ipairs(params) do p[par.name] = x[i] end
    return p
  end

  -- "x = 1.5, y = 2": the parameters of point p
  local function point_text(p)
    local parts = {}
    for i, par in ipairs(params) do parts[i] = string.format("%s = %.10g", par.name, p[par.name]) end
    return table.concat(parts, ", ")
  end

  -- The value `get` reads from result at p; a missing one stops the search (the note of
  -- an interruption is cleared first, as nothing is running any more).
  local function read(get, result, p, where)
    local ok, v = pcall(get, result, p, where)
    if not ok then
      cp.optim.interrupt_note(nil)
      error(v, 0)
    end
    return v
  end

  -- Evaluate at x (a list of values): merit, constraint report, result; never raises for
  -- a failure of the plan (merit = nil and the message instead).
  local function assess(x)
    local p = point_of(x)
    local ok, result = pcall(evaluate, p)
    if ok and type(result) == "table" and type(result.run) == "function" then
      ok, result = pcall(result.run, result)
    end
    if not ok then return { failed = tostring(result), p = p } end
    local merit
    local function where() return "at " .. point_text(p) end
    if merit_path then
      merit = read(merit_of, result, p, where)
    elseif merit_of then
      ok, merit = pcall(merit_of, result, p)
      if not ok then return { failed = tostring(merit), p = p } end
    else
      merit = result
    end
    if not A.is_finite(merit) then
      return { failed = "the merit is " .. tostring(merit) .. " (not a finite number)", p = p }
    end
    local violation, report = 0, {}
    for i, c in ipairs(constraints) do
      local v = read(c.get, result, p, where)
      local excess = math.huge
      if A.is_finite(v) then
        excess = 0
        if c.max and v > c.max then excess = relative_excess(v, c.max, c.max) end
        if c.min and v < c.min then excess = relative_excess(c.min, v, c.min) end
      end
      violation = violation + excess
      report[i] = { output = c.label, value = v, min = c.min, max = c.max, satisfied = excess == 0 }
    end
    return { merit = merit, violation = violation, constraints = report, result = result, p = p,
      feasible = violation == 0 }
  end

  local function describe(a)
    local how = a.merit and string.format("merit %.10g, %s", a.merit, a.feasible and "feasible" or "infeasible")
      or "failed: " .. a.failed
    return point_text(a.p) .. " (" .. how .. ")"
  end

  -- The "interrupted" note outside the simplex: the phase, the evaluations so far and the
  -- best point so far (as the simplex's own note has it).
  local progress = { context = fname }
  local function note(phase, evaluations, best_text)
    cp.optim.interrupt_note(string.format("%s: stopped after %d evaluations (%s); best point so far: %s",
      fname, evaluations, phase, best_text or "none evaluated"))
  end

  -- Starting simplex in u: the start and a unit step along each u.  Until the penalised
  -- ranking exists (it needs the scale), the note names the best feasible merit so far.
  local u0, scale = {}, 0
  for i, par in ipairs(params) do u0[i] = par.to_u(par.start) end
  local function x_of(u)
    local x = {}
    for i, par in ipairs(params) do x[i] = par.from_u(u[i]) end
    return x
  end
  local start, lead = {}, nil
  note("starting points", 0, nil)
  for k = 0, #params do
    local u = table.move(u0, 1, #u0, 1, {})
    if k > 0 then u[k] = u[k] + 1 end
    local a = assess(x_of(u))
    a.u = u
    start[#start + 1] = a
    if a.merit then scale = math.max(scale, math.abs(a.merit)) end
    if a.merit and (not lead or (a.feasible and not lead.feasible) or
        (a.feasible == lead.feasible and sign * a.merit > sign * lead.merit)) then
      lead = a
    end
    note("starting points", k + 1, describe(lead or a))
  end
  cp.optim.interrupt_note(nil)
  if scale == 0 then scale = 1 end
  local big = 1e6 * (1 + penalty)
  local evaluations = #params + 1
  local best = nil

  local function consider(a)
    local f
    if not a.merit then
      f = big -- a failed plan ranks below every feasible or infeasible one
    else
      local v = a.violation
      if v == math.huge then v = 1e6 end
      f = -sign * a.merit / scale + penalty * v
    end
    if not best or f < best.f then
      best = a
      best.f = f
      progress.best = describe(a)
    end
    return f
  end
  for _, a in ipairs(start) do consider(a) end

  -- Raised (a unique table) inside the simplex once max_evaluations are spent; the search
  -- stops there with the best point so far.  Any other error (Ctrl-C) goes on up.
  local OUT_OF_BUDGET = {}
  local function objective(u)
    if evaluations >= max_evals then error(OUT_OF_BUDGET) end
    evaluations = evaluations + 1
    local a = assess(x_of(u))
    a.u = u
    return consider(a)
  end

  local u, last_f, iterations, converged = u0, nil, 0, false
  for _ = 1, 20 do
    local budget = max_evals - evaluations
    if budget < #params + 2 then break end
    local steps = {}
    for i = 1, #params do steps[i] = 1 end
    local ok, r = pcall(cp.optim.nmsimplex, { f = objective, start = u, step = steps,
      tolerance = tol, max_iterations = budget, progress = progress })
    if not ok then
      if r ~= OUT_OF_BUDGET then error(r, 0) end
      converged = false
      break
    end
    iterations = iterations + r.iterations
    converged = r.converged
    u = best.u
    if last_f and last_f - best.f <= tol * math.max(1, math.abs(best.f)) then break end
    last_f = best.f
    if evaluations >= max_evals then break end
  end

  if not best.merit then
    A.fail(fname, "no parameter set could be evaluated; the last failure: %s", best.failed)
  end
  local out = { parameters = {}, merit = best.merit, result = best.result, feasible = best.feasible,
    constraints = best.constraints, evaluations = evaluations, iterations = iterations,
    converged = converged, goal = goal, sensitivity = {} }
  local xbest = {}
  for i, par in ipairs(params) do
    xbest[i] = best.p[par.name]
    out.parameters[par.name] = xbest[i]
  end
  -- How the merit changes at -10 % and +10 % of each parameter, the others held (10 %
  -- of the range for a parameter that sits at 0).
  local reported = evaluations
  for i, par in ipairs(params) do
    local row = { parameter = par.name, value = xbest[i] }
    local step = xbest[i] ~= 0 and 0.1 * xbest[i] or 0.1 * (par.max - par.min)
    for _, side in ipairs { { "minus", -1 }, { "plus", 1 } } do
      local x = table.move(xbest, 1, #xbest, 1, {})
      x[i] = xbest[i] + side[2] * step
      note("in the +-10 % report", reported, progress.best)
      local a = assess(x)
      reported = reported + 1
      row[side[1]] = {
        value = x[i], merit = a.merit, feasible = a.feasible or false, failed = a.failed,
        change = a.merit and (a.merit - best.merit) / (best.merit ~= 0 and math.abs(best.merit) or 1),
        outside_bounds = x[i] < par.min or x[i] > par.max,
      }
    end
    out.sensitivity[i] = row
  end
  cp.optim.interrupt_note(nil)
  return out
end

cp.set_help(optimize, [[
cp.optimize{parameters = {{name = "x", min = a, max = b [, start = x0] [, scale = "log"]}, ...},
            evaluate = function(p) ... end [, merit = "final.number" | function(result, p)]
            [, goal = "max" | "min"] [, constraints = {{output = "final.t_over_tf", max = 0.5}, ...}]
            [, tolerance = 1e-5] [, max_evaluations = 4000] [, penalty = 100]}
(max_evaluations caps the search; the +-10 % report adds 2 evaluations per parameter)
Find the parameters (within [min, max], SI units) that maximise (goal = "max", default)
or minimise the merit of evaluate(p) - a number, or the value merit names in the result
table (a path missing from a result is an error, unless it ends in "?" or the result
declares it: nil there); a returned plan is run.  Constraints (min and/or max on an
output) are kept by an exact penalty; GSL's Nelder-Mead simplex searches on bounded,
log-aware coordinates.
Returns {parameters = {x = ...}, merit, result, feasible, constraints = {{output, value,
 min, max, satisfied}}, evaluations, iterations, converged, goal,
 sensitivity = {{parameter, value, minus = {value, merit, change, feasible, outside_bounds},
                 plus = {...}}}}   -- change = relative change of the merit at -10 % / +10 %.
Example: cp.optimize{parameters = {{name = "x", min = 0, max = 3}},
                     evaluate = function(p) return -(p.x - 2)^2 end}.parameters.x  --> 2]])

M.run = optimize
return setmetatable(M, { __call = function(_, args) return optimize(args) end })
