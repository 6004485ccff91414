-- Lua-level tests of cp.collisions through the real coldprep binary: docs/api names and
-- units, checks against outside references, and error messages.
local T = require "testlib"
local cp = require "coldprep"

local M = 126.873178694 * cp.units.amu -- 40K87Rb (AME2020 masses, docs/data.md)
local mu = M / 2

-- COLL-L1: the l = 1 barrier of a molecule with C6 ~ 16000 a.u. and mass 127 u is near
-- 24 uK (common practice, no source); E/kB = temperature.
local b = cp.collisions.pwave_barrier { c6_au = 16000, mass = 127 * cp.units.amu / 2 }
T.near(b.temperature, 24e-6, 0.03, "p-wave barrier near 24 uK")
T.near(b.energy / cp.consts.kB, b.temperature, 1e-14, "energy and temperature agree")
local b2 = cp.collisions.pwave_barrier { c6_au = 16000, mass = 127 * cp.units.amu / 2, l = 2 }
T.near(b2.energy / b.energy, 3 ^ 1.5, 1e-12, "E_l ~ [l(l+1)]^(3/2) (closed form, docs/models/collisions.md)")

-- COLL-L2: abar of KRb ~ 118 a0 (Idziaszek & Julienne, PRL 104, 113202 (2010) [M]).
local a = cp.collisions.mean_scattering_length { c6_au = 16130, mass = mu }
T.near(a.abar_a0, 118, 0.01, "KRb abar")
T.near(a.abar, a.abar_a0 * cp.units.a0, 1e-14, "abar in m and a0")

-- COLL-L3: universal rates: p-wave linear in T, ~0.8e-5 cm^3/s/K for KRb [M]; s-wave
-- bosons twice distinguishable (g = 2 vs 1); temperature optional for s-wave.
local kp = cp.collisions.universal_rate { c6_au = 16130, mass = mu, temperature = 1e-6, statistics = "fermion" }
T.near(kp.rate / 1e-6 * 1e6, 0.8e-5, 0.1, "KRb p-wave beta/T")
local kb = cp.collisions.universal_rate { c6_au = 16130, mass = mu, statistics = "boson" }
local kd = cp.collisions.universal_rate { c6_au = 16130, mass = mu, temperature = 1e-6, statistics = "distinguishable" }
T.near(kb.rate, 2 * kd.rate, 1e-14, "g = 2 for identical bosons")
T.near(kd.rate, 4 * math.pi * cp.consts.hbar * a.abar / mu, 1e-14, "K_s = 4 pi hbar abar / mu")

