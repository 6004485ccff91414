-- Bosonic partners below T_c in a plan: the condensate as a Thomas-Fermi cloud of the atoms'
-- own scattering length (cp.species.atom(...).a_bb) in the association stage.
--  COND-1 a colder start of a 23Na87Rb plan (600 -> 100 nK, both clouds condensing on the
--         way) never makes fewer molecules beyond the Monte Carlo error of the ceiling:
--         Hodby et al., PRL 94, 120402 (2005) [M] find the conversion growing with the
--         phase-space density for bosons and fermions alike (and their stochastic
--         phase-space sampling reproduces it), and at fixed atom number and trap the
--         phase-space density only grows as T falls; the Landau-Zener factor grows with the
--         density too.  The slow ramp used here makes the ceiling the whole story.
--  COND-2 the stage's note gives N0 a / a_ho worked out here (Dalfovo et al., RMP 71, 463
--         (1999): N0 = N (1 - (T/T_c)^3), k T_c = hbar wbar (N / zeta(3))^(1/3)).
--  COND-3 bad input: an attractive or absurd scattering length, a condensed cloud without one.
local T = require "testlib"
local cp = require "coldprep"
local u = cp.units
local function Hz(f) return 2 * math.pi * f end

local w_na, w_rb = { Hz(80), Hz(80), Hz(240) }, { Hz(60), Hz(60), Hz(180) }
local N_na, N_rb = 3e5, 2e5
local ramp = 0.1 * u.G / u.ms

local function plan(temperature, rb_extra)
  local rb = { atom = "87Rb", number = N_rb, trap_frequencies = w_rb }
  for k, v in pairs(rb_extra or {}) do rb[k] = v end
  return cp.plan { start = { molecule = "23Na87Rb", temperature = temperature,
      atoms = { { atom = "23Na", number = N_na, trap_frequencies = w_na }, rb } },
    stages = { cp.stages.associate { ramp_rate = ramp } } }
end

-- the stage's own ceiling (same clouds, samples and seed) for its Monte Carlo error
local function ceiling(temperature)
  local function cloud(atom, n, w)
    return { atom = atom, number = n, omega_x = w[1], omega_y = w[2], omega_z = w[3] }
  end
  return cp.feshbach.max_efficiency { a = cloud("23Na", N_na, w_na), b = cloud("87Rb", N_rb, w_rb),
    temperature = temperature, samples = 20000, seed = 1 }
end

-- COND-1
local temps = { 600, 450, 300, 200, 150, 100 }
local prev
for _, t_nk in ipairs(temps) do
  local t = t_nk * u.nK
  local p = plan(t)
  local n, c = p:run { limiting = false }.stages[1].number, ceiling(t)
  if prev then
    local allowed = 4 * math.sqrt(prev.se ^ 2 + c.std_error ^ 2) * N_rb
    T.check(n >= prev.n - allowed, string.format("COND-1 %g nK makes no fewer molecules than %g nK "
      .. "(%.0f vs %.0f, Monte Carlo allowance %.0f)", t_nk, prev.t, n, prev.n, allowed))
  end
  prev = { n = n, se = c.std_error, t = t_nk }
  if t_nk == 600 then temps.hot = n end
  if t_nk == 100 then
    T.check(p.start.atoms[1].condensed_fraction > 0.9 and p.start.atoms[2].condensed_fraction > 0.9,
      "COND-1 both clouds are mostly condensed at 100 nK")
    -- the regression this guards against: the colder start once made 25 times fewer molecules
    T.check(n >= temps.hot, string.format("COND-1 100 nK makes at least as many molecules as 600 nK "
      .. "(%.0f vs %.0f)", n, temps.hot))
  end
end

-- COND-2
local b = plan(100 * u.nK):run { limiting = false }
local rb = cp.species.atom("87Rb")
local wbar = (w_rb[1] * w_rb[2] * w_rb[3]) ^ (1 / 3)
local tc = cp.consts.hbar * wbar * (N_rb / 1.2020569031595942) ^ (1 / 3) / cp.consts.kB
local n0 = N_rb * (1 - (100 * u.nK / tc) ^ 3)
local x = n0 * rb.a_bb / math.sqrt(cp.consts.hbar / (rb.mass * wbar))
local found
for _, note in ipairs(b.stages[1].notes) do
  local v = note:match("^87Rb is below T_c.-N0 a/a_ho = ([%d%.e+]+)")
  if v then found = tonumber(v) end
end
T.check(found ~= nil, "COND-2 the stage notes the 87Rb condensate")
T.near(found or 0, x, 2e-3, "COND-2 N0 a/a_ho of the 87Rb condensate (3 significant digits)")

-- COND-3
T.raises(function() plan(100 * u.nK, { scattering_length = -100 * u.a0 }):run { limiting = false } end,
  { "stages.associate", "87Rb is below T_c", "-100 a0", "repulsive", "scattering_length" },
  "COND-3 an attractive condensate is refused, naming the field to set")
T.check(pcall(function() plan(600 * u.nK, { scattering_length = -100 * u.a0 }):run { limiting = false } end),
  "COND-3 above T_c the sign of the scattering length does not matter")
T.raises(function() plan(100 * u.nK, { scattering_length = 2e-6 }) end,
  { "start.atoms[2]", "scattering_length", "out of range" }, "COND-3 an absurd scattering length")
local w = Hz(100)
T.raises(function() cp.feshbach.overlap_density { temperature = 50 * u.nK,
  a = { mass = rb.mass, number = 1e5, omega_x = w, omega_y = w, omega_z = w, profile = "bose" },
  b = { atom = "87Rb", number = 1e5, omega_x = w, omega_y = w, omega_z = w } } end,
  { "feshbach.overlap_density", "a scattering_length 0 m", "below T_c" },
  "COND-3 a condensed cloud given by mass needs its scattering length")
local by_atom = cp.feshbach.overlap_density { temperature = 50 * u.nK,
  a = { atom = "87Rb", number = 1e5, omega_x = w, omega_y = w, omega_z = w },
  b = { atom = "87Rb", number = 1e5, omega_x = w, omega_y = w, omega_z = w } }
local given = cp.feshbach.overlap_density { temperature = 50 * u.nK,
  a = { mass = rb.mass, number = 1e5, omega_x = w, omega_y = w, omega_z = w, profile = "bose",
    scattering_length = rb.a_bb },
  b = { atom = "87Rb", number = 1e5, omega_x = w, omega_y = w, omega_z = w } }
T.check(by_atom.density == given.density, "COND-3 an atom's cloud takes its a_bb by default")
T.done()
