-- coldprep.uncertainty: how robust a plan is to what is not known well.  cp.uncertainty
-- draws the uncertain inputs from their distributions (normal, uniform, log-normal;
-- reproducible through the seed of a GSL MT19937 generator, cp.random), evaluates the plan
-- at every draw, and reports the distribution of the chosen outputs, the probability that
-- the plan reaches degeneracy, and which input's uncertainty matters most, ranked by
-- Spearman's rank correlation between each input and each output (Spearman 1904; the
-- usual sampling-based sensitivity measure, e.g. Saltelli et al., Sensitivity Analysis in
-- Practice, 2004, ch. 1 [M]).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local RP = require "coldprep.result_path"

local M = {}

local DISTRIBUTIONS = {
  normal = { keys = { "mean", "sd" }, centre = function(s) return s.mean end,
    draw = function(g, s) return g:normal { mean = s.mean, sd = s.sd } end },
  uniform = { keys = { "min", "max" }, centre = function(s) return (s.min + s.max) / 2 end,
    draw = function(g, s) return g:uniform { min = s.min, max = s.max } end },
  lognormal = { keys = { "median", "sigma" }, centre = function(s) return s.median end,
    draw = function(g, s) return g:lognormal { median = s.median, sigma = s.sigma } end },
}

local function parse_parameters(fname, list)
  if type(list) ~= "table" or #list == 0 then
    A.fail(fname, "parameters must be a non-empty list such as " ..
      "{{name = \"x\", distribution = \"normal\", mean = 1, sd = 0.1}}")
  end
  local params, seen = {}, {}
  for i, spec in ipairs(list) do
    if type(spec) ~= "table" then A.fail(fname, "parameters[%d] must be a table", i) end
    local dist = DISTRIBUTIONS[spec.distribution]
    if not dist then
      A.fail(fname, "parameters[%d]: distribution must be normal, uniform or lognormal, got %s",
        i, tostring(spec.distribution))
    end
    local known = { "name", "distribution" }
    for _, k in ipairs(dist.keys) do known[#known + 1] = k end
    A.table(fname, spec, known)
    if type(spec.name) ~= "string" or spec.name == "" or seen[spec.name] then
      A.fail(fname, "parameters[%d] needs a unique name, got %s", i, tostring(spec.name))
    end
    seen[spec.name] = true
    local p = { name = spec.name, distribution = spec.distribution, dist = dist }
    for _, k in ipairs(dist.keys) do p[k] = A.number(fname, spec, k, "SI units") end
    local bad = (p.sd and p.sd < 0) or (p.sigma and p.sigma < 0) or (p.median and p.median <= 0)
      or (p.max and p.max < p.min)
    if bad then
      A.fail(fname, "parameter '%s': widths must be >= 0, a median > 0 and max >= min", p.name)
    end
    params[i] = p
  end
  return params
end

-- Quantile q of sorted values (linear interpolation between order statistics, the
-- "type 7" rule of Hyndman & Fan 1996).
local function quantile(sorted, q)
  local n = #sorted
  if n == 0 then return nil end
  local h = (n - 1) * q + 1
  local lo = math.floor(h)
  if lo >= n then return sorted[n] end
  return sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo])
end

local function summary(values)
  local n, sum = #values, 0
  if n == 0 then return { n = 0 } end
  -- shifted by the first value: exact for constant samples, and less cancellation
  local shift = values[1]
  for _, v in ipairs(values) do sum = sum + (v - shift) end
  local mean, ss = shift + sum / n, 0
  for _, v in ipairs(values) do ss = ss + (v - mean)^2 end
  local sorted = table.move(values, 1, n, 1, {})
  table.sort(sorted)
  return { n = n, mean = mean, sd = n > 1 and math.sqrt(ss / (n - 1)) or 0,
    min = sorted[1], max = sorted[n], median = quantile(sorted, 0.5),
    p05 = quantile(sorted, 0.05), p16 = quantile(sorted, 0.16),
    p84 = quantile(sorted, 0.84), p95 = quantile(sorted, 0.95) }
end

-- Ranks 1..n with ties given their average rank.
local function ranks(values)
  local n, idx = #values, {}
  for i = 1, n do idx[i] = i end
  table.sort(idx, function(a, b) return values[a] < values[b] end)
  local r, i = {}, 1
  while i <= n do
    local j = i
    while j < n and values[idx[j + 1]] == values[idx[i]] do j = j + 1 end
    local avg = (i + j) / 2
    for k = i, j do r[idx[k]] = avg end
    i = j + 1
  end
  return r
end

