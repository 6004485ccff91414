-- cp.plot: every figure is written in the format its name asks for, checked by the file
-- signatures of the formats (PNG: 8-byte signature and the IHDR chunk with width and height
-- as big-endian integers, PNG specification 2nd ed. sections 5.2 and 11.2.2; PDF: "%PDF-"
-- header, ISO 32000-1 section 7.5.2; SVG: an <svg> root element, SVG 1.1 section 5.1);
-- bad input is refused before anything is drawn.
local T = require "testlib"
local check, raises = T.expect, T.raises_named

local dir = os.tmpname()
os.remove(dir)
assert(os.execute("mkdir -p " .. dir))
local function slurp(path)
  local f = io.open(path, "rb")
  if not f then return nil end
  local s = f:read("a")
  f:close()
  return s
end
local function png_size(path)
  local s = slurp(path)
  if not s or s:sub(1, 8) ~= "\137PNG\r\n\26\n" or s:sub(13, 16) ~= "IHDR" then return nil end
  return string.unpack(">I4", s, 17), string.unpack(">I4", s, 21)
end

local x, y = {}, {}
for i = 1, 40 do x[i] = 10 ^ (i / 10); y[i] = math.sin(i / 6) + 2 end
local r = cp.plot.render{out = dir .. "/c.png", width = 640, height = 480,
  panels = {{xlabel = "x", ylabel = "y", xlog = true, lines = {{x = x, y = y, label = "curve"}},
             hlines = {{y = 2, label = "two"}}}}}
local w, h = png_size(dir .. "/c.png")
check("PNG written at the requested size", w == 640 and h == 480, tostring(w) .. "x" .. tostring(h))
check("device reported", r.device == "pngcairo")
cp.plot.render{out = dir .. "/c.svg", panels = {{lines = {{x = x, y = y}}}}}
check("SVG written", (slurp(dir .. "/c.svg") or ""):find("<svg", 1, true) ~= nil)
cp.plot.render{out = dir .. "/c.pdf", panels = {{lines = {{x = x, y = y}}}}}
check("PDF written", (slurp(dir .. "/c.pdf") or ""):sub(1, 5) == "%PDF-")

-- The ready-made figures.
local sw = cp.sweep{parameters = {{name = "a", from = 1, to = 100, points = 8, scale = "log"},
                                  {name = "b", values = {1, 2, 3}}},
  evaluate = function(p) return {n = p.a * p.b} end, outputs = {"n"}}
