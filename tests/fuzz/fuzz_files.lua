-- A seeded fuzzer of the sweep file reader cp.sweep.read (coldprep.decode): real CSV and
-- JSON Lines outputs (with quoting, escapes, errors and non-ASCII text) are cut at every
-- offset and mutated at random (bytes flipped, inserted, deleted, runs duplicated, quotes,
-- commas, braces and line ends planted).  Every read must either succeed with rows that
-- are tables of the file's columns, the point numbers of an unmutated prefix exactly those
-- before the cut; or fail with "sweep.read: PATH: <problem> at byte N".  Any other error
-- (a Lua runtime error, a crash) is a finding.
--
-- coldprep fuzz_files.lua SEED ITERATIONS DIR
--   prints "FINDING <format> <iteration> <detail>" lines and "DONE <reads> <findings>".
local seed = math.tointeger(tonumber(arg[1] or "1")) or 1
local iterations = math.tointeger(tonumber(arg[2] or "2000")) or 2000
local dir = arg[3] or "."

local findings, reads = 0, 0
local function finding(fmt, ...)
  findings = findings + 1
  io.stdout:write("FINDING ", string.format(fmt, ...), "\n")
end

local function write(path, text)
  local f = assert(io.open(path, "wb"))
  f:write(text)
  f:close()
end

-- read `text` as a file; returns the result or nil after recording a finding
local function read(format, label, text)
  local path = dir .. "/fuzz-read." .. format
  write(path, text)
  reads = reads + 1
  local ok, r = pcall(cp.sweep.read, { path = path })
  if not ok then
    if type(r) ~= "string" or not r:find("^sweep%.read: " .. path:gsub("%p", "%%%0") .. ": .* at byte %d+$") then
      finding("%s %s: not a reader's error: %s", format, label, tostring(r):sub(1, 300))
    end
    return nil
  end
  if type(r.rows) ~= "table" or type(r.columns) ~= "table" then
    finding("%s %s: no rows or columns", format, label)
    return nil
  end
  local known = {}
  for _, c in ipairs(r.columns) do known[c] = true end
  for i, row in ipairs(r.rows) do
    if type(row) ~= "table" then finding("%s %s: row %d is a %s", format, label, i, type(row)); return nil end
    for k in pairs(row) do
      if not known[k] then finding("%s %s: row %d has a column %s not in columns", format, label, i, tostring(k)); return nil end
    end
  end
  return r
end

for _, format in ipairs { "csv", "jsonl" } do
  local out = dir .. "/fuzz-source." .. format
  cp.sweep { parameters = { { name = "x", values = { 0.1, -2.5e-300, 7, 1e300 } }, { name = "k", values = { "a", "b" } } },
    out = out, outputs = { "v", "s" },
    evaluate = function(p)
      if p.x == 7 and p.k == "b" then error("bad \"x\",\r\nline \u{b5}", 0) end
      return { v = p.x / 3, s = p.k .. ', "q"\n\\ \u{e9}' }
    end }
  local f = assert(io.open(out, "rb"))
  local text = f:read("a")
  f:close()
  local whole = read(format, "whole", text)
  if not whole or #whole.rows ~= 8 then finding("%s: the unmutated file does not read back as 8 rows", format) end

  -- every cut: a prefix that ends at a row end reads as exactly the rows before it
  local ends, quoted = { [0] = 0 }, false
  local rows_before = 0
  for i = 1, #text do
    local c = text:sub(i, i)
    if c == '"' and format == "csv" then quoted = not quoted end
    if c == "\n" and not quoted then rows_before = rows_before + 1; ends[i] = rows_before end
  end
  for cut = 0, #text - 1 do
    local r = read(format, "cut " .. cut, text:sub(1, cut))
    local n_rows = ends[cut] and (format == "csv" and math.max(ends[cut] - 1, 0) or ends[cut])
    if r and not n_rows then
      finding("%s cut %d: a prefix that ends inside a row was read as %d rows", format, cut, #r.rows)
    elseif r and #r.rows ~= n_rows then
      finding("%s cut %d: %d rows read, %d before the cut", format, cut, #r.rows, n_rows)
    elseif not r and n_rows then
      finding("%s cut %d: a prefix of whole rows was refused", format, cut)
    end
  end

  -- random mutations
  local plant = { '"', ",", "\r", "\n", "{", "}", ":", "\\", "\0", "\xEF\xBB\xBF", "\xff", "u", "0x" }
  for it = 1, iterations do
    math.randomseed(seed, it)
    local t = text
    for _ = 1, math.random(4) do
      local pos = math.random(math.max(#t, 1))
      local m = math.random(5)
      if m == 1 then
        t = t:sub(1, pos - 1) .. string.char(math.random(0, 255)) .. t:sub(pos + 1)
      elseif m == 2 then
        t = t:sub(1, pos - 1) .. plant[math.random(#plant)] .. t:sub(pos)
      elseif m == 3 then
        t = t:sub(1, pos - 1) .. t:sub(pos + math.random(8))
      elseif m == 4 then
        local len = math.random(40)
        t = t:sub(1, pos + len) .. t:sub(pos, pos + len) .. t:sub(pos + len + 1)
      else
        t = t:sub(1, pos)
      end
    end
    read(format, "mutation " .. it, t)
  end
end
io.stdout:write(string.format("DONE %d %d\n", reads, findings))