-- Spearman's rho: the Pearson correlation of the ranks; nil when either is constant.
local function spearman(x, y)
  local rx, ry, n = ranks(x), ranks(y), #x
  local mx, my = (n + 1) / 2, (n + 1) / 2
  local sxy, sxx, syy = 0, 0, 0
  for i = 1, n do
    local dx, dy = rx[i] - mx, ry[i] - my
    sxy, sxx, syy = sxy + dx * dy, sxx + dx * dx, syy + dy * dy
  end
  if sxx == 0 or syy == 0 then return nil end
  return sxy / math.sqrt(sxx * syy)
end

function M.rank_correlation(args)
  local fname = "uncertainty.rank_correlation"
  A.table(fname, args, { "x", "y" })
  local x, y = A.typed(fname, args, "x", "table"), A.typed(fname, args, "y", "table")
  if #x ~= #y or #x < 2 then A.fail(fname, "x and y must be lists of equal length >= 2") end
  for i = 1, #x do
    if not (A.is_finite(x[i]) and A.is_finite(y[i])) then
      A.fail(fname, "x[%d] and y[%d] must be finite numbers", i, i)
    end
  end
  return { rho = spearman(x, y) }
end

cp.set_help(M.rank_correlation, [[
uncertainty.rank_correlation{x = {...}, y = {...}}: Spearman's rank correlation of two
equally long lists (ties get their average rank).  Returns {rho} (rho = nil when either
list is constant).  Example: cp.uncertainty.rank_correlation{x = {1, 2, 3}, y = {1, 4, 9}}.rho --> 1]])

