-- coldprep.named: checks for the one-table-of-named-arguments convention, for functions
-- written in Lua (the C bindings use lua/args.c).  Messages follow the same shape:
--   "sweep: unknown argument 'ouputs' (did you mean 'outputs'?)"
--   "optimize: argument 'tolerance' must be a finite positive number, got -1"
local M = {}

local function distance(s, t)
  local ls, lt = #s, #t
  local row = {}
  for j = 0, lt do row[j] = j end
  for i = 1, ls do
    local diag = row[0]
    row[0] = i
    for j = 1, lt do
      local up = row[j]
      local best = diag + ((s:byte(i) == t:byte(j)) and 0 or 1)
      if up + 1 < best then best = up + 1 end
      if row[j - 1] + 1 < best then best = row[j - 1] + 1 end
      row[j] = best
      diag = up
    end
  end
  return row[lt]
end

-- Raise "fname: message" at the caller of the public function (level 3 from here).
function M.fail(fname, fmt, ...)
  error(string.format("%s: " .. fmt, fname, ...), 0)
end

-- Check that `args` is a table whose string keys are all in `known` (a list); an unknown
-- key is an error naming the closest known key.
function M.check(fname, args, known)
  if type(args) ~= "table" then
    M.fail(fname, "expects one table of named arguments, got %s (call it as %s{...})",
      type(args), fname)
  end
  local set = {}
  for _, k in ipairs(known) do set[k] = true end
  for k in pairs(args) do
    if type(k) ~= "string" then
      M.fail(fname, "argument keys must be names, got a %s key", type(k))
    end
    if not set[k] then
      local best, bd = nil, math.huge
      for _, c in ipairs(known) do
        local d = distance(k, c)
        if d < bd then best, bd = c, d end
      end
      M.fail(fname, "unknown argument '%s' (did you mean '%s'?)", k, best)
    end
  end
  return args
end

local function is_finite(x)
  return type(x) == "number" and x == x and x ~= math.huge and x ~= -math.huge
end
M.is_finite = is_finite

-- A finite number under key (required unless dflt is given); `what` adds a condition:
-- "positive", "nonnegative" or nil.
function M.number(fname, t, key, dflt, what, unit)
  local v = t[key]
  if v == nil then
    if dflt ~= nil then return dflt end
    M.fail(fname, "missing argument '%s'%s", key, unit and (" (" .. unit .. ")") or "")
  end
  local ok = is_finite(v)
  if ok and what == "positive" then ok = v > 0 end
  if ok and what == "nonnegative" then ok = v >= 0 end
  if not ok then
    M.fail(fname, "argument '%s' must be a finite %snumber%s, got %s", key,
      what and (what .. " ") or "", unit and (" (" .. unit .. ")") or "",
      v ~= v and "nan" or tostring(v))
  end
  return v
end

-- An integer under key in [lo, hi] (dflt when absent).
function M.integer(fname, t, key, dflt, lo, hi)
  local v = t[key]
  if v == nil and dflt ~= nil then return dflt end
  if math.type(v) ~= "integer" and not (is_finite(v) and v == math.floor(v)) then
    M.fail(fname, "argument '%s' must be an integer, got %s", key, tostring(v))
  end
  v = math.tointeger(v)
  if v < lo or v > hi then
    M.fail(fname, "argument '%s' is %d; allowed %d to %d", key, v, lo, hi)
  end
  return v
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

-- One of the strings in `options` (dflt when absent).
function M.option(fname, t, key, options, dflt)
  local v = t[key]
  if v == nil then return dflt end
  for _, o in ipairs(options) do
    if v == o then return v end
  end
  M.fail(fname, "argument '%s' must be one of %s, got %s", key,
    table.concat(options, ", "), tostring(v))
end

return M