-- COLL-L4: hold at fixed T: N(t) = N0 / (1 + N0 K' t) (docs/models/collisions.md).
local w = 2 * math.pi * 100
local h = cp.collisions.hold { number = 2e4, temperature = 300e-9, omega_bar = w, mass = M,
  rate = 1e-17, duration = 0.2, anti_evaporation = false, points = 5 }
local sig = math.sqrt(cp.consts.kB * 300e-9 / (M * w * w))
local kprime = 1e-17 / (8 * math.pi ^ 1.5 * sig ^ 3)
T.near(h.number, 2e4 / (1 + 2e4 * kprime * 0.2), 1e-8, "two-body decay at fixed T")
T.check(#h.times == 5 and h.times[5] == 0.2 and h.numbers[1] == 2e4, "trajectory arrays")
-- one-body loss N0 e^(-t/tau) and technical heating T0 + rate t (by hand)
local hh = cp.collisions.hold { number = 2e4, temperature = 300e-9, omega_bar = w, mass = M,
  duration = 0.2, lifetime = 1, heating_rate = 1e-7 }
T.near(hh.number, 2e4 * math.exp(-0.2), 1e-9, "one-body loss")
T.near(hh.temperature, 300e-9 + 0.2e-7, 1e-12, "technical heating")
-- COLL-L4c: a one-body lifetime far below the hold (10 ns over 10 ms, 10^6 lifetimes: 21 s of
-- CPU before the closed-form tail; 10^5 s: days) costs milliseconds.  Checks by hand: with
-- two-body loss and anti-evaporation the cloud is gone (N0 e^(-t/tau) underflows) and T has
-- risen by heating_rate * t plus what the first lifetimes' two-body loss added (at most
-- T0 ((1 + beta<n>0 tau)^(1/4) - 1) < 1e-3 T0 here); at 3 lifetimes N0 e^(-3) without
-- two-body loss.
local clock = os.clock()
for _, duration in ipairs { 1e-2, 1e5 } do
  local gone = cp.collisions.hold { number = 2e4, temperature = 300e-9, omega_bar = w, mass = M,
    rate = 1e-17, duration = duration, lifetime = 1e-8, heating_rate = 1e-7, points = 11 }
  T.check(gone.number == 0 and gone.surviving_fraction == 0, "a cloud of 10^6 lifetimes is gone")
  T.near(gone.temperature, 300e-9 + 1e-7 * duration, 1e-3 * 300e-9 / (300e-9 + 1e-7 * duration),
    "technical heating over the whole hold")
end
local short = cp.collisions.hold { number = 2e4, temperature = 300e-9, omega_bar = w, mass = M,
  duration = 3e-8, lifetime = 1e-8, points = 31 }
T.near(short.number, 2e4 * math.exp(-3), 1e-9, "one-body loss over 3 lifetimes")
T.check(os.clock() - clock < 1, string.format("holds of 10^6 and 10^13 lifetimes in %.3f s of CPU (< 1 s)",
  os.clock() - clock))

-- COLL-L5: evaporation without loss follows T ~ N^alpha, alpha = (eta + kappa)/3 - 1
-- (Ketterle & van Druten 1996 [M]).
local e = cp.collisions.evaporation { number = 2e4, temperature = 1e-6, omega_bar = 600, mass = M,
  eta = 8, kappa = 0.6, ratio = 1e12, final_number = 2e3 }
T.near(e.temperature, 1e-6 * 0.1 ^ ((8.6) / 3 - 1), 1e-6, "lossless evaporation scaling")
T.check(e.efficiency > 0 and #e.phase_space_densities == 51, "PSD grows; default 51 points")

-- COLL-L5c: stop_temperature ends the trajectory at its first point at or below it, the
-- points before it those of the full trajectory (the second method), bit for bit; with the
-- clock, the times too; a negative stop is refused.
do
  local args = { number = 2e5, temperature = 150e-9, omega_bar = 600, mass = M, eta = 8,
    ratio = 300, wave = "p", final_number = 1, points = 200, cross_section = 1e-16, loss_rate = 1e-17 }
  local full = cp.collisions.evaporation(args)
  args.stop_temperature = 60e-9
  local part = cp.collisions.evaporation(args)
  local m = #part.temperatures
  local same = m >= 2 and m < 100
  for i = 1, m do
    same = same and part.numbers[i] == full.numbers[i] and part.temperatures[i] == full.temperatures[i]
      and part.times[i] == full.times[i]
  end
  T.check(same, "the stopped trajectory is the full one's beginning")
  T.check(part.temperatures[m] <= 60e-9 and part.temperatures[m - 1] > 60e-9 and
    part.temperature == part.temperatures[m] and part.duration == part.times[m], "it ends at the stop")
  args.stop_temperature = -1
  T.raises(function() cp.collisions.evaporation(args) end, { "stop_temperature", "allowed" },
    "negative stop_temperature")
end

-- COLL-L4b: the universal rate's validity flag: KRb (E_1/k_B ~ 24 uK) at 300 nK none, at
-- 10 uK "above_barrier" (k_B T / E_1 > 0.1); the fraction against pwave_barrier.
local KRB = cp.species.molecule("KRb")
local bar = cp.collisions.pwave_barrier { c6_au = KRB.c6_au, mass = KRB.mass / 2 }.temperature
local cold = cp.collisions.universal_rate { c6_au = KRB.c6_au, mass = KRB.mass / 2, temperature = 300e-9, statistics = "fermion" }
local hot = cp.collisions.universal_rate { c6_au = KRB.c6_au, mass = KRB.mass / 2, temperature = 10e-6, statistics = "fermion" }
T.check(#cold.flags == 0 and hot.flags[1] == "above_barrier", "above_barrier flag only when hot")
T.near(hot.barrier_fraction, 10e-6 / bar, 1e-12, "barrier fraction k_B T / E_1")

-- COLL-L5b: the evaporation rate constant at eta = 10 against the closed form of Luiten,
-- Reynolds & Walraven, PRA 53, 381 (1996), P(n, x) = 1 - e^-x sum_{k<n} x^k/k! written out;
-- bad eta raises naming the key.
local x = 10
local p3 = 1 - math.exp(-x) * (1 + x + x * x / 2)
local p4 = p3 - math.exp(-x) * x ^ 3 / 6
local ev = cp.collisions.evaporation_rate { eta = x }
T.near(ev.ratio, 2 * math.exp(-x) * (x - 4 * p4 / p3), 1e-12, "Gamma_ev / Gamma_el at eta = 10")
T.near(ev.truncated_fraction, p3, 1e-12, "P(3, 10)")
T.raises(function() cp.collisions.evaporation_rate { eta = 4 } end, { "eta", "[5, 30]" }, "eta below 5")

-- COLL-L6: dipolar cross-section and the collision ratio.
local x = cp.collisions.dipolar_cross_section { dipole_debye = 0.2, mass = mu, statistics = "fermion" }
T.near(x.cross_section, 32 * math.pi / 15 * x.dipole_length ^ 2, 1e-14, "sigma_F = 32 pi/15 D^2")
local r = cp.collisions.collision_ratio { cross_section = x.cross_section, rate = kp.rate, mass = M, temperature = 1e-6 }
-- sigma v_rel / beta with the mean relative speed of a thermal gas v_rel = sqrt(16 kB T/(pi m))
-- (Maxwell-Boltzmann, e.g. Reif, Fundamentals of Statistical and Thermal Physics, sec. 7.10)
T.near(r.ratio, x.cross_section * math.sqrt(16 * cp.consts.kB * 1e-6 / (math.pi * M)) / kp.rate, 1e-12,
  "collision ratio = sigma v_rel / beta")

-- COLL-L7: errors.
T.raises(function() cp.collisions.pwave_barrier { c6au = 16000, mass = mu } end,
  { "unknown argument 'c6au'", "did you mean 'c6_au'" }, "unknown key")
T.raises(function() cp.collisions.pwave_barrier { c6_au = -1, mass = mu } end,
  { "c6_au", "out of range", "a.u." }, "negative C6")
T.raises(function() cp.collisions.universal_rate { c6_au = 16130, mass = mu, statistics = "fermion" } end,
  { "missing argument 'temperature'" }, "p-wave needs T")
T.raises(function() cp.collisions.universal_rate { c6_au = 16130, mass = mu, statistics = "photon" } end,
  { "statistics \"photon\" is not allowed", "allowed" }, "bad statistics")
T.raises(function() cp.collisions.hold { number = 2e4, temperature = 1 / 0, omega_bar = w, mass = M, duration = 1 } end,
  { "temperature", "finite" }, "infinite temperature")
T.raises(function() cp.collisions.hold { number = 2e4, temperature = 1e-7, omega_bar = w, mass = M, duration = 1, wave = "d" } end,
  { "wave" }, "bad wave")
T.raises(function() cp.collisions.hold { number = 2e4, temperature = 1e-7, omega_bar = w, mass = M, duration = 1, points = 1 } end,
  { "points" }, "too few points")
T.raises(function() cp.collisions.hold { number = 2e4, temperature = 1e-7, omega_bar = 0, mass = M, duration = 1 } end,
  { "omega_bar", "out of range", "rad/s" }, "zero omega_bar is named as given")
T.raises(function() cp.collisions.evaporation { number = 2e4, temperature = 1e-6, omega_bar = 600, mass = M,
  eta = 40, ratio = 10, final_number = 2e3 } end, { "eta", "out of range" }, "eta too large")
T.raises(function() cp.collisions.dipolar_cross_section { dipole_debye = true, mass = mu, statistics = "boson" } end,
  { "dipole_debye", "must be a number" }, "wrong type")

for k, fn in pairs(cp.collisions) do
  if type(fn) == "function" then
    local hlp = cp.get_help(fn)
    T.check(type(hlp) == "string" and hlp:find("Example", 1, true) ~= nil, "help text for collisions." .. k)
  end
end

-- COLL-L9: cp.collisions.shielded: the names and units of the API, the regimes chosen from
-- the protection, and the exact induced dipole of cp.fields (checked in test_fields.c).
local mw = cp.collisions.shielded { molecule = "23Na40K", temperature = 300e-9,
  microwave = { rabi = 2 * math.pi * 50e6, detuning = 2 * math.pi * 10e6 } }
T.check(mw.regime == "microwave" and mw.valid, "microwave regime, valid")
-- d_eff = d / sqrt(12 (1 + (Delta/Omega)^2)) (Karman & Hutson, PRL 121, 163401 (2018)), d = 2.72 D
T.near(mw.dipole_debye, 2.72 / math.sqrt(12 * 1.04), 1e-9, "effective dipole")
T.near(mw.ratio, mw.elastic_rate_coefficient / mw.loss_rate_coefficient, 1e-12, "ratio = elastic / loss")
-- Schindewolf et al., Nature 607, 677 (2022), arXiv:2201.05143: elastic/inelastic >= 460
T.check(mw.ratio >= 460, "microwave-shielded NaK: elastic/loss >= 460")
T.check(type(mw.method) == "string" and mw.method:find("microwave", 1, true), "method named")
local dc = cp.collisions.shielded { molecule = "KRb", temperature = 300e-9, electric_field = 5e5 }
T.check(dc.regime == "dc_3d" and dc.valid and dc.note == nil, "dc 3D regime")
local q2 = cp.collisions.shielded { molecule = "KRb", temperature = 800e-9, electric_field = 5e5,
  confinement = { axial_omega = 2 * math.pi * 23e3 } }
T.check(q2.regime == "quasi_2d" and q2.loss_rate_coefficient_2d > 0, "quasi-2D regime with its 2D rate")
T.near(q2.dipole_debye, dc.dipole_debye, 1e-12, "the same induced dipole in both")
-- de Miranda et al., Nature Phys. 7, 502 (2011): pancakes suppress the loss (by nearly two
-- orders of magnitude in the experiment; the model gives ~25 here, see docs/models)
local dc8 = cp.collisions.shielded { molecule = "KRb", temperature = 800e-9, electric_field = 5e5 }
T.check(dc8.loss_rate_coefficient > 15 * q2.loss_rate_coefficient, "pancakes suppress the loss")
-- a molecule given as a table, as cp.species.molecule returns it
local tbl = cp.collisions.shielded { molecule = cp.species.molecule("KRb"), temperature = 300e-9,
  electric_field = 5e5 }
T.near(tbl.loss_rate_coefficient, dc.loss_rate_coefficient, 1e-12, "molecule as a table")
local near = cp.collisions.shielded { molecule = "KRb", temperature = 300e-9, electric_field = 12e5 }
T.check(not near.valid and near.note:find("shielding field", 1, true), "near the shielding field: flagged")
T.check(near.note:find("|1,0>", 1, true) ~= nil, "the note says dc shielding needs |1,0>")
-- dc-field shielding of KRb in |1,0> at 12.72 kV/cm (Li et al., Nature Phys. 17, 1144
-- (2021), arXiv:2103.06246; field and temperature [M]; the factor-30 suppression itself is
-- checked in the C test SH-6): regime, method, the |1,0> dipole and pair gap from
-- cp.fields.dipole_matrix, the enhancement just below the crossing
local sh = cp.collisions.shielded { molecule = "KRb", temperature = 300e-9, electric_field = 12.72e5,
  rotational_j = 1 }
T.check(sh.regime == "dc_shield" and sh.valid and sh.pair_gap_hz > 0, "dc-shielding regime, above the crossing")
T.check(sh.method:find("|1,0>|1,0>", 1, true) ~= nil, "method named")
local dm = cp.fields.dipole_matrix { molecule = "KRb", field = 12.72e5 }
T.near(sh.dipole_debye, math.abs(dm.dipole_debye[2][2]), 1e-12, "the |1,0> induced dipole")
T.near(sh.pair_gap_hz, 2 * dm.energy_hz[2] - dm.energy_hz[1] - dm.energy_hz[3], 1e-9, "the pair gap")
local dc3 = cp.collisions.shielded { molecule = { dipole_debye = 0.566, rot_const_hz = 1113.950e6,
  c6_au = 16130, mass = cp.species.molecule("KRb").mass, statistics = "fermion" }, temperature = 300e-9,
  electric_field = 12.72e5, rotational_j = 1 }
T.near(dc3.loss_rate_coefficient, sh.loss_rate_coefficient, 1e-12, "molecule table in the dc-shield regime")
local below = cp.collisions.shielded { molecule = "KRb", temperature = 300e-9, electric_field = 12.6e5,
  rotational_j = 1 }
T.check(not below.valid and below.note:find("below the crossing", 1, true), "below the crossing: flagged")
T.check(below.loss_rate_coefficient > 10 * sh.loss_rate_coefficient, "loss enhanced below, suppressed above")

-- COLL-L10: bad input to cp.collisions.shielded names the function, key, value and unit.
T.raises(function() cp.collisions.shielded { molecule = "KRb" } end,
  { "collisions.shielded", "temperature" }, "missing temperature")
T.raises(function() cp.collisions.shielded { molecule = "XyZ", temperature = 1e-7 } end,
  { "XyZ" }, "unknown molecule")
T.raises(function() cp.collisions.shielded { temperature = 1e-7 } end,
  { "collisions.shielded", "molecule" }, "missing molecule")
T.raises(function() cp.collisions.shielded { molecule = { dipole_debye = 1 }, temperature = 1e-7 } end,
  { "molecule", "rot_const_hz" }, "molecule table without data")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7, electric_field = -5 } end,
  { "electric_field", "-5", "V/m" }, "negative field")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7, electric_field = 1e12 } end,
  { "electric_field", "V/m" }, "huge field")
