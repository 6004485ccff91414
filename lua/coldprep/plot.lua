-- coldprep.plot: ready-made figures on plot.render (lua/bind/plot_module.c, PLplot): a sweep's
-- curve(s) or 2D map from its rows or its CSV/JSON Lines file, a budget's waterfall of
-- molecule number and T/T_F through the stages, a Raman time trace and a band structure.
-- The output format follows the file name: .png, .svg or .pdf.
local cp = require "coldprep"
local A = require "coldprep.argcheck"

local P = require "coldprep.render" -- the C binding, P.render: the plot module, opened now

-- Draw a figure with P.render; its argument errors are reported as fname's, without
-- the position inside this file (the caller's argument is what was wrong).
local function render(fname, figure)
  local ok, res = pcall(P.render, figure)
  if ok then return res end
  local msg = type(res) == "string" and res:match("plot%.render: (.*)$")
  if msg then A.fail(fname, "%s", msg) end
  error(res, 0)
end

-- Rows from `data`: a list of row tables, a cp.sweep result (its rows), or a file name.
local function find_rows(fname, data)
  if type(data) == "string" then return cp.sweep.read { path = data }.rows end
  if type(data) == "table" and type(data.rows) == "table" then return data.rows end
  -- a cp.sweep result streamed to a file keeps no rows: read them back
  if type(data) == "table" and type(data.out) == "string" and type(data.columns) == "table" then
    return cp.sweep.read { path = data.out, format = data.format }.rows
  end
  if type(data) == "table" then return data end
  A.fail(fname, "data must be rows, a cp.sweep result or a file name, got %s", type(data))
end

local function rows_of(fname, data)
  local rows = find_rows(fname, data)
  for i, r in ipairs(rows) do
    if type(r) ~= "table" then A.fail(fname, "row %d of data must be a table of columns, got %s", i, type(r)) end
  end
  return rows
end

local function column(fname, rows, name)
  if type(name) ~= "string" then A.fail(fname, "column names must be strings, got %s", type(name)) end
  for _, r in ipairs(rows) do
    if r[name] ~= nil then return end
  end
  A.fail(fname, "no row has a value in column '%s'", name)
end

local function usable(v, logscale)
  return A.is_finite(v) and (not logscale or v > 0)
end

local function sweep(args)
  local fname = "plot.sweep"
  A.table(fname, args, { "data", "x", "y", "group", "out", "title", "xlabel", "ylabel",
    "xlog", "ylog", "points", "legend" })
  local out = A.typed(fname, args, "out", "string")
  local rows = rows_of(fname, args.data)
  local ys = type(args.y) == "table" and args.y or { args.y }
  column(fname, rows, args.x)
  for _, y in ipairs(ys) do column(fname, rows, y) end
  if args.group ~= nil then column(fname, rows, args.group) end
  local xlog, ylog = args.xlog or false, args.ylog or false
  -- one curve per output, or per value of `group` (the other axis of a 2D sweep)
  local curves, order = {}, {}
  for _, r in ipairs(rows) do
    for _, y in ipairs(ys) do
      local key, label = y, y
      if args.group then
        local g = r[args.group]
        key = string.format("%s = %s", args.group, tostring(g))
        -- the legend shows 6 significant digits: 28947.368421053 would hide the curves
        label = type(g) == "number" and string.format("%s = %.6g", args.group, g) or key
        if #ys > 1 then key, label = y .. ", " .. key, y .. ", " .. label end
      end
      local c = curves[key]
      if not c then
        c = { x = {}, y = {}, label = label, points = args.points or false }
        curves[key] = c
        order[#order + 1] = key
      end
      if usable(r[args.x], xlog) and usable(r[y], ylog) then
        c.x[#c.x + 1], c.y[#c.y + 1] = r[args.x], r[y]
      end
    end
  end
  local lines = {}
  for _, key in ipairs(order) do
    if #curves[key].x > 0 then lines[#lines + 1] = curves[key] end
  end
  if #lines == 0 then A.fail(fname, "no row has finite values to plot") end
  if #lines > 16 then A.fail(fname, "%d curves; at most 16 (choose fewer group values)", #lines) end
  if #lines == 1 and #ys == 1 and not args.group then lines[1].label = nil end
  return render(fname, { out = out, panels = { {
    title = args.title, xlabel = args.xlabel or args.x, ylabel = args.ylabel or table.concat(ys, ", "),
    xlog = xlog, ylog = ylog, lines = lines, legend = args.legend } } })
end

cp.set_help(sweep, [[
plot.sweep{data = ROWS | RESULT | "scan.csv", x = "column", y = "column" | {"col", ...},
           out = "fig.png" [, group = "column"] [, title, xlabel, ylabel] [, xlog, ylog]
           [, points = false] [, legend = "top right" | "bottom left" | ...]}
A sweep's curve(s): y against x, one curve per y column, or per value of `group` (the
other parameter of a 2D sweep).  Rows with errors or non-finite values are skipped.
legend: the corner (or side) of the frame the legend sits in, as in plot.render.
Returns {out, device}.  Example:
  local r = cp.sweep{parameters = {{name = "x", from = 0, to = 1, points = 21}},
                     evaluate = function(p) return p.x^2 end}
  cp.plot.sweep{data = r, x = "x", y = "value", out = "x2.png"}]])

local function map(args)
  local fname = "plot.map"
  A.table(fname, args, { "data", "x", "y", "z", "out", "title", "xlabel", "ylabel", "zlabel",
    "xlog", "ylog", "zlog" })
  local out = A.typed(fname, args, "out", "string")
  local rows = rows_of(fname, args.data)
  column(fname, rows, args.x)
  column(fname, rows, args.y)
  column(fname, rows, args.z)
  local xs, ys, xi, yi = {}, {}, {}, {}
  for _, r in ipairs(rows) do
    local x, y = r[args.x], r[args.y]
    if A.is_finite(x) and not xi[x] then xi[x] = true; xs[#xs + 1] = x end
    if A.is_finite(y) and not yi[y] then yi[y] = true; ys[#ys + 1] = y end
  end
  table.sort(xs)
  table.sort(ys)
  if #xs < 2 or #ys < 2 then A.fail(fname, "a map needs at least 2 distinct x and y values") end
  for i, x in ipairs(xs) do xi[x] = i end
  for j, y in ipairs(ys) do yi[y] = j end
  local z = {}
  for j = 1, #ys do z[j] = {} end
  for _, r in ipairs(rows) do
    local i, j, v = xi[r[args.x]], yi[r[args.y]], r[args.z]
    if i and j and A.is_finite(v) then z[j][i] = v end
  end
  for j = 1, #ys do
    for i = 1, #xs do
      if z[j][i] == nil then z[j][i] = 0 / 0 end
    end
  end
  return render(fname, { out = out, panels = { {
    title = args.title, xlabel = args.xlabel or args.x, ylabel = args.ylabel or args.y,
    xlog = args.xlog or false, ylog = args.ylog or false,
    map = { x = xs, y = ys, z = z, zlabel = args.zlabel or args.z, zlog = args.zlog or false } } } })
end

cp.set_help(map, [[
plot.map{data = ROWS | RESULT | "scan.csv", x = "column", y = "column", z = "column",
         out = "map.png" [, title, xlabel, ylabel, zlabel] [, xlog, ylog, zlog]}
A 2D sweep as a colour map of z over the (x, y) grid, with a colour bar; missing or
failed points are left blank.  Returns {out, device}.
Example: cp.plot.map{data = "scan.csv", x = "ramp_rate", y = "hold", z = "final.number",
                     xlog = true, out = "scan.png"}]])

local function format_count(n)
  if n >= 1e6 then return string.format("%.3g", n) end
  return string.format("%.0f", n)
end

local function waterfall(args)
  local fname = "plot.waterfall"
  A.table(fname, args, { "budget", "out", "title", "limit" })
  local out = A.typed(fname, args, "out", "string")
  local budget = A.typed(fname, args, "budget", "table")
  local stages = budget.stages
  if type(stages) ~= "table" or #stages == 0 then
    A.fail(fname, "budget.stages must be a non-empty list of {name, number, t_over_tf}")
  end
  if #stages > 64 then A.fail(fname, "at most 64 stages") end
  local names, numbers, notes, ratio_x, ratio_y, ratio_label = {}, {}, {}, {}, {}, "T/T#dF#u"
  for i, s in ipairs(stages) do
    if type(s) ~= "table" then A.fail(fname, "budget.stages[%d] must be a table", i) end
    if s.name ~= nil and type(s.name) ~= "string" then
      A.fail(fname, "budget.stages[%d].name must be a string, got %s", i, type(s.name))
    end
    names[i] = s.name or ("stage " .. i)
    local n = s.number
    if not (A.is_finite(n) and n > 0) then
      A.fail(fname, "stage %d (%s): number must be a positive finite number, got %s", i, names[i], tostring(n))
    end
    numbers[i] = n
    local prev = i > 1 and numbers[i - 1] or nil
    notes[i] = format_count(n) .. (prev and string.format(" (%.0f %%)", 100 * n / prev) or "")
    local r = s.t_over_tf or s.t_over_tc
    if s.t_over_tf == nil and s.t_over_tc ~= nil then ratio_label = "T/T#dc#u" end
    if r ~= nil and not usable(r, true) then
      A.fail(fname, "stage %d (%s): %s must be a positive finite number, got %s", i, names[i],
        s.t_over_tf ~= nil and "t_over_tf" or "t_over_tc", tostring(r))
    end
    if r ~= nil then
      ratio_x[#ratio_x + 1], ratio_y[#ratio_y + 1] = i, r
    end
  end
  local lo, hi = math.huge, 0
  for _, n in ipairs(numbers) do lo, hi = math.min(lo, n), math.max(hi, n) end
  local verdict = budget.verdict
  if type(verdict) == "table" then verdict = verdict.text end
  local panels = { {
    -- a logarithmic axis once the numbers span more than a factor 20 (PLplot labels decades)
    title = args.title or (type(verdict) == "string" and verdict or nil), ylabel = "molecules",
    ylog = hi / lo > 20,
    bars = { values = numbers, categories = names, notes = notes } } }
  if #ratio_x > 0 then
    local limit = A.number(fname, args, "limit", "SI units",
      { optional = true, default = ratio_label == "T/T#dF#u" and 0.5 or 1, positive = true })
    panels[2] = { ylabel = ratio_label, ymin = 0, categories = names,
      lines = { { x = ratio_x, y = ratio_y, points = true } },
      hlines = { { y = limit, label = string.format("degenerate below %g", limit) } } }
  end
  return render(fname, { out = out, panels = panels, height = #panels == 2 and 800 or 500 })
end

cp.set_help(waterfall, [[
plot.waterfall{budget = BUDGET, out = "budget.png" [, title] [, limit = 0.5]}
A budget's waterfall: molecule number after each stage (bars, logarithmic, with the
stage's survival in %) and T/T_F (or T/T_c) through the stages against the degeneracy
limit.  BUDGET is plan:run()'s result or any {stages = {{name, number, t_over_tf}, ...}}.
Returns {out, device}.  Example: cp.plot.waterfall{budget = plan:run(), out = "budget.pdf"}]])

local function series(fname, t, key, n)
  local v = t[key]
  if v == nil then return nil end
  if type(v) ~= "table" or #v ~= n then
    A.fail(fname, "'%s' must be a list of %d numbers (one per time)", key, n)
  end
  return v
end

local function raman(args)
  local fname = "plot.raman"
  A.table(fname, args, { "time", "initial", "excited", "target", "pump", "stokes", "trace",
    "pulses", "out", "title", "time_unit" })
  local out = A.typed(fname, args, "out", "string")
  -- a trace from cp.raman.transfer{..., trace = n} supplies time and the populations
  local src = args
  if args.trace ~= nil then
    src = A.typed(fname, args, "trace", "table")
    for _, key in ipairs { "time", "initial", "excited", "target" } do
      if args[key] ~= nil then A.fail(fname, "give either trace or %s, not both", key) end
    end
  end
  local time = A.typed(fname, src, "time", "table")
  local n = #time
  if n < 2 then A.fail(fname, "time must hold at least 2 values (s)") end
  local unit = A.number(fname, args, "time_unit", "SI units",
    { optional = true, default = 1e-6, positive = true })
  local t = {}
  for i = 1, n do
    if not A.is_finite(time[i]) then A.fail(fname, "time[%d] is not a finite number", i) end
    t[i] = time[i] / unit
  end
  local tlabel = unit == 1e-6 and "time (#gms)" or string.format("time (units of %g s)", unit)
  local pops = {}
  for _, key in ipairs { "initial", "excited", "target" } do
    local v = series(fname, src, key, n)
    if v then pops[#pops + 1] = { x = t, y = v, label = key } end
  end
  if #pops == 0 then A.fail(fname, "give at least one of initial, excited, target (populations)") end
  -- Rabi frequencies: given per time, or Gaussian pulses in cp.raman's convention,
  -- Omega(t) = rabi exp(-(t - tc)^2 / width^2), Stokes delay/2 before t = 0, pump delay/2 after
  local pump, stokes = series(fname, args, "pump", n), series(fname, args, "stokes", n)
  if args.pulses ~= nil then
    if pump or stokes then A.fail(fname, "give either pulses or pump/stokes, not both") end
    local pl = A.table(fname, A.typed(fname, args, "pulses", "table"),
      { "rabi_pump", "rabi_stokes", "width", "delay" })
    local rp, rs = A.number(fname, pl, "rabi_pump", "rad/s", { nonnegative = true }),
      A.number(fname, pl, "rabi_stokes", "rad/s", { nonnegative = true })
    local w, d = A.number(fname, pl, "width", "s",
      { positive = true }), A.number(fname, pl, "delay", "s")
    pump, stokes = {}, {}
    for i = 1, n do
      pump[i] = rp * math.exp(-((time[i] - d / 2) / w)^2)
      stokes[i] = rs * math.exp(-((time[i] + d / 2) / w)^2)
    end
  end
  local panels, rabi = {}, {}
  for _, pair in ipairs { { "pump", pump }, { "stokes", stokes } } do
    if pair[2] then
      local scaled = {}
      for i = 1, n do scaled[i] = pair[2][i] / (2 * math.pi * 1e6) end
      rabi[#rabi + 1] = { x = t, y = scaled, label = pair[1], dashed = pair[1] == "stokes" }
    end
  end
  if #rabi > 0 then
    panels[#panels + 1] = { title = args.title, ylabel = "#gW/2#gp (MHz)", lines = rabi }
  end
  panels[#panels + 1] = { title = #rabi == 0 and args.title or nil, xlabel = tlabel,
    ylabel = "population", ymin = 0, ymax = 1.05, lines = pops, legend = "right" }
  return render(fname, { out = out, panels = panels, height = #panels == 2 and 750 or 500 })
end

cp.set_help(raman, [[
plot.raman{trace = RESULT.trace | time = {...} (s), initial = {...}, excited = {...},
           target = {...} [, pump = {...}, stokes = {...} (rad/s) |
           pulses = {rabi_pump, rabi_stokes, width, delay}], out = "raman.png"
           [, title] [, time_unit = 1e-6 (s)]}
A Raman (STIRAP) time trace: the pulses' Rabi frequencies (as Omega/2pi in MHz) above and
the populations of the three states below, against time.  trace is what
cp.raman.transfer{..., trace = n} returns; pulses draws Gaussian pulses in cp.raman's
convention (Stokes delay/2 before t = 0, pump delay/2 after).  Returns {out, device}.
Example: local a = {rabi_pump = 2*math.pi*5e6, rabi_stokes = 2*math.pi*5e6, width = 3e-6,
                    delay = 3e-6}
         local r = cp.raman.transfer{rabi_pump = a.rabi_pump, rabi_stokes = a.rabi_stokes,
           width = a.width, delay = a.delay, gamma = 2*math.pi*6e6, trace = 400}
         cp.plot.raman{trace = r.trace, pulses = a, out = "stirap.png"}]])

-- A list of numbers: a table or a cp.reals (what cp.lattice.bands returns for either).
local function is_list(v) return type(v) == "table" or cp.reals.is(v) end

local function bands(args)
  local fname = "plot.bands"
  A.table(fname, args, { "quasimomenta", "energies_er", "out", "title", "depth_er" })
  local out = A.typed(fname, args, "out", "string")
  local q = is_list(args.quasimomenta) and args.quasimomenta
    or A.typed(fname, args, "quasimomenta", "table")
  local e = A.typed(fname, args, "energies_er", "table")
  if #q < 2 or #e ~= #q then
    A.fail(fname, "energies_er must hold one list of band energies per quasimomentum (%d), got %d",
      #q, #e)
  end
  local nb = is_list(e[1]) and #e[1] or 0
  if nb == 0 then A.fail(fname, "energies_er[1] must list the band energies (E_R)") end
  if nb > 16 then A.fail(fname, "at most 16 bands") end
  local lines = {}
  for b = 1, nb do lines[b] = { x = {}, y = {}, label = "band " .. b } end
  for i = 1, #q do
    if not A.is_finite(q[i]) then A.fail(fname, "quasimomenta[%d] is not a finite number", i) end
    if not is_list(e[i]) or #e[i] ~= nb then
      A.fail(fname, "energies_er[%d] must list %d band energies", i, nb)
    end
    for b = 1, nb do
      if not A.is_finite(e[i][b]) then A.fail(fname, "energies_er[%d][%d] is not finite", i, b) end
      lines[b].x[i], lines[b].y[i] = q[i], e[i][b]
    end
  end
  local title = args.title
  if not title and args.depth_er then title = string.format("lattice depth %g E#dR#u", args.depth_er) end
  return render(fname, { out = out, panels = { { title = title, xlabel = "quasimomentum q (units of k)",
    ylabel = "energy (E#dR#u)", lines = lines } } })
end

cp.set_help(bands, [[
plot.bands{quasimomenta = {...} (units of k), energies_er = {{band 1, band 2, ...}, ...},
           out = "bands.png" [, title] [, depth_er = s (for the title)]}
A band structure: the energy of each band (recoil energies) against quasimomentum, in the
shape cp.lattice.bands returns.  Returns {out, device}.
Example: local q = {}; for i = 0, 40 do q[#q + 1] = -1 + i / 20 end
         local b = cp.lattice.bands{depth_er = 5, bands = 3, quasimomenta = q}
         cp.plot.bands{quasimomenta = q, energies_er = b.energies_er, out = "bands.png"}]])

P.sweep, P.map, P.waterfall, P.raman, P.bands = sweep, map, waterfall, raman, bands
return P
