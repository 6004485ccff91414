-- coldprep.argcheck: named-argument checks for the Lua-side library (species, plans, stages,
-- sweeps, optimisation, uncertainty, plots),
-- with the same messages as the C readers in lua/bind/args.c:
--   "stages.transfer: missing argument 'width' (s)",
--   "stages.hold: unknown argument 'duraton' (did you mean 'duration'?)".
-- Every reader takes the function name used in the message, the argument table and a key.
local cp = require "coldprep" -- the C bindings (cp.names, cp.consts), opened before this file
local M = {}

-- The name in `known` closest to `key` (edit distance), or nil when none is close enough
-- to be a likely misspelling (cp.names.closest) or `known` is empty.
function M.closest(key, known)
  return cp.names.closest(key, known)
end

local function fail(fname, fmt, ...)
  error(fname .. ": " .. string.format(fmt, ...), 0)
end
M.fail = fail

-- `args` must be a table whose keys are all in `known`.
function M.table(fname, args, known)
  if type(args) ~= "table" then
    fail(fname, "expects one table of named arguments, got %s (call it as %s{...})", type(args), fname)
  end
  for k in pairs(args) do
    if type(k) ~= "string" then
      fail(fname, "argument keys must be names, got a %s key", type(k))
    end
    local found = false
    for _, kk in ipairs(known) do
      if kk == k then found = true; break end
    end
    if not found then
      local near = M.closest(k, known)
      if near then fail(fname, "unknown argument '%s' (did you mean '%s'?)", k, near) end
      fail(fname, "unknown argument '%s' (%s)", k,
        #known > 0 and "known: " .. table.concat(known, ", ") or "none are taken")
    end
  end
  return args
end

local function finite(v)
  return v == v and v ~= math.huge and v ~= -math.huge
end

-- A number under `key`.  opt: optional (return opt.default when absent), positive,
-- nonnegative, min, max (inclusive).
function M.number(fname, args, key, unit, opt)
  opt = opt or {}
  local v = args[key]
  local u = unit ~= "" and unit or "dimensionless"
  if v == nil then
    if opt.optional then return opt.default end
    fail(fname, "missing argument '%s' (%s)", key, u)
  end
  if type(v) ~= "number" then
    fail(fname, "argument '%s' must be a number (%s), got %s", key, u, type(v))
  end
  if not finite(v) then
    fail(fname, "%s %s %s is %s; allowed finite values (%s)", key, v ~= v and "NaN" or tostring(v),
      u, v ~= v and "not a number" or "infinite", u)
  end
  local function range(allowed)
    fail(fname, "%s %g %s is out of range; allowed %s", key, v, u, allowed)
  end
  if opt.positive and v <= 0 then range("(0, inf) " .. u) end
  if opt.nonnegative and v < 0 then range("[0, inf) " .. u) end
  if opt.min and v < opt.min then
    range(string.format("[%g, %s] %s", opt.min, opt.max and string.format("%g", opt.max) or "inf", u))
  end
  if opt.max and v > opt.max then
    range(string.format("[%g, %g] %s", opt.min or -math.huge, opt.max, u))
  end
  return v
end

-- One of the strings in `options`.
function M.option(fname, args, key, options, default)
  local v = args[key]
  if v == nil then
    if default ~= nil then return default end
    fail(fname, "missing argument '%s' (one of %s)", key, table.concat(options, ", "))
  end
  for _, o in ipairs(options) do
    if v == o then return v end
  end
  fail(fname, "%s %s is not allowed; allowed %s", key, tostring(v), table.concat(options, ", "))
end

-- The trap frequencies every model accepts (rad/s; the shared limits of coldprep/limits.h).
local LIMITS = cp.consts.limits
local OMEGA_RANGE = { min = LIMITS.min_trap_omega, max = LIMITS.max_trap_omega }

-- Three trap frequencies (rad/s) as a list {wx, wy, wz}; a single number means isotropic.
function M.frequencies(fname, args, key, opt)
  opt = opt or {}
  local v = args[key]
  if v == nil and opt.optional then return nil end
  if type(v) == "number" then
    local w = M.number(fname, args, key, "rad/s", OMEGA_RANGE)
    return { w, w, w }
  end
  if type(v) ~= "table" or #v ~= 3 then
    if v == nil then fail(fname, "missing argument '%s' (rad/s, three angular trap frequencies)", key) end
    fail(fname, "argument '%s' must be three angular trap frequencies {wx, wy, wz} (rad/s)", key)
  end
  local out = {}
  for i = 1, 3 do
    out[i] = M.number(fname, { [key .. "[" .. i .. "]"] = v[i] }, key .. "[" .. i .. "]", "rad/s",
      OMEGA_RANGE)
  end
  return out
end

-- A function under `key`.
function M.func(fname, args, key)
  local v = args[key]
  if type(v) ~= "function" then
    fail(fname, "argument '%s' must be a function, got %s", key, type(v))
  end
  return v
end

-- true for a number that is finite (not NaN, not an infinity)
function M.is_finite(x)
  return type(x) == "number" and finite(x)
end
local is_finite = M.is_finite

-- A value as the messages show it: a number in %g with NaN spelled "NaN" on every platform
-- (Lua's own may print "-nan"), anything else through tostring.
function M.shown(v)
  if type(v) ~= "number" then return tostring(v) end
  return v ~= v and "NaN" or string.format("%g", v)
end

-- An integer under key in [lo, hi] (dflt when absent).
function M.integer(fname, t, key, dflt, lo, hi)
  local v = t[key]
  if v == nil and dflt ~= nil then return dflt end
  if math.type(v) ~= "integer" and not (is_finite(v) and v == math.floor(v)) then
    fail(fname, "argument '%s' must be an integer, got %s", key, tostring(v))
  end
  local iv = math.tointeger(v) -- nil for a whole float beyond the integers (1e300)
  if iv == nil or iv < lo or iv > hi then
    fail(fname, "%s %s is out of range; allowed [%d, %d]", key, tostring(v), lo, hi)
  end
  return iv
end

-- A value of Lua type `ty` under key (required unless dflt ~= nil).
function M.typed(fname, t, key, ty, dflt)
  local v = t[key]
  if v == nil then
    if dflt ~= nil then return dflt end
    fail(fname, "missing argument '%s' (a %s)", key, ty)
  end
  if type(v) ~= ty then
    fail(fname, "argument '%s' must be a %s, got %s", key, ty, type(v))
  end
  return v
end

return M
