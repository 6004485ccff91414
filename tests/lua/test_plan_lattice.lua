-- The load_lattice stage's record: the lattice state as fields (record.lattice), checked
-- against formulas written here, and the many-band loading of a deep lattice against the
-- one-band model it replaces.
local T = require "testlib"
local cp = require "coldprep"

local u = cp.units
local pi = math.pi
local kB, hbar = cp.consts.kB, cp.consts.hbar
local function Hz(f) return 2 * pi * f end

local function plan(molecule, atoms, T0, lattice)
  return cp.plan { start = { molecule = molecule, temperature = T0, atoms = atoms },
    stages = { cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms, max_efficiency = 0.2 },
      cp.stages.remove_atoms {}, cp.stages.transfer { efficiency = 0.9 },
      cp.stages.load_lattice(lattice) } }
end

-- LATT-1 fermionic NaK in a 55 E_r lattice: the fields exist and agree with formulas.
local nak = plan("23Na40K", {
    { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
    { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } } },
  200 * u.nK, { wavelength = 1064 * u.nm, power = 0.6, waist = 180 * u.um,
    polarizability_au = 700, ramp_time = 0.05 }):run { limiting = false }
local rec = nak.stages[4]
local L = rec.lattice
T.check(type(L) == "table" and type(L.filling) == "table" and type(L.envelope) == "table",
  "load_lattice records the lattice state as fields")
T.check(nak.stages[3].lattice == nil, "only the lattice stage records a lattice")
-- on-site frequency hbar w = 2 sqrt(V0 E_r) (harmonic well, Jaksch et al. PRL 81, 3108 (1998))
T.near(L.onsite_frequency, 2 * math.sqrt(L.depth_er) * L.recoil / hbar, 1e-9, "on-site frequency")
T.near(L.kt_over_gap, kB * L.temperature / (hbar * L.onsite_frequency), 1e-12, "kB T over the gap")
-- J from the asymptotic deep-lattice form J = (4/sqrt pi) E_r s^(3/4) e^(-2 sqrt s)
-- (Zwerger, J. Opt. B 5, S9 (2003)); a few per cent off at s = 55
local s = L.depth_er
T.near(L.tunnelling, 4 / math.sqrt(pi) * L.recoil * s ^ 0.75 * math.exp(-2 * math.sqrt(s)), 0.1,
  "tunnelling vs the asymptotic formula")
local f = L.filling
T.near(f.empty + f.single + f.multiple, 1, 1e-12, "central probabilities sum to 1")
T.check(f.single > 0 and f.multiple >= 0 and f.multiple < f.single, "a dilute fermionic centre")
T.check(f.sites_single <= f.sites_occupied and f.single_fraction > 0 and f.single_fraction <= 1,
  "site counts are consistent")
T.check(L.bands >= L.bands_needed and L.bands_needed >= 1 and L.band_margin >= cp.thermo.lattice_margin,
  "the band count is chosen and reported")
T.near(L.t_over_tf, rec.t_over_tf, 1e-12, "T/T_F of the lattice record is the stage's")
T.check(L.t_over_tc == nil and L.onsite_interaction == nil and not L.hard_core, "fermions: no U, no T_c")
-- gravity: the Gaussian envelope is softer than its harmonic curvature, so the sag exceeds
-- g / omega^2 at the centre (by hand) and the frequency at the minimum is lower
T.check(L.envelope.held and L.envelope.sag > cp.consts.g / L.envelope.omega[1] ^ 2
  and L.envelope.omega[3] < L.envelope.omega[1], "the envelope sags against gravity")
T.check(L.envelope.depth < L.envelope.depth_no_gravity, "gravity lowers the envelope depth")

