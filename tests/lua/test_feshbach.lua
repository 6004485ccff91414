-- Lua-level tests of cp.feshbach through the real coldprep binary: the API names of
-- docs/lua-api.md, unit round trips, results against hand-evaluated formulas, help texts,
-- and bad input for every argument (a clear, catchable error every time).
local T = require "testlib"
local cp = require "coldprep"
local fb, G, a0 = cp.feshbach, cp.units.G, cp.units.a0
local hbar = cp.consts.hbar

local r = cp.species.resonance("KRb")
local m = cp.species.molecule("KRb")
local mu = m.reduced_mass

-- FB-L1: units round trip (gauss in, tesla inside): a(B0 + Delta) = 0 and a(B0 - Delta)
-- = 2 abg (hand, a(B) = abg (1 - Delta/(B - B0))).
T.near(r.b0 / G, 546.7, 1e-12, "b0 in gauss")
T.check(math.abs(fb.scattering_length { resonance = r, field = r.b0 + r.width }.a) < 1e-12 * a0,
  "zero crossing at B0 + Delta")
T.near(fb.scattering_length { resonance = r, field = r.b0 - r.width }.a, 2 * r.abg, 1e-12,
  "a(B0 - Delta) = 2 abg")
T.near(fb.scattering_length { resonance = "KRb", field = 546 * G }.a / a0,
  -187 * (1 - (-3.04) / (546 - 546.7)), 1e-9, "resonance given by molecule name, field in G")
T.near(m.reduced_mass / cp.consts.amu, 27.375670, 1e-7, "reduced mass of 40K87Rb (AME2020 masses, docs/data.md)")

