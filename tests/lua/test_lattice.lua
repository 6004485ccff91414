-- Lua-level tests of cp.lattice through the real coldprep binary: the docs/lua-api.md names and
-- units, values against hand calculations and published limits, and error messages.
local T = require "testlib"
local cp = require "coldprep"
local u = cp.units
local pi = math.pi
local krb = cp.species.molecule("KRb").mass

-- LAT-L1: recoil of 40K87Rb at 1064 nm, by hand: h / (2 m lambda^2) = 1389.0691289 Hz.
local r = cp.lattice.recoil { mass = krb, wavelength = 1064 * u.nm }
T.near(r.frequency_hz, 1389.0691289, 1e-9, "KRb recoil at 1064 nm")
T.near(r.energy, 1389.0691289 * cp.consts.h, 1e-9, "recoil energy in J")

-- LAT-L2: depth worked example (Grimm et al. 2000 [M], docs/models/lattice.md): 1 W, 100 um,
-- 1064 nm, 1000 a.u. -> V0/h = 1.19356658 MHz by hand; 1000 a.u. = 46.8712499 Hz/(W/cm^2)
-- and 1.6487772743602864e-38 C m^2/V give the same.
local base = { power = 1 * u.W, waist = 100 * u.um, wavelength = 1064 * u.nm }
local function with(t, extra)
  local c = {}
  for k, v in pairs(t) do c[k] = v end
  for k, v in pairs(extra) do c[k] = v end
  return c
end
local d_au = cp.lattice.depth(with(base, { polarizability_au = 1000 }))
local d_si = cp.lattice.depth(with(base, { polarizability = 1.6487772743602864e-38 }))
local d_hz = cp.lattice.depth(with(base, { polarizability_hz = 46.8712499 }))
T.near(d_au.depth_hz, 1.19356658e6, 1e-8, "depth, a.u.")
T.near(d_si.depth / cp.consts.h, 1.19356658e6, 1e-8, "depth, SI")
T.near(d_hz.depth / cp.consts.h, 1.19356658e6, 1e-8, "depth, Hz/(W/cm^2)")
T.check(d_au.depth_er == nil, "depth_er only with a mass")
local d_m = cp.lattice.depth(with(base, { polarizability_au = 1000, mass = krb }))
T.near(d_m.depth_er, 1.19356658e6 / 1389.0691289, 1e-8, "depth in E_r")
-- envelope by hand: omega_r = sqrt(4 V0 / (m w^2)) (Grimm et al. 2000 [M])
T.near(d_m.omega_radial, math.sqrt(4 * d_m.depth / (krb * 1e-8)), 1e-9, "radial frequency")
T.near(d_m.sag, cp.consts.g / d_m.omega_radial ^ 2, 1e-12, "sag = g / omega^2")
local d_half = cp.lattice.depth(with(base, { polarizability_au = 1000, reflectivity = 0.25 }))
T.near(d_half.depth, 0.5 * d_au.depth, 1e-12, "V0 ~ sqrt(reflectivity)")
local d_90 = cp.lattice.depth(with(base, { polarizability_au = 1000, angle = pi / 2 }))
T.near(d_90.spacing, 1064e-9 / math.sqrt(2), 1e-12, "spacing lambda / (2 sin(45 deg))")

-- LAT-L3: 3D lattice of three equal beams: each axis m w^2 = V0 (2/zR^2 + 8/w^2), by hand.
local beam = with(base, { polarizability_au = 1000 })
local d3 = cp.lattice.depth3d { beams = { beam, beam, beam }, mass = krb }
local zr = pi * 1e-8 / 1064e-9
T.near(d3.omega_bar, math.sqrt(d_au.depth * (2 / zr ^ 2 + 8 / 1e-8) / krb), 1e-9, "3D omega_bar")
T.near(d3.axes[2].depth, d_au.depth, 1e-12, "3D axis depth")

