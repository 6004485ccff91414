-- coldprep.pretty: renders any Lua value as text for people to read; the REPL shows every
-- result through it.  Tables come out nested and indented, short ones on one line, with
-- the sequence part first and the other keys sorted; floats have 6 significant digits;
-- a table that contains itself is shown as a marker naming where it was first seen; long
-- tables and deep nesting are cut with a marker that says how much was left out.
-- Only raw fields are read (no __index, __pairs); __tostring is honoured.
local cp = require "coldprep"

local M = {}

local DEFAULTS = { width = 78, max_items = 40, max_depth = 6, digits = 6 }

local KEYWORDS = {}
for w in ([[and break do else elseif end false for function goto if in local nil not or
            repeat return then true until while]]):gmatch("%a+") do
  KEYWORDS[w] = true
end

local function is_identifier(s)
  return type(s) == "string" and s:match("^[%a_][%w_]*$") ~= nil and not KEYWORDS[s]
end

local function quote(s)
  return (string.format("%q", s):gsub("\\\n", "\\n"))
end

local function format_number(x, digits)
  if math.type(x) == "integer" then return tostring(x) end
  if x ~= x then return "nan" end
  if x == math.huge then return "inf" end
  if x == -math.huge then return "-inf" end
  return string.format("%." .. digits .. "g", x)
end

-- Name of every function reachable from the globals in at most three steps
-- (print, string.format, cp.species.atom); the shortest name wins.
local function function_names()
  local names = {}
  local function walk(t, prefix, depth)
    for k, v in next, t do
      if is_identifier(k) then
        local name = prefix .. k
        if type(v) == "function" then
          if names[v] == nil or #name < #names[v] then names[v] = name end
        elseif type(v) == "table" and depth > 1 then
          walk(v, name .. ".", depth - 1)
        end
      end
    end
  end
  walk(_G, "", 3)
  return names
end

-- Keys other than the sequence 1..n, in a stable order: numbers, strings, booleans, others.
local TYPE_RANK = { number = 1, string = 2, boolean = 3 }
local function key_less(a, b)
  local ra, rb = TYPE_RANK[type(a)] or 4, TYPE_RANK[type(b)] or 4
  if ra ~= rb then return ra < rb end
  if ra == 4 then return tostring(a) < tostring(b) end
  if ra == 3 then return (not a) and b end
  return a < b
end

local function sequence_length(t)
  local n = 0
  while rawget(t, n + 1) ~= nil do n = n + 1 end
  return n
end

