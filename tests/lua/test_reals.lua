-- Lua-level tests of cp.reals, the array type of batch calls: its constructors against the
-- spacing formulas written out here, indexing, length, iteration and conversion, its error
-- messages, and every binding that takes an array of numbers giving bit-identical numbers
-- for a reals and for the same values in a Lua table (the table path, the older one, is the
-- second method), with reals back for a reals in and tables back for a table in.
local T = require "testlib"
local cp = require "coldprep"
local R = cp.reals
local pi = math.pi

-- Bit-identical arrays (== on every element, same length).
local function same(a, b, what)
  local ok = #a == #b
  for i = 1, #a do ok = ok and a[i] == b[i] end
  T.check(ok, what .. " (" .. #a .. " values)")
end

-- REALS-1: construction, indexing, length, iteration, conversion.
local r = R.from { 1.5, -2, 3e300 }
T.check(R.is(r) and not R.is { 1 } and not R.is(1), "reals.is")
T.check(#r == 3 and r[1] == 1.5 and r[2] == -2 and r[3] == 3e300, "from keeps the values")
T.check(r[0] == nil and r[4] == nil and r[-1] == nil, "nil outside 1..#r (so ipairs stops)")
local seen = {}
for i, v in ipairs(r) do seen[#seen + 1] = i .. "=" .. v end
T.check(table.concat(seen, " ") == "1=1.5 2=-2.0 3=3e+300", "ipairs walks the values in order")
seen = {}
for i, v in pairs(r) do seen[#seen + 1] = i .. "=" .. v end
T.check(table.concat(seen, " ") == "1=1.5 2=-2.0 3=3e+300", "pairs walks the values in order")
local t = r:table()
T.check(type(t) == "table" and #t == 3 and t[3] == 3e300, "r:table() is a Lua sequence")
local c = r:copy()
c[1] = 7
T.check(c[1] == 7 and r[1] == 1.5, "r:copy() is independent")
T.check(R.from(r)[2] == -2 and #R.from {} == 0, "from a reals; an empty reals")
T.check(tostring(R.from { 1, 2 }) == "reals(2): 1, 2", "tostring")
T.check(tostring(R.filled { count = 12, value = 0.5 }):find("0.5, ..., 0.5", 1, true) ~= nil,
  "tostring of a long reals elides the middle")
local f = R.filled { count = 4 }
T.check(#f == 4 and f[1] == 0 and f[4] == 0, "filled defaults to 0")
T.check(getmetatable(r) == "coldprep.reals", "the metatable is protected")

-- REALS-2: spaced constructors against the formulas of the cp.sweep axes, written out here
-- (docs/api/sweep.md: from + (to - from) (j-1)/(n-1) and from (to/from)^((j-1)/(n-1))),
-- both ends exact.
local lin = R.linear { from = -3, to = 5, count = 9 }
local ok = #lin == 9
for j = 1, 9 do ok = ok and lin[j] == -3 + (5 - -3) * (j - 1) / 8 end
T.check(ok, "linear spacing = the sweep formula, bit for bit")
local g = R.geometric { from = 1e-3, to = 1e3, count = 13 }
ok = #g == 13 and g[1] == 1e-3 and g[13] == 1e3
for j = 2, 12 do ok = ok and math.abs(g[j] / (1e-3 * 1e6 ^ ((j - 1) / 12)) - 1) < 4 * 2.2e-16 end
T.check(ok, "geometric spacing = the sweep formula within 4 DBL_EPSILON, ends exact")
local neg = R.geometric { from = -1e-3, to = -1e3, count = 7 }
T.check(neg[1] == -1e-3 and neg[7] == -1e3 and math.abs(neg[4] + 1) < 4 * 2.2e-16,
  "geometric with both ends negative (ramp rates of a falling field)")
local wide = R.geometric { from = 1e-300, to = 1e300, count = 3 }
T.check(wide[1] == 1e-300 and math.abs(wide[2] - 1) < 1e-13 and wide[3] == 1e300,
  "geometric over 600 decades (to/from overflows; logarithms used)")
local huge = R.linear { from = -1e308, to = 1e308, count = 3 }
T.check(huge[2] == 0 and huge[3] == 1e308, "linear across the double range (to - from overflows)")

-- REALS-3: errors in the house wording: context, what, value, allowed range.
T.raises(function() r[2] = 0 / 0 end, { "reals: element 2 NaN is not a number; allowed finite values" },
  "NaN refused")
T.raises(function() r[1] = -math.huge end, { "reals: element 1 -inf is infinite" }, "-inf refused")
T.raises(function() r[4] = 1 end, { "reals: index 4 is out of range; allowed [1, 3]" },
  "a reals keeps its length")
T.raises(function() r[1] = "1" end, { "reals: element 1 must be a number, got string" },
  "a string is not a number")
T.raises(function() r.x = 1 end, { "index must be an integer in [1, 3], got x" }, "names refused")
T.raises(function() R.from { 1, 2, 0 / 0 } end, { "reals.from: element 3 NaN is not a number" },
  "from refuses NaN")
T.raises(function() R.from { 1, {} } end, { "reals.from: element 2 must be a number, got table" },
  "from refuses a table element")
T.raises(function() R.from "1, 2" end, { "reals.from: expects a sequence of numbers or a reals" },
  "from refuses a string")
T.raises(function() R.linear { from = 0, to = 1, count = 1 } end,
  { "reals.linear: count 1 is out of range; allowed [2, 1000000000]" }, "count >= 2")
T.raises(function() R.linear { from = 0, to = 1 } end, { "missing argument 'count'" }, "count needed")
T.raises(function() R.linear { from = 0, to = 0 / 0, count = 3 } end,
  { "reals.linear: to NaN dimensionless is not a number" }, "to must be finite")
T.raises(function() R.linear { from = 0, too = 1, count = 3 } end, { "did you mean 'to'" },
  "unknown key suggests")
T.raises(function() R.geometric { from = 0, to = 1, count = 3 } end,
  { "reals.geometric: from 0 is out of range; allowed non-zero values" }, "geometric from 0")
T.raises(function() R.geometric { from = -1, to = 1, count = 3 } end,
  { "reals.geometric: to 1 is out of range; allowed negative values (the sign of from -1)" },
  "geometric across zero")
local mt = debug.getmetatable(r)
T.raises(function() mt.__index(io.stdout, 1) end, { "coldprep.reals expected, got FILE*" },
  "the metamethods, reached through debug, refuse other userdata")
T.raises(function() mt.__newindex({}, 1, 1) end, { "coldprep.reals expected, got table" },
  "and tables")
T.raises(function() R.filled { count = -1 } end, { "count -1 is out of range; allowed [0," },
  "filled count >= 0")

-- REALS-4: feshbach.ramp_law: a reals in, a reals out, the same bits as the table path.
local res, mol = cp.species.resonance("KRb"), cp.species.molecule("KRb")
local rates = R.geometric { from = -1e-3, to = -1e3, count = 301 }
local fr = cp.feshbach.ramp_law { resonance = res, molecule = mol, density = 1e18, ramp_rates = rates }
local ft = cp.feshbach.ramp_law { resonance = res, molecule = mol, density = 1e18, ramp_rates = rates:table() }
T.check(R.is(fr.efficiency) and type(ft.efficiency) == "table", "reals in, reals out; table in, table out")
same(fr.efficiency, ft.efficiency, "ramp_law: reals path = table path")
T.raises(function()
  cp.feshbach.ramp_law { resonance = res, molecule = mol, density = 1e18, ramp_rates = R.from { 1, 0 } }
end, { "feshbach.ramp_law: rates[2] 0 T/s is out of range; allowed 1e-06 <= |rate| <= 1e+09 T/s" },
  "a reals element out of range names index (counted from 1), value, unit, range")
T.raises(function()
  cp.feshbach.ramp_law { resonance = res, molecule = mol, density = 1e18, ramp_rates = R.from {} }
end, { "argument 'ramp_rates' has 0 values; at least 1 are needed" }, "an empty reals")
T.raises(function()
  cp.feshbach.ramp_law { resonance = res, molecule = mol, density = 1e18, ramp_rates = io.stdout }
end, { "argument 'ramp_rates' must be an array of numbers (T/s), a table or a reals, got userdata" },
  "other userdata refused")

-- REALS-5: fields.stark over a reals of fields, one state and several levels.
local fields = R.linear { from = 0, to = 2e6, count = 21 }
local sr = cp.fields.stark { molecule = "KRb", field = fields, j = 1 }
local st = cp.fields.stark { molecule = "KRb", field = fields:table(), j = 1 }
T.check(R.is(sr.energy_hz) and R.is(sr.field) and R.is(sr.reduced_field), "stark: reals out")
for _, k in ipairs { "energy_hz", "induced_dipole_debye", "reduced_field", "field" } do
  same(sr[k], st[k], "stark " .. k .. ": reals path = table path")
end
local lr = cp.fields.stark { molecule = "KRb", field = fields, levels = 3 }
local lt = cp.fields.stark { molecule = "KRb", field = fields:table(), levels = 3 }
T.check(#lr.energy_hz == 21 and R.is(lr.energy_hz[5]) and #lr.energy_hz[5] == 3,
  "stark with levels: a table over fields of reals over levels")
for i = 1, 21 do
  same(lr.energy_hz[i], lt.energy_hz[i], "stark levels energy_hz[" .. i .. "]")
  same(lr.induced_dipole_debye[i], lt.induced_dipole_debye[i], "stark levels dipole[" .. i .. "]")
end

-- REALS-6: lattice.bands over a reals of quasimomenta (scrambled order).
local q = R.from { 0.3, -1, 0.95, 0, -0.2, 1, 0.5 }
local br = cp.lattice.bands { depth_er = 6, bands = 3, quasimomenta = q }
local bt = cp.lattice.bands { depth_er = 6, bands = 3, quasimomenta = q:table() }
T.check(R.is(br.quasimomenta) and R.is(br.energies_er[1]), "bands: reals out")
same(br.quasimomenta, bt.quasimomenta, "bands quasimomenta")
for i = 1, #q do same(br.energies_er[i], bt.energies_er[i], "bands energies_er[" .. i .. "]") end

-- REALS-7: raman.lineshape over a reals of detunings.
local MHz = 1e6
local pulse = { rabi_pump = 2 * pi * 5 * MHz, rabi_stokes = 2 * pi * 5 * MHz, width = 2e-6,
  delay = 2.4e-6, gamma = 2 * pi * 6 * MHz, pump_linewidth_hz = 1e3, stokes_linewidth_hz = 1e3 }
local function with(extra)
  local a = {}
  for k, v in pairs(pulse) do a[k] = v end
  for k, v in pairs(extra) do a[k] = v end
  return a
end
local det = R.linear { from = -2 * pi * 0.2 * MHz, to = 2 * pi * 0.2 * MHz, count = 5 }
local rr = cp.raman.lineshape(with { values = det })
local rt = cp.raman.lineshape(with { values = det:table() })
T.check(R.is(rr.efficiency) and R.is(rr.lost) and R.is(rr.values), "lineshape: reals out")
for _, k in ipairs { "values", "efficiency", "lost" } do
  same(rr[k], rt[k], "lineshape " .. k .. ": reals path = table path")
end

-- REALS-8: arrays that are only read: sampled pulses and ramps, a lattice depth per axis,
-- plot curves; the result equals the one from tables.
local times, pump, stokes = {}, {}, {}
for i = 0, 200 do
  local tt = -6e-6 + 12e-6 * i / 200
  times[#times + 1] = tt
  pump[#pump + 1] = pulse.rabi_pump * math.exp(-((tt - 1.2e-6) / 2e-6) ^ 2)
  stokes[#stokes + 1] = pulse.rabi_stokes * math.exp(-((tt + 1.2e-6) / 2e-6) ^ 2)
end
local sampled = { shape = "sampled", gamma = pulse.gamma, pump_linewidth_hz = 1e3, stokes_linewidth_hz = 1e3 }
local function sample_args(tt, p, s)
  local a = { times = tt, pump = p, stokes = s }
  for k, v in pairs(sampled) do a[k] = v end
  return a
end
T.check(cp.raman.transfer(sample_args(R.from(times), R.from(pump), R.from(stokes))).efficiency
  == cp.raman.transfer(sample_args(times, pump, stokes)).efficiency, "raman sampled pulses from reals")
local recoil = cp.lattice.recoil { mass = mol.mass, wavelength = 1064e-9 }.energy
local ts = R.linear { from = 0, to = 1e-3, count = 400 }
local ds = R.linear { from = 0, to = 10, count = 400 }
T.check(cp.lattice.loading { shape = "sampled", times = ts, depths_er = ds, recoil = recoil }.excited_fraction
  == cp.lattice.loading { shape = "sampled", times = ts:table(), depths_er = ds:table(),
    recoil = recoil }.excited_fraction, "lattice.loading sampled from reals")
local trap = { number = 2e4, mass = mol.mass, statistics = "fermion", temperature = 50e-9,
  wavelength = 1064e-9, envelope_omega_bar = 2 * pi * 60, bands = 2, points = 8, bins = 16 }
local function lattice_args(depth)
  local a = { depth_er = depth }
  for k, v in pairs(trap) do a[k] = v end
  return a
end
T.check(cp.thermo.lattice_state(lattice_args(R.from { 10, 12, 14 })).entropy_per_particle
  == cp.thermo.lattice_state(lattice_args { 10, 12, 14 }).entropy_per_particle,
  "thermo depth_er per axis from a reals")
T.raises(function() cp.thermo.lattice_state(lattice_args(R.from { 10, 12 })) end,
  { "thermo.lattice_state: argument 'depth_er' has 2 values; at least 3 are needed" },
  "depth_er reals of 2")

-- REALS-9: a sweep axis given its values as a reals runs the same points as the table
-- (and a reals.linear axis is the from/to/points axis, bit for bit).
local axis = R.linear { from = 0.1, to = 0.7, count = 7 }
local function sweep_of(values)
  return cp.sweep { parameters = { { name = "x", values = values } },
    evaluate = function(p) return p.x end }.rows
end
local by_reals, by_table = sweep_of(axis), sweep_of(axis:table())
local by_range = cp.sweep { parameters = { { name = "x", from = 0.1, to = 0.7, points = 7 } },
  evaluate = function(p) return p.x end }.rows
ok = #by_reals == 7 and #by_table == 7 and #by_range == 7
for i = 1, 7 do ok = ok and by_reals[i].x == by_table[i].x and by_reals[i].x == by_range[i].x end
T.check(ok, "sweep over a reals = over its table = over from/to/points")

T.done()
