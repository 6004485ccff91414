-- coldprep.decode: strict readers of the CSV and JSON Lines text coldprep.encode writes.
-- Strict because a file cut off mid-row, or edited by hand, must be refused, never read as
-- a plausible wrong row: every record must end with its line end (a torn last row has
-- none), have as many fields as the header (CSV) or the keys of the first row (JSON
-- Lines), and follow its grammar exactly: RFC 4180 section 2 for CSV (a quote only around a
-- whole field, quotes inside doubled), RFC 8259 for JSON (one flat object per line: string,
-- number, true, false or null values, no other text after it).  CSV fields that are not
-- quoted become numbers only when they are decimal numbers (or the texts nan, inf, -inf
-- that encode.number writes), booleans for true and false, nil when empty.  A UTF-8 byte
-- order mark at the start of a file is skipped.
local M = {}

-- Failures are raised as "<where>: <problem> at byte <offset>" (offsets 1-based).
local function fail(where, pos, fmt, ...)
  error(string.format("%s: %s at byte %d", where, string.format(fmt, ...), pos), 0)
end

-- A decimal number text: sign, digits with at most one point, optional exponent.
local function decimal(s)
  return (s:match("^[-+]?%d+%.?%d*$") or s:match("^[-+]?%.%d+$")
    or s:match("^[-+]?%d+%.?%d*[eE][-+]?%d+$") or s:match("^[-+]?%.%d+[eE][-+]?%d+$")) ~= nil
end

-- The value of an unquoted CSV field.
function M.csv_value(field)
  if field == "" then return nil end
  if field == "true" then return true elseif field == "false" then return false end
  if field == "nan" then return 0 / 0 end
  if field == "inf" then return math.huge elseif field == "-inf" then return -math.huge end
  if decimal(field) then return tonumber(field) end
  return field
end

local BOM = "\xEF\xBB\xBF"
local TORN = "the last row has no line end: the file was cut off (a run still writing it, " ..
  "or one that was stopped; `coldprep sweep --resume` drops such a row)"