local function other_keys(t, n)
  local keys = {}
  for k in next, t do
    if not (math.type(k) == "integer" and k >= 1 and k <= n) then keys[#keys + 1] = k end
  end
  table.sort(keys, key_less)
  return keys
end

local function count_entries(t)
  local n = 0
  for _ in next, t do n = n + 1 end
  return n
end

local Renderer = {}
Renderer.__index = Renderer

function Renderer:function_name(f)
  self.names = self.names or function_names()
  return self.names[f]
end

-- tostring through the value's own __tostring, which may fail
function Renderer:custom_tostring(v)
  local ok, s = pcall(tostring, v)
  if ok and type(s) == "string" then return s end
  return "<" .. type(v) .. ": __tostring failed: " .. tostring(s) .. ">"
end

function Renderer:key(k)
  if is_identifier(k) then return k end
  return "[" .. self:scalar(k) .. "]"
end

-- `key`: the field holding v, if any; a function's name is left out when it merely
-- repeats the key (atom = <function>, not atom = <function cp.species.atom>).
function Renderer:scalar(v, key)
  local t = type(v)
  if t == "number" then return format_number(v, self.opts.digits) end
  if t == "string" then return quote(v) end
  if t == "function" then
    local name = self:function_name(v)
    if name and key ~= nil and (name == key or name:sub(-#key - 1) == "." .. key) then
      return "<function>"
    end
    return name and ("<function " .. name .. ">") or ("<" .. tostring(v) .. ">")
  end
  if t == "table" or t == "userdata" then return self:custom_tostring(v) end
  return tostring(v)
end

-- The rendering of v (possibly several lines), starting at `column` on a line indented by
-- `indent`; `path` names v for cycle markers.
function Renderer:value(v, indent, column, path, key)
  if type(v) ~= "table" then return self:scalar(v, key) end
  local mt = getmetatable(v)
  if type(mt) == "table" and rawget(mt, "__tostring") then return self:custom_tostring(v) end
  if self.open[v] then return "<cycle: " .. self.open[v] .. ">" end
  if next(v) == nil then return "{}" end
  if self.depth >= self.opts.max_depth then
    local n = count_entries(v)
    return "{<" .. n .. (n == 1 and " entry" or " entries") .. " not shown>}"
  end

  self.open[v] = path
  self.depth = self.depth + 1
  local items, packable, multiline = self:entries(v, indent + 2, path)
  self.depth = self.depth - 1
  self.open[v] = nil

  local flat = "{" .. table.concat(items, ", ") .. "}"
  if not multiline and column + #flat < self.opts.width then return flat end
  return self:block(items, packable, indent)
end

-- Each entry as "value" or "key = value", plus whether any is multi-line.  `packable`
-- marks the short one-line entries of the sequence part, which block() puts several to a
-- line.
function Renderer:entries(t, indent, path)
  local items, packable, multiline = {}, {}, false
  local function add(s, in_sequence)
    items[#items + 1] = s
    local one_line = not s:find("\n", 1, true)
    packable[#items] = in_sequence and one_line and #s <= 24
    if not one_line then multiline = true end
  end
  local max = self.opts.max_items
  local n = sequence_length(t)
  local head, tail = n, 0
  if n > max then head, tail = max - 5, 5 end
  for i = 1, head do
    add(self:value(t[i], indent, indent, path .. "[" .. i .. "]"), true)
  end
  if tail > 0 then
    add("<" .. (n - head - tail) .. " more>", true)
    for i = n - tail + 1, n do
      local kt = "[" .. i .. "] = "
      add(kt .. self:value(t[i], indent, indent + #kt, path .. "[" .. i .. "]"), true)
    end
  end
  local keys = other_keys(t, n)
  local shown = math.min(#keys, math.max(max - #items, 5))
  for i = 1, shown do
    local k = keys[i]
    local kt = self:key(k)
    local sub = is_identifier(k) and (path .. "." .. k) or (path .. kt)
    add(kt .. " = " .. self:value(t[k], indent, indent + #kt + 3, sub, k))
  end
  if shown < #keys then add("<" .. (#keys - shown) .. " more keys>") end
  return items, packable, multiline
end

-- One entry per line, except that runs of packable entries share lines up to the width.
function Renderer:block(items, packable, indent)
  local pad = string.rep(" ", indent + 2)
  local lines, current = {}, nil
  for i, s in ipairs(items) do
    if packable[i] and current and #current + #s + 2 <= self.opts.width then
      current = current .. " " .. s .. ","
    else
      if current then lines[#lines + 1] = current end
      current = pad .. s .. ","
      if not packable[i] then
        lines[#lines + 1] = current
        current = nil
      end
    end
  end
  if current then lines[#lines + 1] = current end
  return "{\n" .. table.concat(lines, "\n") .. "\n" .. string.rep(" ", indent) .. "}"
end

-- allowed range of each option
local OPTION_RANGE = { width = { 20, 1000 }, max_items = { 10, 100000 }, max_depth = { 1, 100 },
  digits = { 1, 17 } }

local function options(opts)
  local o = {}
  for k, v in pairs(DEFAULTS) do o[k] = v end
  if opts == nil then return o end
  if type(opts) ~= "table" then
    error("pretty.format: options must be a table, got " .. type(opts), 3)
  end
  for k, v in pairs(opts) do
    local range = OPTION_RANGE[k]
    if not range then
      error(string.format("pretty.format: unknown option '%s'; known: digits, max_depth, max_items, width",
        tostring(k)), 3)
    end
    if math.type(v) ~= "integer" or v < range[1] or v > range[2] then
      error(string.format("pretty.format: option %s = %s must be an integer from %d to %d",
        k, tostring(v), range[1], range[2]), 3)
    end
    o[k] = v
  end
  return o
end

function M.format(value, opts)
  local r = setmetatable({ opts = options(opts), open = {}, depth = 0 }, Renderer)
  return r:value(value, 0, 0, "root")
end

cp.set_help(M.format, [[
pretty.format(value [, options]) -> string: VALUE rendered for reading, as the REPL shows
results.  Tables are nested with indentation, the sequence part first, other keys sorted;
floats to `digits` significant figures; a table inside itself shows as <cycle: PATH>; more
than `max_items` entries or deeper than `max_depth` levels are cut with a marker saying
how many were left out.  Options (integers, default and range): width = 78 (20-1000
columns), max_items = 40 (10-100000), max_depth = 6 (1-100), digits = 6 (1-17).
Example: print(require("coldprep.pretty").format(cp.species.atom("40K"), {digits = 10}))]])

return M
