-- A worked plan for bosonic 87Rb133Cs, checked stage by stage against values worked out
-- here by hand from the model formulas (docs/models/*.md and the papers they cite), not by calling
-- the code under test again.  The clouds are hot (T/T_c ~ 10) so the classical limits of
-- the ideal gas hold to ~1e-4 where the check needs them.
local T = require "testlib"
local cp = require "coldprep"

local u, c = cp.units, cp.consts
local pi = math.pi

local rb, cs = cp.species.atom("87Rb"), cp.species.atom("133Cs")
local mol = cp.species.molecule("RbCs")
local res = cp.species.resonance("RbCs")
local T0 = 2 * u.uK
local w_rb = { 2 * pi * 80, 2 * pi * 80, 2 * pi * 150 }
local w_cs = { 2 * pi * 60, 2 * pi * 60, 2 * pi * 120 }
local N_rb, N_cs = 2e5, 1e5
local ramp = 0.3 * u.G / u.ms
local pmax = 0.3
local heat = 5 * u.nK * c.kB      -- energy left per removed atom, J
local beta = 2e-11 * u.cm3        -- two-body loss coefficient, m^3/s
local hold_time = 50 * u.ms
local eta, ratio = 10, 300
-- the molecules' trap: m_mol w^2 = m_Rb w_Rb^2 + m_Cs w_Cs^2 on each axis (the potentials add)
local w_mol = {}
for i = 1, 3 do w_mol[i] = math.sqrt((rb.mass * w_rb[i] ^ 2 + cs.mass * w_cs[i] ^ 2) / mol.mass) end
local wbar = (w_mol[1] * w_mol[2] * w_mol[3]) ^ (1 / 3)

local plan = cp.plan { name = "worked RbCs", start = {
    molecule = "87Rb133Cs", temperature = T0,
    atoms = { { atom = "87Rb", number = N_rb, trap_frequencies = w_rb },
              { atom = "133Cs", number = N_cs, trap_frequencies = w_cs } } },
  stages = {
    cp.stages.associate { ramp_rate = ramp, max_efficiency = pmax },
    cp.stages.remove_atoms { heating_per_atom = heat },
    cp.stages.transfer { round_trip_efficiency = 0.81 },
    cp.stages.change_trap { trap_frequencies = { 2 * w_mol[1], 2 * w_mol[2], 2 * w_mol[3] }, ramp_time = 0.2 },
    cp.stages.hold { duration = hold_time, loss_rate = beta },
    cp.stages.evaporate { eta = eta, ratio = ratio, keep = 1 / 3 },
  } }
local b = plan:run()
local st = b.stages

-- WORKED-1 association.  Overlap of two ideal Bose gases (the stage's profile for bosons)
-- displaced by the differential sag, summed by hand as the series of displaced Gaussians:
-- n(r) = lambda^-3 sum_k z^k k^(-3/2) exp(-k V(r)/kB T), so <n_Rb>_Cs = (1/N_Cs) sum_j sum_k
-- z_Rb^j z_Cs^k (j k)^(-3/2) lambda_Rb^-3 lambda_Cs^-3 prod_i sqrt(pi/(al+be))
-- exp(-al be d_i^2/(al+be)), al = j/(2 s_Rb,i^2), be = k/(2 s_Cs,i^2), s_i^2 = kB T/(m w_i^2),
-- d = (0, 0, g/w_Cs,z^2 - g/w_Rb,z^2) (docs/models/collisions.md and feshbach.md; the Bose functions:
-- Dalfovo et al., RMP 71, 463 (1999)), with the fugacity from N = (kB T/hbar wbar)^3 g_3(z)
-- solved here by Newton's method on the series.  Ramp-rate law (Hodby et al. 2005):
-- P = Pmax (1 - exp(-alpha n |abg width / Bdot|)), alpha = 4 pi^2 hbar / mu.
local function s2(m, w) return c.kB * T0 / (m * w * w) end
local function fugacity(N, w)
  local target = N * (c.hbar * (w[1] * w[2] * w[3]) ^ (1 / 3) / (c.kB * T0)) ^ 3
  local z = target
  for _ = 1, 50 do
    local g3, g2 = 0, 0
    for k = 1, 200 do g3, g2 = g3 + z ^ k / k ^ 3, g2 + z ^ k / k ^ 2 end
    z = z - (g3 - target) / (g2 / z)
  end
  return z
end
local function lambda3(m) return (2 * pi * c.hbar / math.sqrt(2 * pi * m * c.kB * T0)) ^ 3 end
local z_rb, z_cs = fugacity(N_rb, w_rb), fugacity(N_cs, w_cs)
local dz = c.g / w_cs[3] ^ 2 - c.g / w_rb[3] ^ 2
local sum = 0
for j = 1, 12 do
  for k = 1, 12 do
    local term = z_rb ^ j * z_cs ^ k / (j * k) ^ 1.5
    for i = 1, 3 do
      local al, be = j / (2 * s2(rb.mass, w_rb[i])), k / (2 * s2(cs.mass, w_cs[i]))
      local d = i == 3 and dz or 0
      term = term * math.sqrt(pi / (al + be)) * math.exp(-al * be * d * d / (al + be))
    end
    sum = sum + term
  end
end
local n_ov = sum / (lambda3(rb.mass) * lambda3(cs.mass) * N_cs)
local mu = rb.mass * cs.mass / (rb.mass + cs.mass)
local P = pmax * (1 - math.exp(-4 * pi * pi * c.hbar / mu * n_ov * math.abs(res.abg * res.width) / ramp))
T.check(P > 0.1 and P < 0.29, "the worked ramp sits between the fast and slow limits")
T.near(st[1].number, P * N_cs, 1e-6, "molecules after association")
T.near(st[1].temperature, T0, 1e-12, "molecules at the atoms' temperature")
T.near(st[1].duration, math.abs(res.width) / ramp, 1e-12, "ramp over one resonance width")
local N1 = P * N_cs
-- T_c = hbar wbar (N / zeta(3))^(1/3) / kB (Dalfovo et al. 1999; zeta(3) = 1.2020569031595942)
local function tc(N, w) return c.hbar * w * (N / 1.2020569031595942) ^ (1 / 3) / c.kB end
T.near(st[1].degeneracy, T0 / tc(N1, wbar), 1e-9, "T/T_c of the Feshbach molecules")
T.check(st[1].degeneracy_name == "T/T_c", "RbCs is bosonic: T/T_c is reported")

-- WORKED-2 removal: the energy of N_removed * heat is shared by N1 molecules; classical
-- harmonic gas E/N = 3 kB T.
local removed = (N_rb - N1) + (N_cs - N1)
local T2 = T0 + heat * removed / (3 * c.kB * N1)
T.near(st[2].temperature, T2, 2e-4, "temperature after removal (classical limit)")
T.near(st[2].number, N1, 1e-12, "removal keeps the molecules")

-- WORKED-3 transfer: one way = sqrt(round trip) (docs/planning.md, transfer).  The molecules that
-- fail are lost at random, so the energy per particle is kept.  For the ideal Bose gas
-- E/N = 3 kB T Li4(z)/Li3(z) = 3 kB T (1 - z/16 + O(z^2)) with z = rho = N (hbar wbar /
-- kB T)^3 to first order (docs/models/thermo.md, series of Li_n(z) = z + z^2/2^n + ...), so keeping
-- E/N while N drops from N1 to N3 gives T3 = T2 (1 - (rho1 - rho3)/16) (worked here by
-- hand; rho ~ 1e-4, the O(z^2) remainder ~1e-9).
local N3 = N1 * 0.9
local function rho(N, Tk, w) return N * (c.hbar * w / (c.kB * Tk)) ^ 3 end
local T3 = T2 * (1 - (rho(N1, T2, wbar) - rho(N3, T2, wbar)) / 16)
T.near(st[3].number, N3, 1e-12, "ground-state molecules")
T.check(st[3].kind == "ground-state-molecules", "the transfer makes ground-state molecules")
T.check(T3 < T2, "random loss from a Bose gas cools it slightly (E/N kept)")
-- the stage's own change, from the temperature it was handed (the removal above is
-- checked only to the classical limit, 2e-4)
T.near(st[3].temperature / st[2].temperature, T3 / T2, 1e-9,
  "temperature after the transfer (E/N kept, first order in z)")

-- WORKED-4 adiabatic compression by 2 on every axis: classical S/N = 4 - ln(N (hbar wbar /
-- kB T)^3) is kept, so T scales with wbar.
local T4 = 2 * T3
T.near(st[4].temperature, T4, 2e-4, "temperature after the trap change (classical)")
T.near(st[4].entropy_per_particle, st[3].entropy_per_particle, 1e-9, "entropy kept by the trap change")

-- WORKED-5 hold with s-wave loss and its anti-evaporation heating (docs/models/collisions.md):
-- dN/dt = -beta <n> N, dT/dt = beta <n> T / 4, <n> = N (m wbar^2 / (4 pi kB T))^(3/2)
-- => T = T4 (N4/N)^(1/4) and N^(-11/8) = N4^(-11/8) + (11/8) k t with
-- k = beta (m wbar^2 / (4 pi kB))^(3/2) T4^(-3/2) N4^(-3/8)   (integrated here by hand).
local w4 = 2 * wbar
local k = beta * (mol.mass * w4 * w4 / (4 * pi * c.kB)) ^ 1.5 * T4 ^ -1.5 * N3 ^ (-3 / 8)
local N5 = (N3 ^ (-11 / 8) + 11 / 8 * k * hold_time) ^ (-8 / 11)
local T5 = T4 * (N3 / N5) ^ 0.25
T.check(N5 < 0.9 * N3, "the hold loses a sizeable fraction")
T.near(st[5].number, N5, 1e-6, "number after the hold (closed form)")
T.near(st[5].temperature, T5, 1e-6, "temperature after the hold (closed form)")

-- WORKED-6 evaporation (Ketterle & van Druten 1996 scaling model, as documented in
-- docs/models/collisions.md): d ln T / d ln N = [(eta + kappa - 3) r - (3 - eps)] / (3 (r + 1)),
-- r = f R, f = 2 e^-eta [eta - 4 P(4, eta) / P(3, eta)] (Luiten, Reynolds & Walraven, PRA 53,
-- 381 (1996); P(n, x) = 1 - e^-x sum_{k<n} x^k/k! written out here), kappa = (eta - 5)/(eta - 4),
-- eps = 9/4 (s-wave), R = R0 (T/T0)^(1/2).  Integrated here with classical RK4 in ln N.
local function gamma_p(n, x)
  local s, term = 0, 1
  for k = 0, n - 1 do
    if k > 0 then term = term * x / k end
    s = s + term
  end
  return 1 - math.exp(-x) * s
end
local function evap_f(e) return 2 * math.exp(-e) * (e - 4 * gamma_p(4, e) / gamma_p(3, e)) end
local kappa = (eta - 5) / (eta - 4)
local function slope(lnT, T_start)
  local r = ratio * math.sqrt(math.exp(lnT) / T_start) * evap_f(eta)
  return ((eta + kappa - 3) * r - (3 - 9 / 4)) / (3 * (r + 1))
end
local lnT, steps = math.log(T5), 2000
local h = math.log(1 / 3) / steps
for _ = 1, steps do
  local k1 = slope(lnT, T5)
  local k2 = slope(lnT + h / 2 * k1, T5)
  local k3 = slope(lnT + h / 2 * k2, T5)
  local k4 = slope(lnT + h * k3, T5)
  lnT = lnT + h / 6 * (k1 + 2 * k2 + 2 * k3 + k4)
end
T.near(st[6].number, N5 / 3, 1e-6, "evaporation keeps a third")
T.near(st[6].temperature, math.exp(lnT), 1e-6, "temperature after evaporation (RK4 here)")
T.near(b.final.degeneracy, math.exp(lnT) / tc(N5 / 3, w4), 1e-6, "final T/T_c by hand")

-- WORKED-7 the evaporation's duration without two-body loss (cross section given): with
-- T = T0 x^alpha (x = N/N0, alpha = (eta + kappa)/3 - 1, the no-loss scaling above) the
-- per-particle loss rate <n> f sigma v_rel, <n> = N (m wbar^2 / (4 pi kB T))^(3/2) / P(3, eta),
-- v_rel = sqrt(16 kB T / (pi m)), f as in WORKED-6 (docs/models/collisions.md) is
-- Gamma0 x^(1 - alpha), so t = integral dx x^(alpha - 2) / Gamma0 from x_f to 1
-- = (1 - x_f^(alpha - 1)) / ((alpha - 1) Gamma0)   (integrated here by hand).
local sigma, eta7 = 1e-16, 8
local b7 = cp.plan { start = { molecule = "87Rb133Cs", temperature = T0, atoms = {
      { atom = "87Rb", number = N_rb, trap_frequencies = w_rb }, { atom = "133Cs", number = N_cs, trap_frequencies = w_cs } } },
  stages = { cp.stages.associate { ramp_rate = ramp, max_efficiency = pmax }, cp.stages.transfer { efficiency = 0.9 },
    cp.stages.evaporate { eta = eta7, keep = 0.5, cross_section = sigma, loss_rate = 0 } } }:run { limiting = false }
local N6, T6 = b7.stages[2].number, b7.stages[2].temperature
local alpha = (eta7 + (eta7 - 5) / (eta7 - 4)) / 3 - 1
local n_mean = N6 * (mol.mass * wbar * wbar / (4 * pi * c.kB * T6)) ^ 1.5 / gamma_p(3, eta7)
local gamma0 = n_mean * evap_f(eta7) * sigma * math.sqrt(16 * c.kB * T6 / (pi * mol.mass))
T.near(b7.final.temperature, T6 * 0.5 ^ alpha, 1e-6, "no-loss evaporation: T ~ N^alpha")
T.near(b7.final.duration, (1 - 0.5 ^ (alpha - 1)) / ((alpha - 1) * gamma0), 1e-4,
  "evaporation time without loss (closed form)")

-- WORKED-7b the same evaporation ended by a duration: inverting the closed form,
-- x = (1 - (alpha - 1) Gamma0 t)^(1/(alpha - 1)) and T = T6 x^alpha (by hand).
local t7 = 0.5 * (1 - 0.5 ^ (alpha - 1)) / ((alpha - 1) * gamma0)
local b7t = cp.plan { start = { molecule = "87Rb133Cs", temperature = T0, atoms = {
      { atom = "87Rb", number = N_rb, trap_frequencies = w_rb }, { atom = "133Cs", number = N_cs, trap_frequencies = w_cs } } },
  stages = { cp.stages.associate { ramp_rate = ramp, max_efficiency = pmax }, cp.stages.transfer { efficiency = 0.9 },
    cp.stages.evaporate { eta = eta7, duration = t7, cross_section = sigma, loss_rate = 0 } } }:run { limiting = false }
local x7 = (1 - (alpha - 1) * gamma0 * t7) ^ (1 / (alpha - 1))
T.near(b7t.final.number, N6 * x7, 1e-4, "evaporation ended by a duration: number (closed form)")
T.near(b7t.final.temperature, T6 * x7 ^ alpha, 1e-4, "evaporation ended by a duration: temperature")
T.near(b7t.final.duration, t7, 1e-4, "evaporation ended by a duration: duration")

-- the bookkeeping over the whole plan
local eff = 1
for _, r in ipairs(st) do eff = eff * r.efficiency end
T.near(eff, (N5 / 3) / N_cs, 1e-6, "product of step efficiencies = N_final / N_start")
T.near(b.final.elapsed, math.abs(res.width) / ramp + 0.2 + hold_time, 1e-9,
  "elapsed time (transfer and evaporation durations unknown here: 0)")

T.done()
