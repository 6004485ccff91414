-- Lua-level tests of cp.species, cp.units and cp.consts through the real coldprep binary.
local T = require "testlib"
local cp = require "coldprep"

-- SPECIES-L1: lookups and name forms; AME2020 mass of 40K (Wang et al., Chinese Phys. C 45,
-- 030003 (2021), mass_1.mas20).
local k = cp.species.atom("40K")
T.check(k.statistics == "fermion", "40K is a fermion (odd neutron number)")
T.near(k.mass_u, 39.963998165, 1e-12, "40K mass, AME2020")
T.check(cp.species.atom("Rb87").name == "87Rb", "Rb87 is accepted for 87Rb")
T.check(cp.species.molecule("KRb").name == "40K87Rb", "KRb resolves to 40K87Rb")
T.near(cp.species.molecule("40K87Rb").mass_u, 126.873178694, 1e-10, "KRb mass = sum of the AME2020 atom masses")
T.check(cp.species.molecule("RbCs").statistics == "boson", "RbCs is a boson (neutrons 50 + 78 = 128, even)")
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
-- The bindings find user-added species by name too (same result as passing the tables).
cp.species.add_resonance { molecule = "40K162Dy", b0 = 0.02, width = 1e-4, abg = 5e-9, dmu = 2e-23 }
local by_name = cp.feshbach.associate { resonance = "40K162Dy", molecule = "40K162Dy",
  ramp_rate = 1e-3 / 1e-3, density = 1e18 }
local by_table = cp.feshbach.associate { resonance = cp.species.resonance("40K162Dy"),
  molecule = cp.species.molecule("40K162Dy"), ramp_rate = 1e-3 / 1e-3, density = 1e18 }
T.near(by_name.efficiency, by_table.efficiency, 1e-15, "feshbach takes a user molecule by name")
local cloud = cp.feshbach.overlap_density { temperature = 1e-6,
  a = { atom = "Dy162", number = 1e4, omega_x = 600, omega_y = 600, omega_z = 600 },
  b = { atom = "40K", number = 1e4, omega_x = 600, omega_y = 600, omega_z = 600 } }
T.check(cloud.density > 0, "feshbach takes a user atom by name")
T.raises(function() cp.feshbach.overlap_density { temperature = 1e-6,
  a = { atom = "Dy163", number = 1e4, omega_x = 600, omega_y = 600, omega_z = 600 },
  b = { atom = "40K", number = 1e4, omega_x = 600, omega_y = 600, omega_z = 600 } } end,
  { "Dy163", "user-added: ", "162Dy" }, "an unknown name lists the user-added species")

-- UNITS-L1: scale factors (SI) and constants (CODATA 2018: E. Tiesinga et al., Rev. Mod. Phys.
-- 93, 025010 (2021)).
T.check(cp.units.G == 1e-4 and cp.units.uK == 1e-6 and cp.units.MHz == 1e6, "unit scale factors")
T.near(cp.units.a0, 5.29177210903e-11, 1e-12, "a0 in m")
T.near(cp.consts.kB, 1.380649e-23, 0, "kB exact")
T.near(cp.consts.hbar * 2 * math.pi, 6.62607015e-34, 1e-15, "hbar = h / 2pi")
T.check(type(cp.version) == "string" and cp.version:match("^%d+%.%d+%.%d+$"), "version string")

-- HELP-L1: public functions carry help texts.
for _, f in ipairs { "atom", "molecule", "resonance", "list", "add_atom", "add_molecule", "add_resonance" } do
  T.check(type(cp.get_help(cp.species[f])) == "string", "help text for species." .. f)
end


-- SPECIES-L4: built-in polarizabilities at the trap wavelengths.  87Rb at 1064 nm is the
-- single-oscillator estimate from the static 47.24e-24 cm^3 of W. F. Holmgren et al., PRA
-- 81, 053607 (2010), arXiv:1001.3888 (abstract): recomputed here from the vacuum D lines
-- 794.979 and 780.241 nm [M] weighted 1:2.
local centroid = 3 / (1 / 794.979 + 2 / 780.241)
local want = 47.24e-24 / 1.481847e-25 / (1 - (centroid / 1064) ^ 2)
T.near(cp.species.polarizability("Rb87", 1064 * cp.units.nm), want, 5e-4, "87Rb alpha(1064 nm)")
T.near(cp.species.atom("87Rb").pol_1064_au, want, 5e-4, "the atom record carries it")
T.check(cp.species.atom("88Sr").pol_1064_au == nil, "no value: nil in the record")
T.raises(function() cp.species.polarizability("NaRb", 1064 * cp.units.nm) end,
  { "no published polarizability of 23Na87Rb", "1064 nm", "polarizability_au" }, "molecule without data")