cp.plot.sweep{data = sw, x = "a", y = "n", group = "b", xlog = true, ylog = true, out = dir .. "/s.png"}
check("sweep curves", png_size(dir .. "/s.png") == 900)
cp.plot.map{data = sw.rows, x = "a", y = "b", z = "n", xlog = true, zlog = true, out = dir .. "/m.png"}
check("sweep map", png_size(dir .. "/m.png") == 900)
-- The legend of a grouped sweep: numbers to 6 significant digits (by hand: 1/3 ->
-- 0.333333), while group values that agree to 6 digits still make separate curves.
do
  local seen
  local render = cp.plot.render
  cp.plot.render = function(a) seen = a; return {} end
  local ok, err = pcall(cp.plot.sweep, {data = {{x = 1, y = 1, g = 1 / 3}, {x = 2, y = 2, g = 1 / 3},
    {x = 1, y = 3, g = 1 / 3 + 1e-9}, {x = 2, y = 4, g = 1 / 3 + 1e-9}}, x = "x", y = "y", group = "g",
    legend = "bottom left", out = dir .. "/unused.png"})
  cp.plot.render = render
  local lines = ok and seen.panels[1].lines or {}
  check("legend labels to 6 significant digits", ok and lines[1].label == "g = 0.333333", err or lines[1].label)
  check("groups that agree to 6 digits stay apart", #lines == 2 and lines[2].y[1] == 3, #lines)
  check("the legend position is passed on", ok and seen.panels[1].legend == "bottom left")
end
-- Logarithmic colour bars spanning less than a decade (labelled by round values rather
-- than decades), down to a nearly constant map.
for _, spread in ipairs {0.5, 1e-3, 0} do
  local rows = {}
  for i = 1, 3 do for j = 1, 3 do rows[#rows + 1] = {a = i, b = j, z = 1 + spread * (i + j)} end end
  local ok, err = pcall(cp.plot.map, {data = rows, x = "a", y = "b", z = "z", zlog = true,
    out = dir .. "/narrow.png"})
  check("log colour bar over a factor " .. (1 + 6 * spread), ok and png_size(dir .. "/narrow.png") == 900, err)
  os.remove(dir .. "/narrow.png")
end
local csv = dir .. "/sw.csv"
cp.sweep{parameters = {{name = "a", from = 1, to = 2, points = 5}}, evaluate = function(p) return p.a end, out = csv}
cp.plot.sweep{data = csv, x = "a", y = "value", out = dir .. "/f.svg"}
check("sweep curve from a CSV file", (slurp(dir .. "/f.svg") or ""):find("<svg", 1, true) ~= nil)
local streamed = cp.sweep{parameters = {{name = "a", from = 1, to = 2, points = 5}},
  evaluate = function(p) return p.a end, out = dir .. "/streamed.jsonl"}
local ok, err = pcall(cp.plot.sweep, {data = streamed, x = "a", y = "value", out = dir .. "/streamed.png"})
check("a sweep result streamed to a file is read back", ok and png_size(dir .. "/streamed.png") == 900, err)
local budget = {stages = {{name = "atoms", number = 1e6, t_over_tf = 1.1},
                          {name = "Feshbach", number = 2e5, t_over_tf = 0.8},
                          {name = "lattice", number = 1e5, t_over_tf = 0.45}}}
cp.plot.waterfall{budget = budget, out = dir .. "/w.pdf"}
check("budget waterfall", (slurp(dir .. "/w.pdf") or ""):sub(1, 5) == "%PDF-")
local t, p1, p3 = {}, {}, {}
for i = 0, 50 do t[#t + 1] = i * 1e-7; p1[#p1 + 1] = 1 - i / 50; p3[#p3 + 1] = i / 50 end
cp.plot.raman{time = t, initial = p1, target = p3, pump = p1, stokes = p3, out = dir .. "/r.png"}
local _, rh = png_size(dir .. "/r.png")
check("Raman trace (two panels, taller)", rh == 750, rh)
cp.plot.bands{quasimomenta = {-1, 0, 1}, energies_er = {{1, 1}, {0, 4}, {1, 1}}, out = dir .. "/b.png"}
check("band structure", png_size(dir .. "/b.png") == 900)
-- straight from the models: a STIRAP trace of cp.raman.transfer and cp.lattice.bands
local a = {rabi_pump = 2 * math.pi * 5e6, rabi_stokes = 2 * math.pi * 5e6, width = 3e-6, delay = 3e-6}
local tr = cp.raman.transfer{rabi_pump = a.rabi_pump, rabi_stokes = a.rabi_stokes, width = a.width,
  delay = a.delay, gamma = 2 * math.pi * 6e6, trace = 100}
cp.plot.raman{trace = tr.trace, pulses = a, out = dir .. "/rt.svg"}
check("Raman trace from cp.raman.transfer", (slurp(dir .. "/rt.svg") or ""):find("<svg", 1, true) ~= nil)
local q = {}
for i = 0, 20 do q[#q + 1] = -1 + i / 10 end
local lb = cp.lattice.bands{depth_er = 5, bands = 3, quasimomenta = q}
cp.plot.bands{quasimomenta = q, energies_er = lb.energies_er, depth_er = 5, out = dir .. "/lb.pdf"}
check("bands from cp.lattice.bands", (slurp(dir .. "/lb.pdf") or ""):sub(1, 5) == "%PDF-")
local qr = cp.reals.linear{from = -1, to = 1, count = 21}
local lr = cp.lattice.bands{depth_er = 5, bands = 3, quasimomenta = qr}
cp.plot.bands{quasimomenta = qr, energies_er = lr.energies_er, depth_er = 5, out = dir .. "/lr.svg"}
check("bands from cp.lattice.bands over a cp.reals", (slurp(dir .. "/lr.svg") or ""):find("<svg", 1, true) ~= nil)

-- Bad input.
raises("a figure's argument error names the figure", "plot.sweep: 'xlog' must be true or false", cp.plot.sweep,
  {data = {{x = 1, y = 1}, {x = 2, y = 2}}, x = "x", y = "y", xlog = "yes", out = dir .. "/never.png"})
raises("unknown format", "must end in .png, .svg or .pdf", cp.plot.render,
  {out = dir .. "/x.gif", panels = {{lines = {{x = {1, 2}, y = {1, 2}}}}}})
raises("NaN data", "NaN dimensionless is not a number", cp.plot.render,
  {out = dir .. "/x.png", panels = {{lines = {{x = {1, 0 / 0}, y = {1, 2}}}}}})
raises("log axis with zero", "logarithmic axis", cp.plot.render,
  {out = dir .. "/x.png", panels = {{ylog = true, lines = {{x = {1, 2}, y = {0, 2}}}}}})
raises("lengths differ", "2 x values but 3 y values", cp.plot.render,
  {out = dir .. "/x.png", panels = {{lines = {{x = {1, 2}, y = {1, 2, 3}}}}}})
raises("unwritable file", "cannot write", cp.plot.render,
  {out = dir .. "/no/such/dir/x.png", panels = {{lines = {{x = {1, 2}, y = {1, 2}}}}}})
raises("unknown panel key", "did you mean 'ylabel'", cp.plot.render,
  {out = dir .. "/x.png", panels = {{ylabl = "y", lines = {{x = {1, 2}, y = {1, 2}}}}}})
raises("empty panel", "needs lines, bars or a map", cp.plot.render, {out = dir .. "/x.png", panels = {{}}})
raises("map not increasing", "must increase", cp.plot.render,
  {out = dir .. "/x.png", panels = {{map = {x = {2, 1}, y = {1, 2}, z = {{1, 2}, {3, 4}}}}}})
raises("sweep: unknown column", "no row has a value in column 'nn'", cp.plot.sweep,
  {data = sw, x = "a", y = "nn", out = dir .. "/x.png"})
raises("waterfall: zero molecules", "positive finite number", cp.plot.waterfall,
  {budget = {stages = {{name = "a", number = 0}}}, out = dir .. "/x.png"})
raises("raman: trace and time both", "either trace or time", cp.plot.raman,
  {trace = tr.trace, time = {0, 1}, out = dir .. "/x.png"})
raises("raman: negative width", "width -1 s is out of range", cp.plot.raman,
  {trace = tr.trace, pulses = {rabi_pump = 1, rabi_stokes = 1, width = -1, delay = 0}, out = dir .. "/x.png"})
raises("legend position", "legend \"middle\" is not allowed", cp.plot.render,
  {out = dir .. "/x.png", panels = {{legend = "middle", lines = {{x = {1, 2}, y = {1, 2}}}}}})
raises("bands: ragged energies", "must list 2 band energies", cp.plot.bands,
  {quasimomenta = {0, 1}, energies_er = {{1, 2}, {1}}, out = dir .. "/x.png"})
check("help texts", cp.get_help(cp.plot.render) and cp.get_help(cp.plot.sweep) and cp.get_help(cp.plot.map)
  and cp.get_help(cp.plot.waterfall) and cp.get_help(cp.plot.raman) and cp.get_help(cp.plot.bands))
os.execute("rm -rf " .. dir)
T.done()