-- LAT-L4: bands.  Free particle (depth 0): folded parabolas (q + 2l)^2 (Ashcroft and Mermin
-- Ch. 9); at 10 E_r J = width/4 to 1e-3 (Mathieu, docs/models/lattice.md) and Zwerger's
-- asymptotic J is 19 % high (computed from the Mathieu width, docs/models/lattice.md).
local b0 = cp.lattice.bands { depth_er = 0, bands = 3, quasimomenta = { 0.5 } }
T.near(b0.energies_er[1][1], 0.25, 1e-12, "free band 1 at q = 0.5")
T.near(b0.energies_er[1][2], 2.25, 1e-12, "free band 2 at q = 0.5")
T.near(b0.energies_er[1][3], 6.25, 1e-12, "free band 3 at q = 0.5")
T.near(b0.tunnelling_er, 2 / pi ^ 2, 1e-6, "free-particle J = 2/pi^2 (hand integral)")
local b = cp.lattice.bands { depth_er = 10, bands = 3, points = 11 }
T.check(#b.energies_er == 11 and #b.energies_er[1] == 3, "energies_er[i][band]")
T.check(#b.width_er == 3 and #b.gap_er == 2 and #b.edges_er == 3, "summary sizes")
T.near(b.width_er[1], math.abs(b.edges_er[1][2] - b.edges_er[1][1]), 1e-12, "width from edges")
T.near(b.tunnelling_er, b.width_er[1] / 4, 1e-3, "J ~ width/4 at 10 E_r")
local zwerger = 4 / math.sqrt(pi) * 10 ^ 0.75 * math.exp(-2 * math.sqrt(10))
T.near(zwerger / (b.width_er[1] / 4), 1.19, 0.01, "Zwerger asymptotic J +19 % at 10 E_r")
T.near(b.energies_er[1][1], b.edges_er[1][2], 1e-12, "q = -1 is the zone edge")
T.near(b.energies_er[6][1], b.edges_er[1][1], 1e-12, "q = 0 is the zone centre")
T.check(b.basis_size >= 7 and b.basis_size % 2 == 1, "basis size reported")
local jt = cp.lattice.tunnelling { depth_er = 10 }
T.near(jt.tunnelling_er, b.tunnelling_er, 1e-12, "tunnelling = bands.tunnelling_er")
T.check(jt.tunnelling2_er < 0 and math.abs(jt.tunnelling2_er) < 0.02 * jt.tunnelling_er,
  "next-nearest J small and negative")

-- LAT-L5: site and Lamb-Dicke: eta = 1/(sqrt(2) s^(1/4)) for the lattice light (Leibfried
-- et al. RMP 75, 281 (2003) definition); omega = 2 sqrt(s) E_r / hbar.
local s = cp.lattice.site { depth_er = 16, mass = krb, wavelength = 1064 * u.nm }
T.near(s.lamb_dicke, 1 / (2 * math.sqrt(2)), 1e-14, "Lamb-Dicke at 16 E_r")
T.near(s.omega, 8 * r.energy / cp.consts.hbar, 1e-12, "on-site omega")
T.near(cp.lattice.site { depth_er = 16, wavelength = 1064 * u.nm,
  probe_wavelength = 2128 * u.nm }.lamb_dicke, 1 / (4 * math.sqrt(2)), 1e-14, "probe at 2 lambda")

-- LAT-L6: Wannier function normalised (Kohn 1959 definition), trapezoid over samples.
local w = cp.lattice.wannier { depth_er = 10, range = 4, points = 801 }
local norm = 0 -- the end points are ~1e-5 and the trapezoid's half weights negligible
for i = 2, #w.w - 1 do norm = norm + w.w[i] ^ 2 end
T.near(norm * (w.x_sites[2] - w.x_sites[1]), 1, 1e-6, "Wannier normalised")
T.check(w.w[401] > 0 and math.abs(w.x_sites[401]) < 1e-12, "centred on the site, positive")

-- LAT-L7: heating (Grimm et al. 2000 [M]): 2 E_rec per photon; scattering rate by hand
-- Im alpha = 1e-3 a.u. at 1e8 W/m^2 -> 5.8900150 1/s.
T.near(cp.lattice.scattering_rate { polarizability_imag_au = 1e-3, intensity = 1e8 }.rate,
  5.8900150, 1e-7, "scattering rate")
local h = cp.lattice.heating { scattering_rate = 0.5, mass = krb, wavelength = 1064 * u.nm,
  depth_er = 25 }
T.near(h.energy_rate, 2 * r.energy * 0.5, 1e-12, "energy rate 2 E_r Gamma")
T.near(h.band_excitation_rate, 0.5 / 30, 1e-12, "band rate Gamma / (6 sqrt(s))")

-- LAT-L8: loading.  Slower is more adiabatic; a sampled function equals the analytic ramp.
local slow = cp.lattice.loading { end_er = 20, duration = 10 * u.ms, mass = krb, wavelength = 1064 * u.nm }
local fast = cp.lattice.loading { end_er = 20, duration = 0.5 * u.ms, mass = krb, wavelength = 1064 * u.nm }
T.check(slow.excited_fraction < fast.excited_fraction, "slower ramp excites less")
T.check(slow.max_adiabaticity < 0.01, "10 ms s-shaped ramp is adiabatic")
local lin = cp.lattice.loading { shape = "linear", end_er = 10, duration = 1 * u.ms, recoil = r.energy }
local fn = cp.lattice.loading { shape = "sampled", duration = 1 * u.ms, recoil = r.energy,
  depth = function(t) return 10 * t / 1e-3 end }
T.near(fn.excited_fraction, lin.excited_fraction, 1e-6, "sampled function = linear ramp")
local ts, ds = {}, {}
for i = 1, 1000 do ts[i] = (i - 1) * 1e-3 / 999; ds[i] = 10 * (i - 1) / 999 end
local arr = cp.lattice.loading { shape = "sampled", times = ts, depths_er = ds, recoil = r.energy }
T.near(arr.excited_fraction, fn.excited_fraction, 1e-9, "sampled arrays = sampled function")

-- LAT-L9: errors name the argument, value, unit and range; unknown keys suggest.
T.raises(function() cp.lattice.recoil { mass = krb, wavelenght = 1e-6 } end,
  { "unknown argument 'wavelenght'", "wavelength" }, "typo suggests wavelength")
T.raises(function() cp.lattice.depth(with(base, { polarizability_au = 1000, power = -1 })) end,
  { "power", "-1", "W", "allowed" }, "negative power")
T.raises(function() cp.lattice.depth(with(base, { polarizability_au = 0 / 0 })) end,
  { "polarizability_au", "finite" }, "NaN polarizability")
T.raises(function() cp.lattice.depth(with(base, { polarizability_au = 1, polarizability_hz = 1 })) end,
  { "once" }, "two polarizability units")
T.raises(function() cp.lattice.bands { depth_er = 10, bands = 500 } end,
  { "bands", "500", "[1, 200]" }, "too many bands")
T.raises(function() cp.lattice.bands { depth_er = 10, bands = 2, basis = 4 } end,
  { "basis size 4" }, "even basis")
T.raises(function() cp.lattice.bands { depth_er = -1, bands = 2 } end,
  { "depth -1 E_r", "allowed" }, "negative depth")
T.raises(function() cp.lattice.bands { depth_er = 1 / 0, bands = 2 } end,
  { "depth_er", "finite" }, "infinite depth")
T.raises(function() cp.lattice.bands { depth_er = 5, bands = 2, quasimomenta = { "x" } } end,
  { "quasimomenta" }, "non-number quasimomentum")
T.raises(function() cp.lattice.bands "deep" end, { "one table" }, "wrong argument type")
T.raises(function() cp.lattice.loading { shape = "cubic", end_er = 1, duration = 1, recoil = 1e-30 } end,
  { "shape", "cubic" }, "unknown ramp shape")
T.raises(function() cp.lattice.loading { shape = "sampled", duration = 1e-3, recoil = r.energy,
  depth = function() return 0 / 0 end } end, { "finite" }, "NaN from a depth function")
T.raises(function() cp.lattice.loading { shape = "sampled", times = { 0, 1 }, depths_er = { 0 },
  recoil = r.energy } end, { "depths_er" }, "mismatched samples")
T.raises(function() cp.lattice.loading { shape = "linear", end_er = 5, duration = 1e-3,
  time_constant = 1e-4, recoil = r.energy } end, { "time_constant", "does not apply" },
  "time constant of a linear ramp")
T.raises(function() cp.lattice.loading { shape = "sampled", times = { 0, 1 }, depths_er = { 0, 1 },
  end_er = 3, recoil = r.energy } end, { "end_er", "does not apply" }, "end_er of a sampled ramp")
T.raises(function() cp.lattice.heating { scattering_rate = 1, polarizability_imag_au = 1,
  mass = krb, wavelength = 1e-6, depth_er = 5 } end, { "either" }, "rate and polarizability")
T.raises(function() cp.lattice.wannier { depth_er = 0.1 } end, { "depth", "0.1" }, "shallow Wannier")
-- A Wannier function estimated beyond cp.consts.limits.work_seconds (1e5 points at 1e4 E_r,
-- about 1.4 s) is refused before it starts, naming the estimate, the points that fit and
-- the opt-in; within the limit allow_long changes nothing (the same numbers).
T.raises(function() cp.lattice.wannier { depth_er = 1e4, points = 100000 } end,
  { "lattice.wannier: estimated work", "100000 points in a 141-state basis", "ask for at most",
    "allow_long = true" }, "long Wannier function refused")
T.raises(function() cp.lattice.wannier { depth_er = 10, allow_long = 1 } end,
  { "'allow_long' must be true or false" }, "allow_long must be a boolean")
do
  local a = cp.lattice.wannier { depth_er = 10, points = 51 }
  local b = cp.lattice.wannier { depth_er = 10, points = 51, allow_long = true }
  local same = true
  for i = 1, 51 do same = same and a.w[i] == b.w[i] end
  T.expect("allow_long gives the same Wannier function", same)
end
T.raises(function() cp.lattice.heating { scattering_rate = -1, mass = krb, wavelength = 1e-6,
  depth_er = 5 } end, { "scattering rate", "-1" }, "negative scattering rate")
T.raises(function() cp.lattice.depth3d { beams = { beam, beam }, mass = krb } end,
  { "3 beam tables" }, "3D needs three beams")

-- HELP-L2: every lattice function has a help text.
-- LAT-L-SPECIES: a beam given with a species takes its built-in polarizability at the beam's
-- wavelength.  The depth is linear in alpha, so 87Rb (699.8 a.u. at 1064 nm, the estimate in
-- docs/data.md from Holmgren et al., PRA 81, 053607 (2010)) gives 0.6998 of LAT-L2's
-- 1.19356658 MHz for 1000 a.u. (by hand).
local d_rb = cp.lattice.depth(with(base, { species = "87Rb" }))
T.near(d_rb.depth_hz, 1.19356658e6 * cp.species.polarizability("87Rb", 1064 * u.nm) / 1000, 1e-8,
  "depth from the species' built-in polarizability")
T.near(cp.species.polarizability("87Rb", 1064 * u.nm), 699.8, 1e-12, "87Rb alpha(1064) as tabulated")
T.raises(function() cp.lattice.depth(with(base, { species = "NaK" })) end,
  { "lattice.depth", "no published polarizability of 23Na40K", "polarizability_au" },
  "no built-in molecular polarizability: asks for it")
-- KRb's built-in 1064 nm polarizability is the N = 0 (isotropic) part of B. Neyenhuis et
-- al., PRL 109, 230403 (2012), arXiv:1209.2226: alpha_par = 10.0e-5 and alpha_perp = 3.3e-5
-- MHz/(W/cm^2) as light shifts per intensity (numbers transcribed in a secondary source, not
-- read in the paper).  A lattice for KRb given as power and waist has the depth of LAT-L2's
-- 1000 a.u. lattice scaled by (alpha_par + 2 alpha_perp)/3 expressed in a.u. through the
-- closed form alpha[a.u.] = alpha[Hz/(W/m^2)] h c / (2 pi a0^3).
local iso_hz_per_wm2 = (10.0e-5 + 2 * 3.3e-5) / 3 * 1e6 / 1e4
local iso_au = iso_hz_per_wm2 * cp.consts.h * cp.consts.c / (2 * pi * cp.consts.a0 ^ 3)
local d_krb = cp.lattice.depth(with(base, { species = "KRb" }))
T.near(d_krb.depth_hz, 1.19356658e6 * iso_au / 1000, 1e-5, "KRb lattice depth from Neyenhuis et al.'s alpha")
T.raises(function() cp.lattice.depth(with(base, { species = "87Rb", wavelength = 780.5 * u.nm })) end,
  { "87Rb", "780.5 nm", "polarizability_au" }, "an untabulated wavelength asks for the value")
T.raises(function() cp.lattice.depth(with(base, { species = "87Rb", polarizability_au = 700 })) end,
  { "either 'species' or a polarizability" }, "both given")
-- LAT-L-USER: a user-added molecule named in a beam brings its own polarizability: a lattice
-- for it is given as power and waist alone.  Closed form (Grimm et al. 2000 [M], the dipole
-- potential U = alpha I / (2 eps0 c)): peak intensity of one beam I0 = 2P / (pi w^2), the
-- retro-reflected standing wave has 4 I0 at its antinodes, so V0 = 4 alpha I0 / (2 eps0 c)
-- with alpha = (900 + 2 * 300) / 3 = 500 a.u. = 500 * 4 pi eps0 a0^3 (the components given).
cp.species.add_molecule { name = "23Na39K-test", atoms = { "23Na", "39K" }, dipole_debye = 2.7,
  rot_const_hz = 2.8e9, c6_au = 5e5, pol_1064_par_au = 900, pol_1064_perp_au = 300 }
local c = cp.consts
local i0 = 2 * base.power / (pi * base.waist ^ 2)
local alpha_si = 500 * 4 * pi * c.eps0 * c.a0 ^ 3
local v0 = 4 * alpha_si * i0 / (2 * c.eps0 * c.c)
local d_user = cp.lattice.depth(with(base, { species = "23Na39K-test" }))
T.near(d_user.depth, v0, 1e-12, "user molecule lattice depth = 4 alpha I0 / (2 eps0 c)")
T.near(d_user.depth_hz, 1.19356658e6 * 0.5, 1e-8, "and half of LAT-L2's 1000 a.u. depth")
T.raises(function() cp.lattice.depth(with(base, { species = "23Na39K-test", wavelength = 1550 * u.nm })) end,
  { "lattice.depth", "no polarizability of 23Na39K-test at 1550 nm", "polarizability_au" },
  "a user molecule without a 1550 nm value: asks for it")
local d3 = cp.lattice.depth3d { beams = { with(base, { species = "Rb87" }), with(base, { species = "Rb87" }),
  with(base, { species = "Rb87" }) }, mass = cp.species.atom("87Rb").mass }
T.near(d3.axes[1].depth / cp.consts.h, d_rb.depth_hz, 1e-12, "depth3d beams take a species too")

for name, f in pairs(cp.lattice) do
  T.check(type(cp.get_help(f)) == "string", "help text for lattice." .. name)
end

-- LAT-L-FLAG: the validity flags reach Lua: heating at 2 E_r is "shallow" (eta^2 =
-- 1/(2 sqrt 2) > 0.3), at 10 E_r not; a linear 0 -> 10 E_r load in 0.1 ms leaves more than
-- 5 % excited ("beyond_first_order"), in 1 ms not (first-order fractions, checked against
-- an exact propagation in the unit test).
local KM = cp.species.molecule("KRb").mass
T.check(cp.lattice.heating { scattering_rate = 0.1, mass = KM, wavelength = 1064e-9, depth_er = 2 }.flags[1] == "shallow"
  and #cp.lattice.heating { scattering_rate = 0.1, mass = KM, wavelength = 1064e-9, depth_er = 10 }.flags == 0,
  "heating: shallow flag below 3 E_r only")
local fast = cp.lattice.loading { shape = "linear", end_er = 10, duration = 1e-4, mass = KM, wavelength = 1064e-9 }
local slow = cp.lattice.loading { shape = "linear", end_er = 10, duration = 1e-3, mass = KM, wavelength = 1064e-9 }
T.check(fast.flags[1] == "beyond_first_order" and fast.excited_fraction > 0.05 and #slow.flags == 0,
  "loading: beyond_first_order above 5 % excitation only")
-- Errors name the Lua function, house wording (DEVELOPERS.md).
T.raises(function() cp.lattice.tunnelling { depth_er = -1 } end,
  { "lattice.tunnelling: depth -1 E_r is out of range; allowed [0, 10000] E_r" },
  "tunnelling: a refused depth names lattice.tunnelling")
T.done()
