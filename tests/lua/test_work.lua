-- Work estimates of the long computations (docs/api/raman.md, lattice.md, feshbach.md): a call
-- whose estimated CPU time exceeds cp.consts.limits.work_seconds is refused before it starts
-- with a house error naming the estimate, how to reduce it and the opt-in
-- `allow_long = true`; with the opt-in, or within the limit, it runs.  The limit (1 s) is a
-- rule of thumb for an interactive session (common practice, no source).
local T = require "testlib"
local cp = require "coldprep"

T.check(cp.consts.limits.work_seconds == 1, "the work limit is 1 s of CPU")

local function quick(fn, what)
  local t0 = os.clock()
  local ok, err = pcall(fn)
  local dt = os.clock() - t0
  T.check(not ok and dt < 1.5, string.format("%s refused in %.3f s", what, dt))
  return tostring(err)
end

-- WORK-1: a million-point line shape of 3 us pulses (about 90 s of CPU).
local shape = { rabi_pump = 2 * math.pi * 5e6, rabi_stokes = 2 * math.pi * 5e6, width = 3e-6,
  delay = 3e-6, gamma = 2 * math.pi * 6e6, from = -2 * math.pi * 1e6, to = 2 * math.pi * 1e6,
  points = 1000000 }
local msg = quick(function() return cp.raman.lineshape(shape) end, "lineshape of 1e6 points")
for _, f in ipairs { "raman.lineshape: estimated work", "s of CPU (1000000 points", "is too long for one call",
  "allowed up to 1 s", "scan at most", "allow_long = true", "Ctrl-C stops it" } do
  T.check(msg:find(f, 1, true) ~= nil, "lineshape refusal says '" .. f .. "': " .. msg)
end
-- the number of points it names lies between a thousand and the million asked for (a scan
-- of that many points would take about the limit: 1 s / 0.09 ms each)
local fits = tonumber(msg:match("scan at most (%d+) points"))
T.check(fits and fits > 1000 and fits < 1000000, "a point count that fits: " .. tostring(fits))
shape.points = 41
local small = cp.raman.lineshape(shape)
shape.allow_long = true
local same = cp.raman.lineshape(shape)
T.check(#small.efficiency == 41 and small.efficiency[21] == same.efficiency[21],
  "within the limit and with allow_long: the same line shape")
T.raises(function() shape.allow_long = 1; cp.raman.lineshape(shape) end, { "allow_long" },
  "allow_long must be a boolean")

-- WORK-2: 200 bands at 5000 quasimomenta in a 4001-state basis (three minutes).
msg = quick(function() return cp.lattice.bands { depth_er = 10, bands = 200, points = 5000, basis = 4001 } end,
  "band scan of 5000 x 200 in 4001 states")
for _, f in ipairs { "lattice.bands: estimated work", "5000 quasimomenta x 200 bands in a 4001-state basis",
  "ask for at most", "allow_long = true" } do
  T.check(msg:find(f, 1, true) ~= nil, "band refusal says '" .. f .. "': " .. msg)
end
local b = cp.lattice.bands { depth_er = 10, bands = 3, points = 51, allow_long = true }
T.check(#b.energies_er == 51, "a band scan with allow_long runs")

-- WORK-3: ten million phase-space samples (2.3 s).
local clouds = { temperature = 200e-9, samples = 10000000,
  a = { atom = "87Rb", t_over_tc = 1.2, omega_x = 628, omega_y = 628, omega_z = 628 },
  b = { atom = "40K", t_over_tf = 0.3, omega_x = 628, omega_y = 628, omega_z = 628 } }
msg = quick(function() return cp.feshbach.max_efficiency(clouds) end, "1e7 samples")
for _, f in ipairs { "feshbach.max_efficiency: estimated work", "10000000 samples", "ask for at most",
  "allow_long = true" } do
  T.check(msg:find(f, 1, true) ~= nil, "sampling refusal says '" .. f .. "': " .. msg)
end
clouds.samples = 20000
T.check(cp.feshbach.max_efficiency(clouds).max_efficiency > 0, "20000 samples run")

-- WORK-4: bosons whose Hubbard U is 1e-9 k_B T: every site sums up to 1e5 occupation
-- numbers (ten seconds in all); stopped once the sums pass the limit.
msg = quick(function() return cp.thermo.lattice_filling { number = 1e12, mass = 2.1e-25,
  statistics = "boson", temperature = 5e-9, depth_er = 40, wavelength = 1064e-9,
  envelope_omega_bar = 1e6, onsite_u = 1e-40 } end, "bosons with a tiny U")
for _, f in ipairs { "thermo.lattice_filling: estimated work", "terms of the site sums: bosons with onsite_u 1e-40 J",
  "a larger onsite_u", "allow_long = true" } do
  T.check(msg:find(f, 1, true) ~= nil, "filling refusal says '" .. f .. "': " .. msg)
end

T.done()
