-- coldprep.help: `help()` lists the modules and their functions with the first line of
-- each help text; `help(f)` prints f's full help text; `help(module)` lists one module.
local cp = require "coldprep"

local function first_line(text)
  return (text or ""):match("^[^\n]*")
end

local function sorted_keys(t)
  local keys = {}
  for k in pairs(t) do
    if type(k) == "string" then keys[#keys + 1] = k end
  end
  table.sort(keys)
  return keys
end

local function list_module(name, mod, out)
  out[#out + 1] = name
  for _, k in ipairs(sorted_keys(mod)) do
    local v = mod[k]
    if type(v) == "function" and not k:match("^builtin_") then
      out[#out + 1] = string.format("  %-28s %s", name .. "." .. k, first_line(cp.get_help(v)))
    end
  end
end

local function help(x)
  local out = {}
  if x == nil then
    out[1] = "coldprep " .. cp.version .. ": preparation budgets for ultracold molecules."
    out[2] = "The library is the global `coldprep` (also `cp`); help(cp.MODULE.function) explains one function."
    out[3] = ""
    for _, k in ipairs(sorted_keys(cp)) do
      if type(cp[k]) == "table" and k ~= "consts" and k ~= "units" then
        list_module("cp." .. k, cp[k], out)
      end
    end
    out[#out + 1] = "cp.units: " .. table.concat(sorted_keys(cp.units), " ")
    out[#out + 1] = "cp.consts: " .. table.concat(sorted_keys(cp.consts), " ")
  elseif type(x) == "function" then
    out[1] = cp.get_help(x) or "no help text for this function"
  elseif type(x) == "table" then
    local name
    for k, v in pairs(cp) do
      if v == x then name = "cp." .. k end
    end
    list_module(name or "table", x, out)
  else
    out[1] = "help: give a function or a module table, e.g. help(cp.species.atom)"
  end
  print(table.concat(out, "\n"))
end

cp.set_help(help, [[
help([f]): without an argument, list coldprep's modules and functions; with a function,
print its help text (arguments with units, results, an example); with a module table,
list that module.  Example: help(cp.species.atom)]])

return help
