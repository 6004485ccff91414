-- coldprep.sweep: parameter sweeps.  A sweep description names parameters (linear or
-- logarithmic ranges, lists, zipped lists) combined as a full grid, a function that
-- evaluates one point (any Lua function of the parameters, or one that returns a plan,
-- which is then run), and the outputs to keep.  Points are numbered 1..count in grid
-- order (the first axis varies slowest); each becomes one row: point, inputs, outputs,
-- error.  Rows are written as CSV (RFC 4180: comma-separated, CRLF line ends, fields with
-- a comma, quote or line break quoted) or JSON Lines, one whole row per write, flushed,
-- so the file holds only finished rows at every moment.  `coldprep sweep` (lua/cli/cli_sweep.c)
-- runs the same description on several Lua states in parallel through M.prepare.
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local RP = require "coldprep.result_path"

local M = {}

local encode = require "coldprep.encode"
local decode = require "coldprep.decode"
local files = require "coldprep.files"
local format_number = encode.number

-- One axis of the grid: a list of names and, for index j (1-based), their values.
local function parse_parameter(fname, spec, where)
  if type(spec) ~= "table" then
    A.fail(fname, "%s must be a table such as {name = \"x\", from = 0, to = 1, points = 11}, got %s",
      where, type(spec))
  end
  A.table(fname, spec, { "name", "from", "to", "points", "scale", "values" })
  local name = spec.name
  if type(name) ~= "string" or not name:match("^[%a_][%w_]*$") then
    A.fail(fname, "%s needs a name (letters, digits, _), got %s", where, tostring(name))
  end
  local label = string.format("parameter '%s'", name)
  if spec.values ~= nil then
    if spec.from ~= nil or spec.to ~= nil or spec.points ~= nil or spec.scale ~= nil then
      A.fail(fname, "%s: give either values = {...} or from/to/points, not both", label)
    end
    local vals = spec.values
    if not (type(vals) == "table" or cp.reals.is(vals)) or #vals == 0 then
      A.fail(fname, "%s: values must be a non-empty list or cp.reals", label)
    end
    for i, v in ipairs(vals) do
      local t = type(v)
      if not (t == "string" or t == "boolean" or A.is_finite(v)) then
        A.fail(fname, "%s: values[%d] must be a finite number, a string or a boolean, got %s",
          label, i, v ~= v and "NaN" or t == "number" and tostring(v) or t)
      end
    end
    local copy = table.move(vals, 1, #vals, 1, {})
    return { name = name, len = #copy, value = function(j) return copy[j] end }
  end
  local scale = A.option(fname, spec, "scale", { "linear", "log" }, "linear")
  local from = A.number(fname, spec, "from", "SI units")
  local points = A.integer(fname, spec, "points", nil, 1, 1 << 40)
  local to = points == 1 and A.number(fname, spec, "to", "SI units",
    { optional = true, default = from }) or A.number(fname, spec, "to", "SI units")
  if scale == "log" and (from <= 0 or to <= 0) then
    A.fail(fname, "%s: a logarithmic range needs from > 0 and to > 0, got from = %s, to = %s",
      label, format_number(from), format_number(to))
  end
  local value
  if points == 1 then
    value = function() return from end
  elseif scale == "linear" then
    value = function(j)
      if j == points then return to end
      return from + (to - from) * (j - 1) / (points - 1)
    end
  else
    local ratio = to / from
    value = function(j)
      if j == 1 then return from end
      if j == points then return to end
      return from * ratio ^ ((j - 1) / (points - 1))
    end
  end
  return { name = name, len = points, value = value }
end

-- An axis: one parameter, or {zip = {p1, p2, ...}} whose lists advance together.
local function parse_axis(fname, spec, where)
  if type(spec) == "table" and spec.zip ~= nil then
    A.table(fname, spec, { "zip" })
    if type(spec.zip) ~= "table" or #spec.zip == 0 then
      A.fail(fname, "%s: zip must be a non-empty list of parameters", where)
    end
    local members = {}
    for i, p in ipairs(spec.zip) do
      members[i] = parse_parameter(fname, p, string.format("%s.zip[%d]", where, i))
      if members[i].len ~= members[1].len then
        A.fail(fname, "%s: zipped parameters need equal lengths; '%s' has %d, '%s' has %d",
          where, members[1].name, members[1].len, members[i].name, members[i].len)
      end
    end
    return { members = members, len = members[1].len }
  end
  local p = parse_parameter(fname, spec, where)
  return { members = { p }, len = p.len }
end

local DESCRIPTION_KEYS = { "parameters", "combine", "evaluate", "outputs", "out", "format",
  "on_row" }

-- Validate a sweep description; returns the compiled sweep (see M.prepare).
local function compile(fname, desc, format)
  A.table(fname, desc, DESCRIPTION_KEYS)
  local params = A.typed(fname, desc, "parameters", "table")
  if #params == 0 then A.fail(fname, "parameters must be a non-empty list") end
  local combine = A.option(fname, desc, "combine", { "grid", "zip" }, "grid")
  local axes = {}
  if combine == "zip" then
    axes[1] = parse_axis(fname, { zip = params }, "parameters")
  else
    for i, spec in ipairs(params) do
      axes[i] = parse_axis(fname, spec, string.format("parameters[%d]", i))
    end
  end
  local evaluate = A.typed(fname, desc, "evaluate", "function")
  local outputs = desc.outputs
  if outputs ~= nil then
    if type(outputs) ~= "table" or #outputs == 0 then
      A.fail(fname, "outputs must be a non-empty list of result names, e.g. {\"final.number\"}")
    end
    for i, o in ipairs(outputs) do
      if type(o) ~= "string" or o == "" or o == "?" then
        A.fail(fname, "outputs[%d] must be a result name (string), got %s", i, tostring(o))
      end
    end
  end

  local columns, seen, count = { "point" }, { point = true, error = true }, 1
  for _, axis in ipairs(axes) do
    for _, p in ipairs(axis.members) do
      if seen[p.name] then A.fail(fname, "parameter name '%s' is used twice (or reserved)", p.name) end
      seen[p.name] = true
      columns[#columns + 1] = p.name
    end
    count = count * axis.len
  end
  if count > (1 << 53) then A.fail(fname, "the grid has more than 2^53 points") end
  local nparams = #columns - 1
  -- A name ending in "?" is an output that may be absent at some points (an empty cell
  -- there); the column drops the "?".  Any other output must be in every result.
  local outnames, getters = {}, {}
  for i, o in ipairs(outputs or { "value" }) do
    getters[i], outnames[i] = RP.compile(fname, "output", o)
  end
  for _, o in ipairs(outnames) do
    if seen[o] then A.fail(fname, "output '%s' has the name of a parameter or column", o) end
    seen[o] = true
    columns[#columns + 1] = o
  end
  columns[#columns + 1] = "error"

  local s = { count = count, columns = columns, format = format, nparams = nparams }

  -- The parameters of point i (1-based): decode i - 1 in mixed radix, last axis fastest.
  function s.point(i)
    if math.type(i) ~= "integer" or i < 1 or i > count then
      A.fail(fname, "point %s is out of range; allowed 1 to %d", tostring(i), count)
    end
    local p, k = {}, i - 1
    for a = #axes, 1, -1 do
      local axis = axes[a]
      local j = k % axis.len + 1
      k = k // axis.len
      for _, m in ipairs(axis.members) do p[m.name] = m.value(j) end
    end
    return p
  end

  local function pick(result, o, i)
    local v = getters[o](result, nil, i)
    local t = type(v)
    if t == "table" or t == "function" or t == "userdata" or t == "thread" then
      error(string.format("%s: output '%s' is a %s; outputs must be numbers, strings or booleans",
        fname, outnames[o], t), 0)
    end
    return v
  end

  -- Evaluate point i: returns the row's values as a list aligned with `columns`
  -- (with field n) and the parameter table.  A Lua error inside `evaluate` becomes the
  -- row's error text; a result of the wrong shape is an error of the whole sweep.
  function s.evaluate(i)
    local p = s.point(i)
    local values = { i, n = #columns }
    for c = 2, nparams + 1 do values[c] = p[columns[c]] end
    local arg = {}
    for k, v in pairs(p) do arg[k] = v end
    local ok, result = pcall(evaluate, arg)
    if ok and type(result) == "table" and type(result.run) == "function" then
      ok, result = pcall(result.run, result) -- a plan: run it
    end
    if not ok then
      values[#columns] = tostring(result)
      return values, p
    end
    if outputs == nil then
      if type(result) ~= "number" then
        error(string.format("%s: evaluate returned a %s at point %d; list the results to keep in " ..
          "outputs = {...} or return a number", fname, type(result), i), 0)
      end
      values[nparams + 2] = result
    else
      if type(result) ~= "table" then
        error(string.format("%s: evaluate returned a %s at point %d; with outputs it must return a table",
          fname, type(result), i), 0)
      end
      for o = 1, #outnames do values[nparams + 1 + o] = pick(result, o, i) end
    end
    return values, p
  end

  function s.format_row(values)
    if format == "csv" then return encode.csv_record(values, #columns) end
    return encode.json_row(columns, values)
  end

  -- The whole text of row i, ready to append to the file.
  function s.row(i)
    return s.format_row((s.evaluate(i)))
  end

  s.header = format == "csv" and encode.csv_record(columns) or ""
  -- what `coldprep sweep --resume` checks every row against: the header (CSV: as many
  -- fields) or the keys as written (JSON Lines)
  local keys = {}
  for c = 1, #columns do keys[c] = encode.json_string(columns[c]) end
  s.shape = format == "csv" and s.header or table.concat(keys, ",")
  return s
end

-- The format a path implies: JSON Lines for .jsonl/.ndjson, CSV otherwise.
local function format_of(path)
  local ext = path:match("%.([%w]+)$")
  ext = ext and ext:lower()
  if ext == "jsonl" or ext == "ndjson" then return "jsonl" end
  return "csv"
end

function M.prepare(args)
  local fname = "sweep.prepare"
  A.table(fname, args, { "sweep", "format" })
  local desc = A.typed(fname, args, "sweep", "table")
  local format = A.option(fname, args, "format", { "csv", "jsonl" }, "csv")
  return compile("sweep", desc, format)
end

cp.set_help(M.prepare, [[
sweep.prepare{sweep = DESCRIPTION, format = "csv" | "jsonl"}: check a sweep description
(the table cp.sweep takes) and return it compiled, without running it:
  {count, columns = {"point", params..., outputs..., "error"}, header (CSV header line or ""),
   point(i) -> the parameter table of point i (1..count),
   evaluate(i) -> the row's values aligned with columns, row(i) -> the row's text}
`coldprep sweep` uses it to run one description on several Lua states.
Example: local s = cp.sweep.prepare{sweep = {parameters = {{name = "x", values = {1, 2}}},
                                     evaluate = function(p) return p.x^2 end}}
         print(s.count, s.row(2))   --> 2   2,2,4,]])

-- Open `out` for a new sweep: under its lock PATH.lock (the one `coldprep sweep` takes, so
-- neither truncates a file the other is writing), without following a symbolic link, after
-- removing a completion marker PATH.done that would describe the old rows.  A device or
-- pipe (not a regular file) takes no lock.  Returns the file and the lock (or nil).
local function open_output(fname, out)
  local lock, lerr
  local kind = files.kind(out)
  if kind == "link" then A.fail(fname, "the output %s is a symbolic link; give the file's own path", out) end
  if kind == nil or kind == "file" then
    lock, lerr = files.lock(out)
    if not lock then A.fail(fname, "%s", lerr) end
    os.remove(out .. ".done")
  end
  local f, err = files.open(out, "w")
  if not f then
    if lock then lock:release() end
    A.fail(fname, "cannot open the output file %s", err)
  end
  f:setvbuf("full")
  return f, lock
end

local function run(args)
  local fname = "sweep"
  A.table(fname, args, DESCRIPTION_KEYS)
  local out = A.typed(fname, args, "out", "string", false) or nil
  local format = args.format or (out and format_of(out)) or "csv"
  format = A.option(fname, { format = format }, "format", { "csv", "jsonl" })
  local on_row = A.typed(fname, args, "on_row", "function", false) or nil
  local s = compile(fname, args, format)
  local f
  -- Write and flush text, failing the sweep when the disk refuses (full, quota, I/O error).
  local function put(text)
    local ok, err = f:write(text)
    if ok then ok, err = f:flush() end
    if not ok then A.fail(fname, "cannot write %s: %s", out, tostring(err)) end
  end
  local lock
  if out then
    f, lock = open_output(fname, out)
    put(s.header)
  end
  local rows = (not out) and {} or nil
  local failed = 0
  local ok, err = pcall(function()
    for i = 1, s.count do
      local values, p = s.evaluate(i)
      if values[#s.columns] ~= nil then failed = failed + 1 end
      if f then put(s.format_row(values)) end
      if rows or on_row then
        local row = {}
        for c = 1, #s.columns do row[s.columns[c]] = values[c] end
        if rows then rows[i] = row end
        if on_row then on_row(row, p) end
      end
    end
  end)
  if f then
    local closed, cerr = f:close()
    if ok and not closed then ok, err = false, string.format("%s: cannot write %s: %s", fname, out, tostring(cerr)) end
  end
  if lock then lock:release() end
  if not ok then error(err, 0) end
  return { count = s.count, columns = s.columns, rows = rows, out = out, format = format,
    failed = failed }
end

-- Load a sweep file (a Lua chunk that returns a sweep description) and compile it for
-- the output path `out` (default: desc.out, else FILE with .lua replaced by .csv).
function M.load(args)
  local fname = "sweep.load"
  A.table(fname, args, { "file", "out", "format" })
  local file = A.typed(fname, args, "file", "string")
  local chunk, err = loadfile(file, "t")
  if not chunk then A.fail(fname, "%s", err) end
  local desc = chunk()
  if type(desc) ~= "table" then
    A.fail(fname, "%s: a sweep file must return a sweep description table " ..
      "(return {parameters = ..., evaluate = ...}), got %s", file, type(desc))
  end
  local out = args.out or desc.out or (file:gsub("%.lua$", "") .. ".csv")
  if type(out) ~= "string" then A.fail("sweep", "out must be a path (string), got %s", type(out)) end
  local format = args.format or desc.format or format_of(out)
  format = A.option("sweep", { format = format }, "format", { "csv", "jsonl" })
  local s = compile("sweep", desc, format)
  s.out = out
  return s
end

cp.set_help(M.load, [[
sweep.load{file = "scan.lua" [, out = PATH] [, format = "csv" | "jsonl"]}: run a sweep file
(a Lua chunk returning a sweep description, as `coldprep sweep` reads it) and return the
compiled sweep (see sweep.prepare) with its output path in field out.
Example: local s = cp.sweep.load{file = "scan.lua"}; print(s.count, s.out)]])

-- Read a sweep file (CSV as written here, or JSON Lines) back into a list of rows.
function M.read(args)
  local fname = "sweep.read"
  A.table(fname, args, { "path", "format" })
  local path = A.typed(fname, args, "path", "string")
  local format = A.option(fname, args, "format", { "csv", "jsonl" }, format_of(path))
  local f, err = io.open(path, "rb")
  if not f then A.fail(fname, "cannot open %s", err) end
  local text = f:read("a")
  f:close()
  local decoder = format == "csv" and decode.csv or decode.jsonl
  local columns, rows = decoder(text, fname .. ": " .. path)
  return { rows = rows, columns = columns }
end

cp.set_help(M.read, [[
sweep.read{path = FILE [, format = "csv" | "jsonl"]}: read a sweep's output back.
Returns {rows = {{point = 1, x = ..., y = ..., error = nil}, ...}, columns = {...}}.
Empty fields are nil; decimal numbers are converted.  A row cut off (no line end), of the
wrong width or breaking CSV (RFC 4180) or JSON (RFC 8259) grammar is an error naming the
byte.  Example: cp.sweep.read{path = "scan.csv"}]])

setmetatable(M, { __call = function(_, args) return run(args) end })
M.run = run

cp.set_help(run, [[
cp.sweep{parameters = {...}, evaluate = function(p) ... end [, outputs = {...}]
         [, combine = "grid" | "zip"] [, out = PATH] [, format = "csv" | "jsonl"]
         [, on_row = function(row, p) end]}
Evaluate a function (or a plan) at every point of a parameter grid.
parameters: a list of axes, the first varying slowest; each axis is
  {name = "x", from = a, to = b, points = n [, scale = "linear" | "log"]}  (SI units)
  {name = "x", values = {v1, v2, ...}}
  {zip = {{name = "x", values = {...}}, {name = "y", values = {...}}}}  (advance together)
  combine = "zip" zips all parameters instead of forming the full grid.
evaluate(p): p = {x = ..., y = ...}; returns a number (column "value") or a table from
  which outputs picks values by name ("number", or a path such as "final.t_over_tf");
  a declared output missing from a result stops the sweep (naming the keys there), unless
  its name ends in "?" ("final.t_over_tf?": may be absent, an empty cell there) or the
  result declares the key (a plan's budget: limiting_stage, final.t_over_tc, ...);
  if it returns a plan (a table with a run method) the plan is run.  A Lua error in
  evaluate is recorded in the row's "error" column and the sweep goes on.
out: stream rows to this file as they finish (CSV, or JSON Lines for .jsonl), memory
  flat; without out the rows are returned.
Returns {count, columns, rows (without out), out, format, failed = rows with an error}.
Parallel runs, resuming and sharding: `coldprep sweep FILE.lua` (docs/cli.md, "Sweeps").
Example: cp.sweep{parameters = {{name = "x", from = 0, to = 1, points = 5}},
                  evaluate = function(p) return {y = p.x^2} end, outputs = {"y"}}]])

return M
