-- Invariants of a full plan built from the model stages (association, removal, transfer,
-- trap change, lattice loading, hold, evaporation) for fermionic 23Na40K:
--   every stage keeps a fraction in [0, 1], and the stages given as fractions keep them;
--   entropy per particle never falls in an adiabatic stage;
--   a plan whose numbers all improve never gets a worse verdict;
--   a change of species changes the whole budget consistently.
local T = require "testlib"
local cp = require "coldprep"

local u = cp.units
local pi = math.pi
local function Hz(f) return 2 * pi * f end

-- opts: the knobs a better plan improves
local function nak_plan(o)
  return cp.plan { start = { molecule = o.molecule or "23Na40K", temperature = o.T,
      atoms = { { atom = o.a or "23Na", number = o.Na, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
                { atom = o.b or "40K", number = o.K, trap_frequencies = { Hz(110), Hz(135), Hz(270) } } } },
    stages = {
      cp.stages.associate { ramp_rate = o.ramp },
      cp.stages.remove_atoms { heating_per_atom = o.heat, molecule_loss = o.mloss },
      cp.stages.transfer { round_trip_efficiency = o.rt },
      cp.stages.change_trap { trap_frequencies = { Hz(60), Hz(70), Hz(200) }, ramp_time = 0.05 },
      cp.stages.load_lattice { wavelength = 1064 * u.nm, power = 1.5, waist = 200 * u.um,
        polarizability_au = 700, ramp_time = o.lattice_ramp, imag_polarizability_au = 1e-4 },
      cp.stages.hold { duration = 20 * u.ms, lifetime = o.lifetime, loss_rate = o.beta },
    } }
end

local base_T = 220 * u.nK
local base = { T = base_T, Na = 4e5, K = 1.5e5, ramp = 2 * u.G / u.ms, heat = 5 * u.nK * cp.consts.kB,
  mloss = 0.05, rt = 0.8, lattice_ramp = 20 * u.ms, lifetime = 2, beta = 1e-12 * u.cm3 }
-- Knobs that make a stage strictly better (slower association ramp, less heating and
-- loss, better transfer, slower lattice ramp, longer lifetime, weaker two-body loss).
-- Start temperature and atom numbers are not among them: a denser, colder mixture also
-- leaves more heat at atom removal and loses more in holds.
local better = { T = base_T, Na = 4e5, K = 1.5e5, ramp = 1 * u.G / u.ms, heat = 2 * u.nK * cp.consts.kB,
  mloss = 0.02, rt = 0.9, lattice_ramp = 50 * u.ms, lifetime = 5, beta = 5e-13 * u.cm3 }

local b = nak_plan(base):run()

-- INV-1 no stage makes particles; the removal keeps 1 - molecule_loss of the molecules and
-- a transfer given by its round trip keeps sqrt(round trip) one way (both directions equally
-- efficient, docs/planning.md); the hold keeps what N(t) = N0 / (1 + N0 K' t) with the
-- one-body factor exp(-t/lifetime) allows at most (the one-body part alone, an upper bound).
for i, r in ipairs(b.stages) do
  T.check(r.efficiency >= 0 and r.efficiency <= 1, "stage " .. i .. " keeps a fraction in [0, 1]")
end
local by_kind = {}
for _, r in ipairs(b.stages) do by_kind[r.name] = r end
T.near(by_kind.remove_atoms.efficiency, 1 - base.mloss, 1e-12, "removal keeps 1 - molecule_loss")
T.near(by_kind.transfer.efficiency, math.sqrt(base.rt), 1e-12, "transfer keeps sqrt(round trip)")
T.check(by_kind.hold.efficiency <= math.exp(-20 * u.ms / base.lifetime) * (1 + 1e-12),
  "hold keeps at most the one-body survival exp(-t/lifetime)")

-- INV-2 entropy per particle never falls in an adiabatic stage.
local adiabatic = 0
for i, r in ipairs(b.stages) do
  if r.adiabatic then
    adiabatic = adiabatic + 1
    local before = i == 1 and b.start or b.stages[i - 1]
    T.check(r.entropy_per_particle >= before.entropy_per_particle * (1 - 1e-9),
      string.format("entropy does not fall in adiabatic stage %d (%s): %.6g -> %.6g", i, r.name,
        before.entropy_per_particle, r.entropy_per_particle))
  end
end
T.check(adiabatic == 2, "the trap change and the lattice loading are adiabatic stages")

-- INV-3 all numbers better: never a worse verdict, never a higher final T/T_F.
local g = nak_plan(better):run()
T.check(g.final.degeneracy < b.final.degeneracy, "better plan: lower final T/T_F")
T.check(g.degenerate or not b.degenerate, "better plan: verdict not worse")
-- each knob alone, too
for k, v in pairs(better) do
  local o = {}
  for kk, vv in pairs(base) do o[kk] = vv end
  o[k] = v
  local r = nak_plan(o):run { limiting = false }
  T.check(r.final.degeneracy <= b.final.degeneracy * (1 + 1e-6), "improving " .. k .. " alone does not raise T/T_F")
end

-- INV-4 a species change changes the budget consistently: 40K87Rb is fermionic and
-- reactive, 87Rb133Cs bosonic; the molecule data come from cp.species.
local krb = nak_plan { molecule = "40K87Rb", a = "87Rb", b = "40K", T = 200 * u.nK, Na = 4e5, K = 1.5e5,
  ramp = 2 * u.G / u.ms, heat = 0, mloss = 0, rt = 0.8, lattice_ramp = 20 * u.ms, lifetime = 2 }:run()
T.check(krb.species == "40K87Rb" and krb.final.degeneracy_name == "T/T_F", "KRb is fermionic")
local hold_note = table.concat(krb.stages[6].notes, " ")
T.check(hold_note:find("universal p-wave", 1, true) ~= nil, "KRb hold uses the universal p-wave rate")
T.check(hold_note:find("1.613e+04", 1, true) ~= nil, "with KRb's C6 from the species table")
-- bosonic 87Rb133Cs (50 + 78 neutrons: even, docs/data.md): T/T_c, universal s-wave loss
local rbcs = nak_plan { molecule = "87Rb133Cs", a = "87Rb", b = "133Cs", T = 200 * u.nK, Na = 4e5, K = 1.5e5,
  ramp = 2 * u.G / u.ms, heat = 0, mloss = 0, rt = 0.8, lattice_ramp = 20 * u.ms, lifetime = 2 }:run { limiting = false }
T.check(rbcs.final.degeneracy_name == "T/T_c" and rbcs.final.t_over_tc ~= nil and rbcs.final.t_over_tf == nil,
  "RbCs is bosonic: T/T_c")
T.check(table.concat(rbcs.stages[6].notes, " "):find("universal s-wave", 1, true) ~= nil,
  "RbCs hold uses the universal s-wave rate")

T.done()
