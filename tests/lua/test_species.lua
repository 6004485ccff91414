-- Lua-level tests of cp.species, cp.units and cp.consts through the real coldprep binary.
local T = require "testlib"
local cp = require "coldprep"

-- SPECIES-L1: lookups and name forms; AME2020 mass of 40K (physics.md §2).
local k = cp.species.atom("40K")
T.check(k.statistics == "fermion", "40K is a fermion (odd neutron number)")
T.near(k.mass_u, 39.963998165, 1e-12, "40K mass, AME2020")
T.check(cp.species.atom("Rb87").name == "87Rb", "Rb87 is accepted for 87Rb")
T.check(cp.species.molecule("KRb").name == "40K87Rb", "KRb resolves to 40K87Rb")
T.near(cp.species.molecule("40K87Rb").mass_u, 126.873178694, 1e-10, "KRb mass = sum of atoms (physics.md §2)")
T.check(cp.species.molecule("RbCs").statistics == "boson", "RbCs is a boson (physics.md §3)")
T.check(#cp.species.list() >= 22, "list has the 14 atoms and 8 molecules")

-- SPECIES-L2: unknown names suggest known ones, and are catchable.
T.raises(function() cp.species.atom("Xx99") end, { "unknown atom", "closest known names" }, "unknown atom")
T.raises(function() cp.species.atom("Rb88") end, { "87Rb" }, "near miss suggests 87Rb")
T.raises(function() cp.species.molecule(42) end, { "expects a species name" }, "wrong type")
T.raises(function() cp.species.resonance("KRb", 9) end, { "out of range" }, "resonance index")

-- SPECIES-L3: user-added species and resonances.
cp.species.add_atom { name = "162Dy", mass_u = 161.9268056, statistics = "boson", source = "test" }
T.check(cp.species.atom("Dy162").name == "162Dy", "user atom found by either name form")
local m = cp.species.add_molecule { name = "40K162Dy", atoms = { "40K", "162Dy" },
  dipole_debye = 0.1, rot_const_hz = 1e9, c6_au = 5000 }
T.check(m.statistics == "fermion", "user molecule statistics from its atoms")
T.raises(function() cp.species.add_atom { name = "X", mass_u = -1, statistics = "boson" } end,
  { "mass_u", "out of range" }, "negative mass rejected")
T.raises(function() cp.species.add_atom { name = "X", mass_u = 1, statistics = "boson", colour = 1 } end,
  { "unknown argument 'colour'" }, "unknown key rejected")
cp.species.add_resonance { molecule = "KRb", b0 = 0.05, width = -3e-4, abg = -1e-8, dmu = 2e-23 }
T.check(cp.species.resonance("KRb", 2).b0 == 0.05, "user resonance appended after the built-in one")

-- UNITS-L1: scale factors (SI) and constants (CODATA 2018, physics.md §1).
T.check(cp.units.G == 1e-4 and cp.units.uK == 1e-6 and cp.units.MHz == 1e6, "unit scale factors")
T.near(cp.units.a0, 5.29177210903e-11, 1e-12, "a0 in m")
T.near(cp.consts.kB, 1.380649e-23, 0, "kB exact")
T.near(cp.consts.hbar * 2 * math.pi, 6.62607015e-34, 1e-15, "hbar = h / 2pi")
T.check(type(cp.version) == "string" and cp.version:match("^%d+%.%d+%.%d+$"), "version string")

-- HELP-L1: public functions carry help texts.
for _, f in ipairs { "atom", "molecule", "resonance", "list", "add_atom", "add_molecule", "add_resonance" } do
  T.check(type(cp.get_help(cp.species[f])) == "string", "help text for species." .. f)
end

-- SPECIES-L7: the atoms' own scattering length, with its state and paper (Kitagawa et al.,
-- PRA 77, 012719 (2008): 174Yb 5.55(8) nm); a user atom may carry one.
local yb = cp.species.atom("174Yb")
T.near(yb.a_bb, 5.55e-9, 1e-12, "174Yb a_bb (Kitagawa et al. 2008)")
T.check(yb.a_bb_source:find("Kitagawa", 1, true) ~= nil, "a_bb_source names the paper")
for _, name in ipairs { "6Li", "7Li", "23Na", "39K", "40K", "41K", "85Rb", "87Rb", "133Cs", "84Sr",
  "87Sr", "88Sr", "173Yb", "174Yb" } do
  local a = cp.species.atom(name)
  T.check(type(a.a_bb) == "number" and a.a_bb ~= 0 and type(a.a_bb_source) == "string",
    name .. " has a_bb and its source")
end
local dy = cp.species.add_atom { name = "164Dy", mass_u = 163.929, statistics = "boson",
  a_bb = 92 * cp.units.a0, a_bb_source = "test" }
T.near(cp.species.atom("164Dy").a_bb, 92 * cp.units.a0, 1e-15, "user atom keeps a_bb")
T.check(dy.a_bb_source == "test", "user atom keeps a_bb_source")
T.raises(function() cp.species.add_atom { name = "X", mass_u = 1, statistics = "boson", a_bb = 1 } end,
  { "species.add_atom", "a_bb", "out of range" }, "an absurd a_bb")
T.done()
