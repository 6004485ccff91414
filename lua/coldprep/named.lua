-- coldprep.named: the argument checks of the sweep, optimisation, uncertainty and plot
-- layers.  The common ones are coldprep.argcheck's (same messages as lua/bind/args.c); this
-- adds the few these layers need besides: integers in a range, values of a Lua type, and
-- a finiteness test.
local argcheck = require "coldprep.argcheck"

local M = {}

M.fail = argcheck.fail     -- fail(fname, fmt, ...): raise "fname: message"
M.check = argcheck.table   -- check(fname, args, known): unknown keys suggest the closest
M.option = argcheck.option -- option(fname, args, key, options [, default])

local function is_finite(x)
  return type(x) == "number" and x == x and x ~= math.huge and x ~= -math.huge
end
M.is_finite = is_finite

-- A finite number under key (required unless dflt ~= nil); what = "positive",
-- "nonnegative" or nil; unit names the unit in messages (default: SI units).
function M.number(fname, t, key, dflt, what, unit)
  return argcheck.number(fname, t, key, unit or "SI units", { optional = dflt ~= nil,
    default = dflt, positive = what == "positive", nonnegative = what == "nonnegative" })
end

-- An integer under key in [lo, hi] (dflt when absent).
function M.integer(fname, t, key, dflt, lo, hi)
  local v = t[key]
  if v == nil and dflt ~= nil then return dflt end
  if math.type(v) ~= "integer" and not (is_finite(v) and v == math.floor(v)) then
    M.fail(fname, "argument '%s' must be an integer, got %s", key, tostring(v))
  end
  local iv = math.tointeger(v) -- nil for a whole float beyond the integers (1e300)
  if iv == nil or iv < lo or iv > hi then
    M.fail(fname, "argument '%s' is %s; allowed %d to %d", key, tostring(v), lo, hi)
  end
  return iv
end

-- A value of Lua type `ty` under key (required unless dflt ~= nil).
function M.typed(fname, t, key, ty, dflt)
  local v = t[key]
  if v == nil then
    if dflt ~= nil then return dflt end
    M.fail(fname, "missing argument '%s' (a %s)", key, ty)
  end
  if type(v) ~= ty then
    M.fail(fname, "argument '%s' must be a %s, got %s", key, ty, type(v))
  end
  return v
end

-- A reader of one value of a result table: a dotted path "final.t_over_tf" (nil when a
-- step of it is missing) or a function(result, p) used as it is.  `what` names the
-- argument in the message for anything else.
function M.result_getter(fname, what, spec)
  if type(spec) == "function" then return spec end
  if type(spec) ~= "string" then
    M.fail(fname, "%s must be a result name (string) or a function(result, p), got %s", what,
      type(spec))
  end
  local parts = {}
  for part in spec:gmatch("[^.]+") do parts[#parts + 1] = part end
  return function(result)
    local v = result
    for _, k in ipairs(parts) do
      if type(v) ~= "table" then return nil end
      v = v[k]
    end
    return v
  end
end

return M