-- LATT-1b validity flags reach the budget: a 50 ms ramp stays within first-order loading,
-- a 20 us one does not (its excited fraction passes ~5 %, cp.lattice.loading's range).
local function lattice_flags(record)
  local names = {}
  for _, fl in ipairs(record.flags) do names[#names + 1] = fl.model .. "." .. fl.flag end
  return table.concat(names, ",")
end
T.check(not lattice_flags(rec):find("lattice.loading", 1, true), "a slow ramp raises no loading flag")
local fast = plan("23Na40K", {
    { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
    { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } } },
  200 * u.nK, { wavelength = 1064 * u.nm, power = 0.6, waist = 180 * u.um,
    polarizability_au = 700, ramp_time = 20 * u.us }):run { limiting = false }
T.check(lattice_flags(fast.stages[4]):find("lattice.loading.beyond_first_order", 1, true),
  "a fast ramp's loading flag is in the budget: " .. lattice_flags(fast.stages[4]))

-- LATT-2 bosonic NaRb from 548 nK into a ~620 E_r lattice (on-site gap ~50 E_r): many bands
-- are occupied.  One band must hold all the entropy in the envelope and comes out far
-- hotter (cp.thermo.match_lattice with bands = 1, the model this stage used before); the
-- many-band temperature lies below it and below the lattice depth.
local narb_atoms = {
  { atom = "23Na", number = 3e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
  { atom = "87Rb", number = 3e5, trap_frequencies = { Hz(60), Hz(70), Hz(140) } } }
local deep = { wavelength = 1064 * u.nm, power = 2.7, waist = 150 * u.um, polarizability_au = 700,
  ramp_time = 0.05 }
local narb = plan("23Na87Rb", narb_atoms, 548 * u.nK, deep):run { limiting = false }
local D, before = narb.stages[4].lattice, narb.stages[3]
T.check(D.depth_er > 600 and D.depth_er < 650, "a ~620 E_r lattice")
local mass = cp.species.molecule("23Na87Rb").mass
local function state(temperature, bands)
  return cp.thermo.lattice_state { number = narb.stages[4].number, mass = mass, statistics = "boson",
    temperature = temperature, depth_er = D.depth_er, wavelength = D.wavelength,
    envelope_omega_x = D.envelope.omega[1], envelope_omega_y = D.envelope.omega[2],
    envelope_omega_z = D.envelope.omega[3], bands = bands }
end
-- the recorded state has the entropy the molecules brought (adiabatic loading)
T.near(state(D.temperature).entropy_per_particle, before.entropy_per_particle, 1e-6,
  "the lattice temperature carries the loaded entropy")
T.near(D.entropy_per_particle, before.entropy_per_particle, 1e-12, "entropy field")
T.check(D.bands > 1 and D.kt_over_gap > 0.2, "many bands are occupied and reported")
-- one band at the same entropy, by bisection in ln T here
local lo, hi = math.log(D.temperature), math.log(1e-3)
for _ = 1, 60 do
  local mid = 0.5 * (lo + hi)
  if state(math.exp(mid), 1).entropy_per_particle < D.entropy_per_particle then lo = mid else hi = mid end
end
local t_one = math.exp(0.5 * (lo + hi))
T.check(t_one > 3 * D.temperature, string.format("one band would need %.3g uK, many bands give %.3g uK",
  t_one / u.uK, D.temperature / u.uK))
T.check(D.depth > 10 * kB * D.temperature, "the deep lattice holds the many-band gas")
T.check(not table.concat(narb.stages[4].notes, " "):find("not held", 1, true), "and says nothing else")
T.check(D.hard_core and D.condensed_fraction ~= nil and D.t_over_tc ~= nil, "bosons: hard-core filling, T/T_c")
T.near(D.filling.empty + D.filling.single + D.filling.multiple, 1, 1e-12, "bosonic centre sums to 1")

-- LATT-3 a bosonic scattering length gives U = sqrt(8/pi) k a E_r s^(3/4) (Bloch, Dalibard &
-- Zwerger, RMP 80, 885 (2008)); with U >> kB T the centre's double occupancy stays small.
deep.scattering_length = 100 * 0.529177e-10
local withu = plan("23Na87Rb", narb_atoms, 548 * u.nK, deep):run { limiting = false }.stages[4].lattice
local k = 2 * pi / withu.wavelength
T.near(withu.onsite_interaction, math.sqrt(8 / pi) * k * deep.scattering_length * withu.recoil
  * withu.depth_er ^ 0.75, 1e-12, "U in the harmonic approximation")
T.check(not withu.hard_core and withu.filling.multiple >= D.filling.multiple - 1e-12,
  "a finite U lets more molecules share a site than hard-core")
T.raises(function() cp.stages.load_lattice { wavelength = 1064 * u.nm, power = 1, waist = 1e-4,
  polarizability_au = 700, ramp_time = 0.01, scattering_length = -1 } end,
  { "stages.load_lattice", "scattering_length" }, "negative scattering length")

T.done()