local function run(args)
  local fname = "uncertainty"
  A.table(fname, args, { "parameters", "evaluate", "outputs", "degenerate", "samples", "seed" })
  local params = parse_parameters(fname, args.parameters)
  local evaluate = A.typed(fname, args, "evaluate", "function")
  local outputs = A.typed(fname, args, "outputs", "table")
  if #outputs == 0 then A.fail(fname, "outputs must list at least one result name") end
  -- names[i]: outputs[i] without a "?" (a value that may be absent: the draw then fails)
  local getters, names = {}, {}
  for i, o in ipairs(outputs) do
    if type(o) ~= "string" then
      A.fail(fname, "outputs[%d] must be a result name (string), got %s", i, type(o))
    end
    getters[i], names[i] = RP.compile(fname, "output", o)
  end
  local degenerate = args.degenerate
  if degenerate == nil then degenerate = "degenerate" end
  local is_degenerate
  if type(degenerate) == "table" then
    A.table(fname, degenerate, { "output", "max", "min" })
    local get = RP.compile(fname, "degenerate.output",
      A.typed(fname, degenerate, "output", "string"))
    local lo = degenerate.min ~= nil and A.number(fname, degenerate, "min", "SI units") or nil
    local hi = degenerate.max ~= nil and A.number(fname, degenerate, "max", "SI units") or nil
    if lo == nil and hi == nil then A.fail(fname, "degenerate needs min or max") end
    is_degenerate = function(result, p, where)
      local v = get(result, p, where)
      if not A.is_finite(v) then return nil end
      return (hi == nil or v <= hi) and (lo == nil or v >= lo)
    end
  elseif type(degenerate) == "string" or type(degenerate) == "function" then
    -- the default may be absent (a result that says nothing about degeneracy)
    is_degenerate = RP.compile(fname, "degenerate",
      args.degenerate == nil and "degenerate?" or degenerate, true)
  else
    A.fail(fname, "degenerate must be a result name, a function(result, p) or " ..
      "{output = ..., max = ...}, got %s", type(degenerate))
  end
  local samples = A.integer(fname, args, "samples", 1000, 2, 100000000)
  local seed = A.integer(fname, args, "seed", 1, 0, 4294967295)

  local function evaluate_at(p)
    local arg = {}
    for k, v in pairs(p) do arg[k] = v end
    local ok, result = pcall(evaluate, arg)
    if ok and type(result) == "table" and type(result.run) == "function" then
      ok, result = pcall(result.run, result)
    end
    return ok, result
  end

  -- The outputs of a result (nil where one may be absent and is), raising for a missing
  -- one or one that is not a number; `where` names the draw.
  local function outputs_of(result, where)
    local vals = {}
    for i = 1, #outputs do
      local v = getters[i](result, nil, where)
      if v ~= nil and type(v) ~= "number" then
        error(string.format("%s: output '%s' is %s, not a number", fname, names[i], tostring(v)), 0)
      end
      vals[i] = v
    end
    return vals
  end

  -- The plan at the centre of every distribution.
  local centre = {}
  for _, p in ipairs(params) do centre[p.name] = p.dist.centre(p) end
  local ok, nominal_result = evaluate_at(centre)
  local nominal = { parameters = centre, error = (not ok) and tostring(nominal_result) or nil }
  if ok then
    local at = "at the nominal point"
    local vals = outputs_of(nominal_result, at)
    for i, o in ipairs(names) do nominal[o] = vals[i] end
    nominal.degenerate = is_degenerate(nominal_result, centre, at)
  end

  local g <close> = cp.random.generator { seed = seed }
  local inputs, values, rows = {}, {}, {}
  for _, p in ipairs(params) do inputs[p.name] = {} end
  for i = 1, #outputs do values[i] = {} end
  local n_ok, n_failed, n_degenerate, n_known = 0, 0, 0, 0
  for s = 1, samples do
    local p = {}
    for _, par in ipairs(params) do p[par.name] = par.dist.draw(g, par) end
    local row = {}
    for k, v in pairs(p) do row[k] = v end
    local good, result = evaluate_at(p)
    local vals, at = nil, "at draw " .. s
    if good then
      vals = outputs_of(result, at)
      for i = 1, #outputs do
        local v = vals[i]
        if not A.is_finite(v) then -- it would poison the mean and the sorting
          good, result = false, string.format("output '%s' is %s", names[i],
            v == nil and "absent" or tostring(v))
          break
        end
      end
    end
    if good then
      n_ok = n_ok + 1
      for _, par in ipairs(params) do inputs[par.name][n_ok] = p[par.name] end
      for i, o in ipairs(names) do
        values[i][n_ok] = vals[i]
        row[o] = vals[i]
      end
      local d = is_degenerate(result, p, at)
      if d ~= nil then
        n_known = n_known + 1
        if d then n_degenerate = n_degenerate + 1 end
      end
      row.degenerate = d
    else
      n_failed = n_failed + 1
      row.error = tostring(result)
    end
    rows[s] = row
  end

  local out = { samples = samples, seed = seed, failed = n_failed, nominal = nominal,
    outputs = {}, ranking = {}, importance = {}, rows = rows }
  for i, o in ipairs(names) do out.outputs[o] = summary(values[i]) end
  if n_known > 0 then
    -- failed evaluations count as not degenerate
    local pdeg = n_degenerate / samples
    out.probability_degenerate = pdeg
    out.probability_error = math.sqrt(pdeg * (1 - pdeg) / samples) -- binomial standard error
  end
  local score = {}
  for i, o in ipairs(names) do
    local list = {}
    for _, par in ipairs(params) do
      local rho = n_ok > 1 and spearman(inputs[par.name], values[i]) or nil
      list[#list + 1] = { parameter = par.name, rank_correlation = rho }
      score[par.name] = math.max(score[par.name] or 0, rho and math.abs(rho) or 0)
    end
    table.sort(list, function(a, b)
      local ra, rb = math.abs(a.rank_correlation or 0), math.abs(b.rank_correlation or 0)
      if ra ~= rb then return ra > rb end
      return a.parameter < b.parameter
    end)
    out.ranking[o] = list
  end
  for _, par in ipairs(params) do
    out.importance[#out.importance + 1] = { parameter = par.name, score = score[par.name] }
  end
  table.sort(out.importance, function(a, b)
    if a.score ~= b.score then return a.score > b.score end
    return a.parameter < b.parameter
  end)
  return out
end

cp.set_help(run, [[
cp.uncertainty{parameters = {...}, evaluate = function(p) ... end, outputs = {"final.number", ...}
               [, degenerate = "degenerate" | function(result, p) | {output = ..., max = ...}]
               [, samples = 1000] [, seed = 1]}
Monte Carlo over uncertain inputs.  Each parameter: {name = "x", distribution = "normal",
mean = m, sd = s} | {..., distribution = "uniform", min = a, max = b} |
{..., distribution = "lognormal", median = m, sigma = s (width of ln x)}; SI units.
evaluate(p) returns a result table (a returned plan is run); outputs name numbers in it
(dotted paths); a name missing from a result is an error naming the keys there, unless it
ends in "?" or the result declares it (a plan's budget): that draw then fails.
Returns {samples, seed, failed (evaluations that raised or gave a non-finite output), nominal (at the centres),
 outputs = {[name] = {n, mean, sd, median, p05, p16, p84, p95, min, max}},
 probability_degenerate, probability_error (binomial standard error),
 ranking = {[output] = {{parameter, rank_correlation}, ...} by |Spearman rho|},
 importance = {{parameter, score = max |rho| over outputs}, ...}, rows = the draws}.
The same seed gives the same draws; zero widths give the nominal plan at every draw.
Example: cp.uncertainty{parameters = {{name = "x", distribution = "normal", mean = 1, sd = 0.1}},
           evaluate = function(p) return {y = p.x^2} end, outputs = {"y"}, samples = 200}]])

M.run = run
return setmetatable(M, { __call = function(_, args) return run(args) end })
