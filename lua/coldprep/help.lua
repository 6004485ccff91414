-- coldprep.help: `help()` lists the modules and their functions with each one's complete
-- signature, wrapped to 100 columns; `help(f)` prints f's full help text; `help(module)` lists one module.
local cp = require "coldprep"

local WIDTH = 100 -- the listing fits a terminal this wide

-- Names that are the library's plumbing rather than its interface: left out of the listing
-- (and of Tab completion, lua/cli/cli_complete.c).
local function is_internal(name)
  return name:match("^builtin_") or name == "set_help" or name == "get_help"
end

-- The complete call signature at the start of a help text: up to the bracket that closes
-- the argument list, then a "-> result" that follows it (to its own closing bracket, or to
-- the end of its line); line breaks inside become single spaces.
local function closing(text, from)
  local depth = 0
  for i = from, #text do
    local c = text:sub(i, i)
    if c == "{" or c == "(" or c == "[" then depth = depth + 1
    elseif c == "}" or c == ")" or c == "]" then
      depth = depth - 1
      if depth == 0 then return i end
    end
  end
end

local function signature(text)
  text = text or ""
  local open = text:find("[{(]")
  local stop = open and closing(text, open)
  if not stop then return (text:match("^[^\n:]*")) end
  local arrow = text:match("^%s*%->%s*", stop + 1)
  if arrow then
    local r = stop + #arrow + 1
    if text:sub(r, r):match("[{(%[]") then
      stop = closing(text, r) or stop
    else
      stop = (text:find("\n", r, true) or #text + 1) - 1
    end
  end
  return (text:sub(1, stop):gsub("%s+", " "))
end

-- `text` word-wrapped to WIDTH columns, the first line after `indent`, the rest after `cont`.
local function wrap(text, indent, cont)
  local lines, line = {}, indent
  for word in text:gmatch("%S+") do
    if #line + #word + 1 > WIDTH and #line > #cont then
      lines[#lines + 1] = line
      line = cont .. word
    elseif line == indent or line == cont then
      line = line .. word
    else
      line = line .. " " .. word
    end
  end
  lines[#lines + 1] = line
  return table.concat(lines, "\n")
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
    if type(v) == "function" and not is_internal(k) then
      local help_text = cp.get_help(v)
      local sig = help_text and signature(help_text) or (k .. "(...)")
      out[#out + 1] = wrap("cp." .. sig:gsub("^cp%.", ""), "  ", "      ")
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
    out[#out + 1] = wrap("cp.units: " .. table.concat(sorted_keys(cp.units), " "), "", "    ")
    out[#out + 1] = wrap("cp.consts: " .. table.concat(sorted_keys(cp.consts), " "), "", "    ")
  elseif type(x) == "function" then
    out[1] = cp.get_help(x) or "no help text for this function"
  elseif type(x) == "table" then
    local mt = getmetatable(x)
    if type(mt) == "table" and type(rawget(mt, "__load")) == "function" then
      x = mt.__load() -- a module loaded on first use (coldprep.library)
    end
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