-- FB-L2: binding energy: model choice and the universal formula by hand.
local b = fb.binding_energy { resonance = r, molecule = m, field = 546.6 * G }
T.check(b.model == "corrected", "auto model near the pole is the corrected form")
local u = fb.binding_energy { resonance = r, molecule = "KRb", field = 546.6 * G, model = "universal" }
T.near(u.energy, hbar ^ 2 / (2 * mu * u.a ^ 2), 1e-12, "universal hbar^2/(2 mu a^2)")
T.near(u.energy_hz, u.energy / cp.consts.h, 1e-12, "energy_hz = energy/h")
T.check(b.energy > u.energy, "the abar correction deepens the state")
local l = fb.binding_energy { resonance = r, molecule = m, field = 540 * G }
T.check(l.model == "linear", "far below (a < 0) the linear form")
T.near(l.energy, r.dmu * 6.7 * G, 1e-9, "linear dmu |B - B0|")
T.near(b.abar / a0, 68.8, 0.01, "abar(40K-87Rb) = 68.8 a0 (Chin et al. RMP 2010 [M])")
-- FB-L2b validity flags reach Lua: none near the pole; past the zero crossing B0 + Delta =
-- 543.66 G (a = abg (1 + Delta/(B0 - B)) < 0 at 540 G, by hand) and the linear form on this
-- s_res > 1 resonance are flagged.
T.check(#b.flags == 0, "near the pole: no flag")
local lf = {}
for _, f in ipairs(l.flags) do lf[f] = true end
T.check(lf.past_zero_crossing and lf.linear_broad and b.s_res > 1, "540 G: past the zero crossing, linear on a broad resonance")
local nc = fb.binding_energy { resonance = r, molecule = m, field = 546.6 * G, c6_au = 8000 }
T.check(nc.abar > b.abar, "explicit c6_au overrides the resonance's")

-- user-added resonance with its own atom-pair C6 (species.add_resonance{c6_au})
local ur = cp.species.add_resonance { molecule = "KRb", b0 = 546.62 * G, width = -3.1 * G,
  abg = -189 * a0, dmu = 2.3 * cp.consts.muB, c6_au = 4300 }
T.near(ur.c6_au, 4300, 0, "add_resonance keeps c6_au")
local ub = fb.binding_energy { resonance = ur, molecule = m, field = 546.5 * G }
T.near(ub.abar / b.abar, (4300 / 4274) ^ 0.25, 1e-12, "abar scales as C6^(1/4)")
T.raises(function() cp.species.add_resonance { molecule = "KRb", b0 = 0.05, width = 1e-4,
  abg = 1e-9, dmu = 1e-23, c6_au = -1 } end, { "c6_au" }, "add_resonance rejects c6_au < 0")

-- FB-L3: association (ramp-rate law and LZ), by hand.
local alpha = 4 * math.pi ^ 2 * hbar / mu
local n, rate = 1e17, -1 * G / 1e-3
local as = fb.associate { resonance = r, molecule = m, ramp_rate = rate, density = n }
local x = alpha * n * math.abs(r.abg * r.width / rate)
T.near(as.efficiency, 1 - math.exp(-x), 1e-12, "P = 1 - exp(-alpha n |abg Delta/Bdot|)")
T.near(as.lz_parameter, x / (2 * math.pi), 1e-12, "lz_parameter")
T.near(fb.associate { resonance = r, molecule = m, ramp_rate = rate, density = n,
  max_efficiency = 0.5 }.efficiency, 0.5 * (1 - math.exp(-x)), 1e-12, "max_efficiency scales")
T.near(fb.associate { resonance = r, molecule = m, ramp_rate = rate, density = n,
  alpha = 1e-9 }.efficiency, 1 - math.exp(-1e-9 * n * math.abs(r.abg * r.width / rate)), 1e-12,
  "measured alpha override")
T.near(fb.lz_probability { lz_parameter = as.lz_parameter }.probability, 1 - math.exp(-x), 1e-12,
  "lz_probability")
local batch = fb.ramp_law { resonance = r, molecule = m, density = n, ramp_rates = { rate, 10 * rate } }
T.near(batch.efficiency[1], as.efficiency, 1e-14, "ramp_law batch = associate")
local w = 2 * math.pi * 50e3
local site = fb.associate_site { resonance = r, molecule = m, ramp_rate = 100, omega_x = w,
  omega_y = w, omega_z = w }
local psi2 = (mu * w / (math.pi * hbar)) ^ 1.5
T.near(site.lz_parameter, alpha * psi2 * math.abs(r.abg * r.width) / 100 / (2 * math.pi), 1e-12,
  "site LZ parameter (docs/models/feshbach.md)")

-- FB-L4: overlap, ceiling, dissociation.
local wt = 2 * math.pi * 100
local rb = { atom = "87Rb", number = 1e5, omega_x = wt, omega_y = wt, omega_z = wt, profile = "thermal" }
local ov = fb.overlap_density { a = rb, b = rb, temperature = 300e-9 }
local s = math.sqrt(cp.consts.kB * 300e-9 / (cp.species.atom("87Rb").mass * wt ^ 2))
T.near(ov.density, 1e5 / ((2 * math.pi) ^ 1.5 * s ^ 3) / 2 ^ 1.5, 1e-12, "identical clouds n0/2^1.5")
local k = { atom = "40K", t_over_tf = 0.3, omega_x = wt * 1.5, omega_y = wt * 1.5, omega_z = wt * 1.5 }
local ov2 = fb.overlap_density { a = rb, b = k, temperature = 300e-9 }
T.near(ov2.sag, cp.consts.g * (1 / wt ^ 2 - 1 / (1.5 * wt) ^ 2), 1e-12, "differential sag")
local pm = fb.max_efficiency { temperature = 200e-9, a = { atom = "87Rb", t_over_tc = 1.2,
  omega_x = wt, omega_y = wt, omega_z = wt }, b = k, samples = 4000 }
local pm2 = fb.max_efficiency { temperature = 200e-9, a = { atom = "87Rb", t_over_tc = 1.2,
  omega_x = wt, omega_y = wt, omega_z = wt }, b = k, samples = 4000 }
T.check(pm.max_efficiency > 0 and pm.max_efficiency < 1 and pm.std_error > 0, "P_max in (0, 1)")
T.check(pm.max_efficiency == pm2.max_efficiency, "deterministic for the default seed")
local d = fb.dissociation_energy { resonance = r, molecule = m, ramp_rate = 1 * G / 1e-3 }
T.near(d.energy / d.energy_scale, 0.9027452929509336, 1e-12, "mean = Gamma(5/3) eps")
T.near(d.temperature, d.energy / cp.consts.kB, 1e-12, "temperature = energy/kB")

-- FB-L5: help texts for every function.
for _, name in ipairs { "scattering_length", "binding_energy", "associate", "ramp_law",
  "associate_site", "lz_probability", "dissociation_energy", "overlap_density", "max_efficiency" } do
  local h = cp.get_help(fb[name])
  T.check(type(h) == "string" and h:find("Example", 1, true) ~= nil, "help text for " .. name)
end

-- FB-L6: bad input, every argument: NaN, +-inf, 0, negative, absurd, wrong type, unknown key.
local nan, inf = 0 / 0, math.huge
local function base()
  return { resonance = r, molecule = m, ramp_rate = rate, density = n }
end
local bad_numbers = {
  ramp_rate = { nan, inf, -inf, 0, 1e300 },
  density = { nan, inf, -inf, 0, -1, 1e300 },
  max_efficiency = { nan, inf, 0, -1, 2 },
  alpha = { nan, inf, 0, -1, 1e300 },
}
for key, vals in pairs(bad_numbers) do
  for _, v in ipairs(vals) do
    local args = base()
    args[key] = v
    T.raises(function() fb.associate(args) end, { key }, "associate " .. key .. " = " .. tostring(v))
  end
end
for _, f in ipairs { "b0", "width", "abg", "dmu" } do
  for _, v in ipairs { nan, inf, -inf, 0, 1e300 } do
    local rr = {}
    for kk, vv in pairs(r) do rr[kk] = vv end
    rr[f] = v
    if not (f == "b0" and v == -inf) then
      T.raises(function() fb.associate { resonance = rr, molecule = m, ramp_rate = rate, density = n } end,
        { f }, "resonance." .. f .. " = " .. tostring(v))
    end
  end
end
for _, v in ipairs { nan, inf, -inf, 0, -1, 1e300 } do
  T.raises(function() fb.scattering_length { resonance = r, field = v } end, { "field" },
    "field = " .. tostring(v))
  T.raises(function() fb.binding_energy { resonance = r, molecule = m, field = 546 * G, c6_au = v ~= 0 and v or -5 } end,
    { "c6_au" }, "c6_au = " .. tostring(v))
  if v ~= 0 then
    T.raises(function() fb.lz_probability { lz_parameter = v } end, { "lz_parameter" },
      "lz_parameter = " .. tostring(v))
  end
  T.raises(function() fb.associate_site { resonance = r, molecule = m, ramp_rate = 1, omega_x = v,
    omega_y = w, omega_z = w } end, { "omega_x" }, "omega_x = " .. tostring(v))
  T.raises(function() fb.overlap_density { a = rb, b = rb, temperature = v } end, { "temperature" },
    "temperature = " .. tostring(v))
  local cl = { atom = "87Rb", number = v, omega_x = wt, omega_y = wt, omega_z = wt }
  T.raises(function() fb.overlap_density { a = cl, b = rb, temperature = 1e-7 } end, { "number" },
    "cloud number = " .. tostring(v))
  T.raises(function() fb.max_efficiency { a = rb, b = rb, temperature = 1e-7, gamma = v } end,
    { "gamma" }, "gamma = " .. tostring(v))
  T.raises(function() fb.dissociation_energy { resonance = r, molecule = m, ramp_rate = v ~= -1 and v or 0 } end,
    { "ramp_rate" }, "dissociation ramp_rate = " .. tostring(v))
end
-- every numeric argument of every function, and every numeric field of a cloud
local function copy(t)
  local c = {}
  for kk, vv in pairs(t) do c[kk] = type(vv) == "table" and copy(vv) or vv end
  return c
end
local cloud = { atom = "40K", number = 1e5, omega_x = wt, omega_y = wt, omega_z = wt }
local calls = {
  { fb.scattering_length, { resonance = r, field = 546 * G }, { "field" } },
  { fb.binding_energy, { resonance = r, molecule = m, field = 546 * G }, { "field", "c6_au" } },
  { fb.associate_site, { resonance = r, molecule = m, ramp_rate = 1, omega_x = w, omega_y = w,
    omega_z = w }, { "ramp_rate", "omega_x", "omega_y", "omega_z", "max_efficiency" } },
  { fb.ramp_law, { resonance = r, molecule = m, density = n, ramp_rates = { 1 } },
    { "density", "max_efficiency", "alpha" } },
  { fb.dissociation_energy, { resonance = r, molecule = m, ramp_rate = 1 }, { "ramp_rate" } },
  { fb.overlap_density, { a = cloud, b = cloud, temperature = 1e-7 }, { "temperature" } },
  { fb.max_efficiency, { a = cloud, b = cloud, temperature = 1e-7, samples = 200 },
    { "temperature", "gamma", "samples", "seed" } },
}
for _, c in ipairs(calls) do
  local f, args, keys = c[1], c[2], c[3]
  T.check(pcall(f, args), "baseline call succeeds")
  for _, key in ipairs(keys) do
    for _, v in ipairs { nan, inf, -inf, 0, -1, 1e300, "x", true } do
      local a = copy(args)
      a[key] = v
      -- allowed: c6_au = 0 (unknown), seed = 0, a negative ramp rate (only |Bdot| counts)
      local ok_value = (key == "c6_au" and v == 0) or (key == "seed" and v == 0)
        or (key == "ramp_rate" and v == -1)
      if not ok_value then
        T.raises(function() f(a) end, { key }, key .. " = " .. tostring(v))
      end
    end
  end
  for _, ck in ipairs(args.a and { "number", "omega_x", "omega_y", "omega_z", "t_over_tf" } or {}) do
    for _, v in ipairs { nan, inf, -inf, 0, -1, 1e300, "x" } do
      local a = copy(args)
      if ck == "t_over_tf" then a.b.number = nil end
      a.b[ck] = v
      T.raises(function() f(a) end, { ck }, "cloud " .. ck .. " = " .. tostring(v))
    end
  end
  if args.a then
    for _, bad in ipairs { { profile = "plasma" }, { atom = "Xx9" }, { atom = 5 },
      { scattering_length = -1, profile = "thomas_fermi" } } do
      local a = copy(args)
      for kk, vv in pairs(bad) do a.a[kk] = vv end
      T.check(not pcall(f, a), "bad cloud field " .. next(bad))
    end
  end
end
T.raises(function() fb.ramp_law { resonance = r, molecule = m, density = n, ramp_rates = { 1, "x" } } end,
  { "ramp_rates" }, "non-number in ramp_rates")
T.raises(function() fb.max_efficiency { a = cloud, b = cloud, temperature = 1e-7, sag = 1 } end,
  { "sag" }, "sag must be a boolean")

T.raises(function() fb.scattering_length { resonance = r, field = r.b0 } end, { "at the resonance" },
  "field exactly at B0")
T.raises(function() fb.binding_energy { resonance = r, molecule = m, field = 547 * G } end,
  { "atomic side" }, "no molecule above B0")
T.raises(function() fb.binding_energy { resonance = r, molecule = m, field = 546 * G, model = "exact" } end,
  { "model" }, "unknown model")
T.raises(function() fb.associate { resonance = r, molecule = m, ramp_rate = rate, densty = n } end,
  { "unknown argument 'densty'", "density" }, "misspelt key suggests the right one")
T.raises(function() fb.associate { resonance = r, molecule = m, ramp_rate = "fast", density = n } end,
  { "ramp_rate", "number" }, "wrong type")
T.raises(function() fb.associate { resonance = 5, molecule = m, ramp_rate = rate, density = n } end,
  { "resonance" }, "resonance of wrong type")
T.raises(function() fb.associate { resonance = r, molecule = "XyZ", ramp_rate = rate, density = n } end,
  { "unknown molecule" }, "unknown molecule")
T.raises(function() fb.binding_energy { resonance = { b0 = r.b0, width = r.width, abg = r.abg,
  dmu = r.dmu, c6au = 4274 }, molecule = m, field = r.b0 - 0.1 * G } end,
  { "resonance", "resonance: unknown field 'c6au'", "did you mean 'c6_au'" }, "typo in a resonance field")
T.raises(function() fb.associate { resonance = { b0 = 0.05 }, molecule = m, ramp_rate = rate, density = n } end,
  { "width" }, "resonance table lacking fields")
T.raises(function() fb.associate(5) end, { "one table" }, "not a table")
T.raises(function() fb.overlap_density { a = { atom = "87Rb", number = 1e5, t_over_tc = 1,
  omega_x = wt, omega_y = wt, omega_z = wt }, b = rb, temperature = 1e-7 } end,
  { "exactly one" }, "number and t_over_tc both given")
T.raises(function() fb.max_efficiency { temperature = 2e-7, a = { atom = "87Rb", t_over_tf = 0.3,
  omega_x = wt, omega_y = wt, omega_z = wt }, b = rb } end,
  { "t_over_tf", "does not fit profile 'bose'" }, "T/T_F given for a Bose cloud")
T.raises(function() fb.max_efficiency { temperature = 2e-7, a = rb, b = { atom = "40K", t_over_tc = 1.2,
  omega_x = wt, omega_y = wt, omega_z = wt } } end,
  { "t_over_tc", "does not fit profile 'fermi'" }, "T/T_c given for a Fermi cloud")
T.raises(function() fb.overlap_density { a = { atom = "87Rb", number = 1e5, omega_x = wt,
  omega_y = wt, omega_z = wt, colour = 1 }, b = rb, temperature = 1e-7 } end,
  { "cloud 'a'", "colour" }, "unknown cloud key")
T.raises(function() fb.ramp_law { resonance = r, molecule = m, density = n, ramp_rates = { 1, 0 } } end,
  { "rates[2] 0 T/s" }, "batch names the bad element, counted from 1 as in Lua")

-- FESH-MEMO: a remembered result is the first one, bit for bit; off and on again agree.
do
  local w = 2 * math.pi * 100
  local args = { temperature = 200e-9, samples = 2000,
    a = { atom = "87Rb", t_over_tc = 1.2, omega_x = w, omega_y = w, omega_z = w },
    b = { atom = "40K", t_over_tf = 0.3, omega_x = w, omega_y = w, omega_z = w } }
  fb.memo { enabled = false }
  local fresh = fb.max_efficiency(args).max_efficiency
  fb.memo { enabled = true }
  local first, again = fb.max_efficiency(args).max_efficiency, fb.max_efficiency(args).max_efficiency
  T.check(fresh == first and first == again and fb.memo().size == 1, "memo returns the same bits")
  args.seed = 2
  T.check(fb.max_efficiency(args).max_efficiency ~= first and fb.memo().size == 2,
    "another seed is another entry")
  T.raises(function() fb.memo { enable = false } end, { "did you mean 'enabled'" }, "memo typo")
end

T.done()
