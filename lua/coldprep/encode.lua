-- coldprep.encode: the one writer of CSV and JSON text in the library (sweep rows, budget
-- reports).  Numbers are written with the fewest significant digits that read back as the
-- same double.  JSON strings are made valid UTF-8 first (a byte that does not belong to a
-- valid sequence becomes U+FFFD), so a label typed in another encoding cannot make a row
-- invalid (RFC 8259 section 8.1), and use the escapes of RFC 8259 section 7.  CSV, which
-- names no encoding, keeps a string's bytes as they are (RFC 4180: fields with a comma,
-- quote, CR or LF quoted, quotes doubled).  coldprep.decode reads both back.
local M = {}

-- v as text: integers as integers; floats with 15, 16 or 17 significant digits, the first
-- that reads back as v; NaN and infinities as "nan", "inf", "-inf" (CSV only: JSON has no
-- form for them, json_value writes null).
function M.number(v)
  if math.type(v) == "integer" then return string.format("%d", v) end
  if v ~= v then return "nan" end
  if v == math.huge then return "inf" end
  if v == -math.huge then return "-inf" end
  for _, digits in ipairs { "%.15g", "%.16g" } do
    local s = string.format(digits, v)
    if tonumber(s) == v then return s end
  end
  return string.format("%.17g", v)
end

-- s with every byte that is not part of a valid UTF-8 sequence (utf8.len's strict test:
-- no overlong forms, surrogates or code points beyond U+10FFFF) replaced by U+FFFD.
function M.utf8(s)
  if utf8.len(s) then return s end
  local parts, i = {}, 1
  while true do
    local n, bad = utf8.len(s, i)
    if n then break end
    parts[#parts + 1] = s:sub(i, bad - 1) .. "\u{FFFD}"
    i = bad + 1
  end
  parts[#parts + 1] = s:sub(i)
  return table.concat(parts)
end

-- One CSV field: nil as the empty field, numbers by M.number, anything else by tostring
-- (bytes unchanged);
-- quoted when it holds a comma, a double quote, CR or LF (RFC 4180 section 2, rules 6-7).
function M.csv_field(v)
  if v == nil then return "" end
  local s = type(v) == "number" and M.number(v) or tostring(v)
  if s:find('[,"\r\n]') then s = '"' .. s:gsub('"', '""') .. '"' end
  return s
end

-- One CSV record with its CRLF line end; values[1..n] (n = values.n or #values).
function M.csv_record(values, n)
  local parts = {}
  for i = 1, n or values.n or #values do parts[i] = M.csv_field(values[i]) end
  return table.concat(parts, ",") .. "\r\n"
end

local escapes = { ['"'] = '\\"', ["\\"] = "\\\\", ["\b"] = "\\b", ["\f"] = "\\f",
  ["\n"] = "\\n", ["\r"] = "\\r", ["\t"] = "\\t" }

-- A JSON string literal of s (made valid UTF-8; other control characters as \u00XX).
function M.json_string(s)
  return '"' .. M.utf8(s):gsub('[%c"\\]', function(c)
    return escapes[c] or string.format("\\u%04x", c:byte())
  end) .. '"'
end

-- A scalar as JSON: nil, NaN and infinities as null; other values by tostring as strings.
function M.json_value(v)
  local t = type(v)
  if v == nil then return "null" end
  if t == "number" then
    if v ~= v or v == math.huge or v == -math.huge then return "null" end
    return M.number(v)
  end
  if t == "boolean" then return tostring(v) end
  return M.json_string(tostring(v))
end

-- A JSON document of v (tables as objects with sorted keys, or as arrays when they are
-- sequences), indented by two spaces per level from `indent`.  Functions, userdata and
-- threads raise "<fname>: cannot encode a <type>".
function M.json(v, indent, fname)
  local t = type(v)
  if t ~= "table" then
    if t == "function" or t == "userdata" or t == "thread" then
      error(string.format("%s: cannot encode a %s", fname or "json", t), 0)
    end
    return M.json_value(v)
  end
  indent = indent or 0
  local pad, inner = string.rep("  ", indent), string.rep("  ", indent + 1)
  local parts = {}
  if #v > 0 or next(v) == nil then
    for _, x in ipairs(v) do parts[#parts + 1] = inner .. M.json(x, indent + 1, fname) end
    if #parts == 0 then return "[]" end
    return "[\n" .. table.concat(parts, ",\n") .. "\n" .. pad .. "]"
  end
  local keys = {}
  for k in pairs(v) do keys[#keys + 1] = tostring(k) end
  table.sort(keys)
  for _, k in ipairs(keys) do
    local x = v[k]
    if x == nil then x = v[tonumber(k)] end
    parts[#parts + 1] = inner .. M.json_string(k) .. ": " .. M.json(x, indent + 1, fname)
  end
  return "{\n" .. table.concat(parts, ",\n") .. "\n" .. pad .. "}"
end

-- One JSON Lines row: {"col":value,...} in the order of `columns`, with its LF.
function M.json_row(columns, values)
  local parts = {}
  for c = 1, #columns do
    parts[c] = M.json_string(columns[c]) .. ":" .. M.json_value(values[c])
  end
  return "{" .. table.concat(parts, ",") .. "}\n"
end

return M