T.raises(function() cp.collisions.shielded { molecule = "NaK", temperature = 1e-7,
  microwave = { rabi = 2 * math.pi * 50e6 } } end, { "microwave", "detuning" }, "microwave without detuning")
T.raises(function() cp.collisions.shielded { molecule = "NaK", temperature = 1e-7,
  microwave = { rabi = 2 * math.pi * 50e6, detuning = -1e7 } } end, { "detuning" }, "red detuning")
T.raises(function() cp.collisions.shielded { molecule = "NaK", temperature = 1e-7,
  microwave = { rabi = 2 * math.pi * 50e6, detuning = 1e7, elipticity = 0 } } end,
  { "microwave", "elipticity", "ellipticity" }, "misspelt microwave key")
T.raises(function() cp.collisions.shielded { molecule = "NaK", temperature = 1e-7,
  microwave = { rabi = 2 * math.pi * 50e6, detuning = 1e7 }, electric_field = 1e4 } end,
  { "electric_field", "microwave" }, "microwave with a dc field")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7,
  confinement = { axial_omega = 0 } } end, { "axial_omega" }, "zero axial frequency")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7, feild = 1 } end,
  { "feild" }, "misspelt key")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7, rotational_j = 1 } end,
  { "electric_field", "|1,0>", "allowed" }, "|1,0> without a field")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7, rotational_j = 2,
  electric_field = 12.8e5 } end, { "rotational_j", "2", "allowed [0, 1]" }, "no such rotational state")
T.raises(function() cp.collisions.shielded { molecule = "KRb", temperature = 1e-7, rotational_j = 1,
  electric_field = 12.8e5, confinement = { axial_omega = 2 * math.pi * 20e3 } } end,
  { "axial_omega", "pancake" }, "|1,0> in pancakes")

T.done()
