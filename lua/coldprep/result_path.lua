-- coldprep.result_path: reading one value out of the result of a study's evaluate (a
-- sweep's outputs, cp.uncertainty's outputs and degenerate, cp.optimize's merit and
-- constraints).  A name is a dotted path ("final.t_over_tf"); one that is not in a result
-- is an error naming the path, the point, the keys found where the path breaks and the
-- closest of them, so a misspelt name cannot give empty columns or every point
-- infeasible.  Two ways to allow an absent value (nil then): the name ends in "?"
-- ("final.t_over_tf?"), or the result declares the key in its metatable's __fields (true,
-- or the same kind of table for a sub-table; a plan's budget declares limiting_stage,
-- final.t_over_tc, ...).
local cp = require "coldprep"
local A = require "coldprep.argcheck"

local M = {}

-- The keys a result table declares it may have (its metatable's __fields), else those
-- `inherited` from the level above.
local function declared(v, inherited)
  local mt = getmetatable(v)
  local own = type(mt) == "table" and rawget(mt, "__fields")
  if type(own) == "table" then return own end
  return inherited
end

-- The phrase naming the point: a number is "at point N", a function is called (only when
-- an error is raised), a string is used as it is.
local function place(where)
  if type(where) == "number" then return string.format("at point %d", where) end
  if type(where) == "function" then return where() end
  return where or ""
end

-- Path `parts` (name `name`, argument `what`) is absent from `result`: nothing when the
-- result declares the missing key, else the error.
local function check_missing(fname, what, name, parts, result, where)
  local v, at, fields = result, "the result", nil
  for k, part in ipairs(parts) do
    if type(v) ~= "table" then
      error(string.format("%s: %s '%s' is missing %s: %s is a %s, not a table with '%s'",
        fname, what, name, place(where), at, type(v), part), 0)
    end
    fields = declared(v, fields)
    if v[part] == nil then
      if fields and fields[part] then return end
      local keys = {}
      for key in pairs(v) do
        if type(key) == "string" then keys[#keys + 1] = key end
      end
      table.sort(keys)
      local candidates = table.move(keys, 1, #keys, 1, {}) -- and the declared ones
      for key in pairs(type(fields) == "table" and fields or {}) do
        if type(key) == "string" and v[key] == nil then candidates[#candidates + 1] = key end
      end
      table.sort(candidates)
      local near = #candidates <= 256 and cp.names.closest(part, candidates) or nil
      local fixed = table.move(parts, 1, #parts, 1, {})
      fixed[k] = near
      local shown = #keys > 30 and table.concat(keys, ", ", 1, 30) .. ", ..." or
        table.concat(keys, ", ")
      error(string.format("%s: %s '%s' is missing from evaluate's result %s (%s has %s)%s; " ..
        "a value that may be absent at some points is written '%s?'", fname, what, name,
        place(where), at, #keys > 0 and "the keys " .. shown or "no named keys",
        near and string.format("; did you mean '%s'?", table.concat(fixed, ".")) or "",
        name), 0)
    end
    v = v[part]
    fields = type(fields) == "table" and type(fields[part]) == "table" and fields[part] or nil
    at = "'" .. table.concat(parts, ".", 1, k) .. "'"
  end
end

-- M.compile(fname, what, spec [, allow_function]): a reader get(result, p, where) of one
-- value, and the name (the path without its "?"; nil for a function).
--   spec  a dotted path, "?" at the end when it may be absent; or, when allow_function,
--         a function(result, p), returned as it is.  Anything else fails naming `what`.
--   get   returns the value at the path, nil only where that is allowed (above); raises
--         otherwise.  `where` names the point in the message: a number N ("at point N"),
--         a string, or a function returning one (called only for the message).
function M.compile(fname, what, spec, allow_function)
  if allow_function and type(spec) == "function" then return spec, nil end
  if type(spec) ~= "string" or spec == "" or spec == "?" then
    A.fail(fname, "%s must be a result name (string)%s, got %s", what,
      allow_function and " or a function(result, p)" or "",
      type(spec) == "string" and "'" .. spec .. "'" or type(spec))
  end
  local optional = spec:sub(-1) == "?"
  local name = optional and spec:sub(1, -2) or spec
  local parts = {}
  for part in name:gmatch("[^.]+") do parts[#parts + 1] = part end
  local function get(result, _, where)
    local v = result
    for _, part in ipairs(parts) do
      if type(v) ~= "table" then v = nil; break end
      v = v[part]
    end
    if v == nil and not optional then check_missing(fname, what, name, parts, result, where) end
    return v
  end
  return get, name
end

return M