-- CSV text -> columns (list of names), rows (list of tables column -> value).  Empty text
-- gives no columns and no rows.
function M.csv(text, where)
  local pos, n = 1, #text
  if text:sub(1, 3) == BOM then pos = 4 end
  local columns, rows = nil, {}
  local fields, quoted = {}, {}
  local record_start = pos
  while pos <= n do
    local field, q
    if text:byte(pos) == 34 then -- '"'
      local parts, p = {}, pos + 1
      while true do
        local e = text:find('"', p, true)
        if not e then fail(where, record_start, "the last row has an unterminated quoted field (the file was cut off?)") end
        parts[#parts + 1] = text:sub(p, e - 1)
        if text:byte(e + 1) == 34 then
          parts[#parts + 1] = '"'
          p = e + 2
        else
          pos = e + 1
          break
        end
      end
      field, q = table.concat(parts), true
      local c = text:sub(pos, pos)
      if c ~= "," and c ~= "\r" and c ~= "\n" and c ~= "" then
        fail(where, pos, "a quoted field is followed by %q instead of a comma or a line end", c)
      end
    else
      local e = text:find('[,\r\n"]', pos) or n + 1
      if text:byte(e) == 34 then fail(where, e, "a double quote inside a field that is not quoted") end
      field, q = text:sub(pos, e - 1), false
      pos = e
    end
    fields[#fields + 1], quoted[#fields + 1] = field, q
    local c = text:sub(pos, pos)
    if c == "," then
      pos = pos + 1
    else
      if c == "\r" then
        if text:byte(pos + 1) ~= 10 then fail(where, pos, "a CR that does not end a line") end
        pos = pos + 2
      elseif c == "\n" then
        pos = pos + 1
      else
        fail(where, record_start, TORN)
      end
      if not columns then
        columns = fields
        for i, name in ipairs(columns) do
          if quoted[i] == false and name == "" then fail(where, record_start, "column %d of the header has no name", i) end
        end
      else
        if #fields ~= #columns then
          fail(where, record_start, "a row has %d fields, the header %d", #fields, #columns)
        end
        local record = {}
        for i, name in ipairs(columns) do
          record[name] = quoted[i] and fields[i] or M.csv_value(fields[i])
        end
        rows[#rows + 1] = record
      end
      fields, quoted, record_start = {}, {}, pos
    end
  end
  if #fields > 0 then fail(where, record_start, TORN) end
  return columns or {}, rows
end

-- ---- JSON ------------------------------------------------------------------------------

local unescape = { ['"'] = '"', ["\\"] = "\\", ["/"] = "/", b = "\b", f = "\f", n = "\n",
  r = "\r", t = "\t" }

-- A JSON number text (RFC 8259 section 6): -?(0|[1-9][0-9]*)(.[0-9]+)?([eE][-+]?[0-9]+)?
local function json_number(w)
  local int, rest = w:match("^%-?(%d+)(.*)$")
  if not int or (#int > 1 and int:byte(1) == 48) then return false end
  rest = rest:gsub("^%.%d+", "", 1)
  rest = rest:gsub("^[eE][-+]?%d+", "", 1)
  return rest == ""
end

-- Parse one flat JSON object from line (starting at byte `base` of the file, for
-- messages); returns the table, the keys in order and nothing else.
function M.json_object(line, where, base)
  base = base or 1
  local pos = 1
  local function bad(fmt, ...) fail(where, base + pos - 1, fmt, ...) end
  local function skip() pos = line:find("[^ \t\r\n]", pos) or #line + 1 end
  local function hex4(at)
    local h = line:sub(at, at + 3)
    if not h:match("^%x%x%x%x$") then pos = at; bad("\\u needs four hexadecimal digits") end
    return tonumber(h, 16)
  end
  local function str()
    if line:byte(pos) ~= 34 then bad("a string was expected") end
    local parts, p = {}, pos + 1
    while true do
      local e = line:find('["\\%c]', p)
      if not e then pos = #line + 1; bad("an unterminated string") end
      parts[#parts + 1] = line:sub(p, e - 1)
      local c = line:sub(e, e)
      if c == '"' then
        pos = e + 1
        local s = table.concat(parts)
        if not utf8.len(s) then pos = e; bad("a string that is not valid UTF-8") end
        return s
      end
      if c ~= "\\" then pos = e; bad("a control character inside a string") end
      local x = line:sub(e + 1, e + 1)
      if x == "u" then
        local cp, next_p = hex4(e + 2), e + 6
        if cp >= 0xD800 and cp <= 0xDBFF then -- a surrogate pair (RFC 8259 section 7)
          local lo = line:sub(next_p, next_p + 1) == "\\u" and hex4(next_p + 2)
          if not lo or lo < 0xDC00 or lo > 0xDFFF then pos = e; bad("a lone UTF-16 surrogate") end
          cp, next_p = 0x10000 + ((cp - 0xD800) << 10) + (lo - 0xDC00), next_p + 6
        elseif cp >= 0xDC00 and cp <= 0xDFFF then
          pos = e; bad("a lone UTF-16 surrogate")
        end
        parts[#parts + 1] = utf8.char(cp)
        p = next_p
      elseif unescape[x] then
        parts[#parts + 1] = unescape[x]
        p = e + 2
      else
        pos = e; bad("an unknown escape \\%s", x)
      end
    end
  end
  local obj, keys, seen = {}, {}, {}
  skip()
  if line:byte(pos) ~= 123 then bad("a line must be one JSON object ({...})") end
  pos = pos + 1
  skip()
  local closed = line:byte(pos) == 125
  if closed then pos = pos + 1 end
  while not closed do
    skip()
    local key = str()
    if seen[key] then bad("the key %q appears twice", key) end
    seen[key] = true
    keys[#keys + 1] = key
    skip()
    if line:byte(pos) ~= 58 then bad("':' was expected after a key") end
    pos = pos + 1
    skip()
    local c, v = line:byte(pos), nil
    if c == 34 then
      v = str()
    else
      local word = line:match("^[%w%.%+%-]+", pos)
      if not word then bad("a value (string, number, true, false or null) was expected") end
      if word == "true" then v = true
      elseif word == "false" then v = false
      elseif word ~= "null" then
        if not json_number(word) then bad("%q is not a JSON value", word) end
        v = tonumber(word)
        if v == nil or v ~= v or v == math.huge or v == -math.huge then
          bad("the number %s is out of range", word)
        end
      end
      pos = pos + #word
    end
    obj[key] = v
    skip()
    c = line:byte(pos)
    pos = pos + 1
    if c == 125 then closed = true
    elseif c ~= 44 then pos = pos - 1; bad("',' or '}' was expected") end
  end
  skip()
  if pos <= #line then bad("text after the object") end
  return obj, keys
end

-- JSON Lines text -> columns (the keys of the first row, in order), rows.  Every row must
-- have the same keys.
function M.jsonl(text, where)
  local rows, columns, colset = {}, nil, nil
  local pos, n = 1, #text
  if text:sub(1, 3) == BOM then pos = 4 end
  while pos <= n do
    local e = text:find("\n", pos, true)
    if not e then
      fail(where, pos, TORN)
    end
    local obj, keys = M.json_object(text:sub(pos, e - 1), where, pos)
    if not columns then
      columns, colset = keys, {}
      for _, k in ipairs(keys) do colset[k] = true end
    else
      local same = #keys == #columns
      for _, k in ipairs(keys) do same = same and colset[k] end
      if not same then fail(where, pos, "a row has other keys than the first row") end
    end
    rows[#rows + 1] = obj
    pos = e + 1
  end
  return columns or {}, rows
end

return M