-- RbCs at 1064 nm: the isotropic alpha^(0) = 2020 a.u. of J. A. Blackmore et al., PRA 102,
-- 053316 (2020), arXiv:2007.01762 (transcribed in a secondary source, not read in the
-- paper); the lookup gives the isotropic part, the record also carries the two components.
T.near(cp.species.polarizability("RbCs", 1064 * cp.units.nm), 2020, 1e-12, "RbCs alpha(1064 nm)")
local rbcs = cp.species.molecule("RbCs")
T.near((rbcs.pol_1064_par_au + 2 * rbcs.pol_1064_perp_au) / 3, 2020, 1e-12, "RbCs components")
T.raises(function() cp.species.polarizability("87Rb", 532 * cp.units.nm) end,
  { "87Rb", "532 nm", "polarizability_au" }, "untabulated wavelength")
T.raises(function() cp.species.polarizability("87Rb", "1064") end, { "wavelength must be a number" }, "wrong type")

-- SPECIES-L5: sources() lists every built-in value with a publication or an [M] mark;
-- KRb's dipole moment is the verified 0.566(17) D of K.-K. Ni et al., Science 322, 231
-- (2008), arXiv:0808.2963 (abstract).
local all = cp.species.sources(nil, true)
T.check(#all > 100, "over a hundred built-in values are listed")
for _, d in ipairs(all) do
  T.check(d.reference ~= nil or (d.note or ""):find("[M]", 1, true) ~= nil,
    d.record .. "." .. d.field .. " has a source or an [M] mark")
  T.check(not d.verified or (d.reference and (d.reference.doi or d.reference.arxiv)) ~= nil,
    d.record .. "." .. d.field .. ": verified values cite a DOI or arXiv id")
end
local krb = cp.species.sources("KRb", true)
local dip
for _, d in ipairs(krb) do if d.field == "dipole_debye" then dip = d end end
T.near(dip.value, 0.566, 1e-12, "KRb d value")
T.check(dip.verified and dip.status == "measured" and dip.reference.arxiv == "0808.2963", "KRb d source")
local has_resonance = false
for _, d in ipairs(krb) do if d.record == "40K87Rb#1" then has_resonance = true end end
T.check(has_resonance, "a molecule's sources include its resonances")
T.raises(function() cp.species.sources("Xx99") end, { "unknown" }, "unknown species")

-- SPECIES-L6: a user-added species carries its own polarizabilities; the isotropic part of
-- a molecule given by components is (alpha_par + 2 alpha_perp) / 3 (definition).
cp.species.add_molecule { name = "40K162Dy", atoms = { "40K", "162Dy" }, dipole_debye = 0.1,
  rot_const_hz = 1e9, c6_au = 5000, pol_1064_par_au = 900, pol_1064_perp_au = 300 }
T.near(cp.species.polarizability("40K162Dy", 1064 * cp.units.nm), 500, 1e-15, "user molecule alpha(1064)")
T.raises(function() cp.species.polarizability("40K162Dy", 1550 * cp.units.nm) end,
  { "species.polarizability: no polarizability of 40K162Dy at 1550 nm", "polarizability_au" }, "user molecule without a 1550 nm value")
T.raises(function() cp.species.add_molecule { name = "X2", atoms = { "40K", "162Dy" }, dipole_debye = 0.1,
  rot_const_hz = 1e9, c6_au = 5000, pol_1064_par_au = 900 } end, { "pol_1064_perp_au" }, "one component only")
T.raises(function() cp.species.add_molecule { name = "X2", atoms = { "40K", "162Dy" }, dipole_debye = 0.1,
  rot_const_hz = 1e9, c6_au = 5000, loss_rate = 1e-17 } end, { "loss_temperature" }, "loss rate without its temperature")
T.raises(function() cp.species.add_atom { name = "X3", mass_u = 3, statistics = "boson", pol_1064_au = -1 } end,
  { "pol_1064_au" }, "negative polarizability rejected")
for _, f in ipairs { "polarizability", "sources" } do
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
-- cp.names.closest suggests only a name within a third of the key's length in edits
-- (rounded up; distances by hand: duraton -> duration 1, widht -> width 2 (a swap),
-- colour -> label 4 > 2)
T.check(cp.names.closest("duraton", { "label", "duration" }) == "duration", "closest: one edit")
T.check(cp.names.closest("widht", { "delay", "width" }) == "width", "closest: a swap")
T.check(cp.names.closest("colour", { "label", "duration" }) == nil, "closest: nothing near")
T.done()
