-- Lua-level tests of cp.thermo through the real coldprep binary: the docs/lua-api.md names and
-- units, the relations checked against outside references, and the error messages.
local T = require "testlib"
local cp = require "coldprep"

local m = 127 * cp.units.amu
local w = 2 * math.pi * 100
local hbar, kB = cp.consts.hbar, cp.consts.kB

-- THERMO-L1: fermi from (N, T) and from (N, T/T_F) (docs/lua-api.md); T_F = hbar w (6N)^(1/3)/kB
-- (Butts & Rokhsar, PRA 55, 4346 (1997) [M]); Sommerfeld S/N = pi^2 T/T_F at 0.05
-- (docs/models/thermo.md; next term O((T/T_F)^3)).
local f = cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, t_over_tf = 0.05 }
T.near(f.fermi_temperature, hbar * w * (6e5) ^ (1 / 3) / kB, 1e-14, "T_F")
T.near(f.entropy_per_particle, math.pi ^ 2 * 0.05, 1e-2, "Sommerfeld entropy")
for _, k in ipairs { "fermi_temperature", "t_over_tf", "fugacity", "chemical_potential",
  "energy_per_particle", "entropy_per_particle", "peak_density" } do
  T.check(type(f[k]) == "number", "fermi returns " .. k)
end
local g = cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, temperature = f.temperature }
T.near(g.t_over_tf, 0.05, 1e-12, "fermi(T) inverts fermi(T/T_F)")
local aniso = cp.thermo.fermi { number = 1e5, omega_x = w / 2, omega_y = w, omega_z = 2 * w,
  mass = m, temperature = f.temperature }
T.near(aniso.t_over_tf, 0.05, 1e-12, "three frequencies with the same omega_bar")

-- THERMO-L2: bose: T_c = zeta(3)^(-1/3) hbar w N^(1/3)/kB = 0.9405 ... (Dalfovo et al.,
-- RMP 71, 463 (1999)); below T_c the thermal PSD is zeta(3/2) = 2.612375348685488.
local b = cp.thermo.bose { number = 1e5, omega_bar = w, mass = m, t_over_tc = 0.5 }
T.near(b.critical_temperature, 0.9404989702570405 * hbar * w * (1e5) ^ (1 / 3) / kB, 1e-13, "T_c")
T.near(b.condensed_fraction, 0.875, 1e-14, "N0/N = 1 - (T/T_c)^3")
T.near(b.phase_space_density, 2.612375348685488, 1e-14, "thermal PSD below T_c = zeta(3/2)")
local b2 = cp.thermo.bose { number = 1e5, omega_bar = w, mass = m, temperature = 3 * b.critical_temperature }
T.check(b2.condensed_fraction == 0 and b2.fugacity < 1, "above T_c: no condensate, z < 1")

-- THERMO-L3: inverse from the entropy round-trips (1e-10, the accuracy asked of them).
for _, stat in ipairs { "fermion", "boson" } do
  local s = stat == "fermion" and f.entropy_per_particle or b.entropy_per_particle
  local t0 = stat == "fermion" and f.temperature or b.temperature
  local r = cp.thermo.temperature_from_entropy { number = 1e5, omega_bar = w, mass = m,
    statistics = stat, entropy_per_particle = s }
  T.near(r.temperature, t0, 1e-10, "temperature_from_entropy round trip, " .. stat)
end

-- THERMO-L4: harmonic -> harmonic matching scales T with omega_bar (by hand, docs/models/thermo.md).
local mh = cp.thermo.match_harmonic { number = 1e5, omega_bar = w, mass = m, statistics = "fermion",
  temperature = f.temperature, omega_bar_to = 2 * w }
T.near(mh.temperature, 2 * f.temperature, 1e-10, "match_harmonic doubles T with omega")

-- THERMO-L5: density at the centre = peak density; TOF of a classical cloud
-- sigma = sqrt(kB T/(m w^2)) sqrt(1 + w^2 t^2) (equipartition, ballistic expansion).
local d = cp.thermo.density { number = 1e5, omega_bar = w, mass = m, statistics = "fermion",
  temperature = f.temperature }
T.near(d.density, f.peak_density, 1e-13, "density at the centre")
local hot = cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, t_over_tf = 30 }
local tof = cp.thermo.tof { number = 1e5, omega_bar = w, mass = m, statistics = "fermion",
  temperature = hot.temperature, time = 5e-3 }
local s0 = math.sqrt(kB * hot.temperature / (m * w * w))
T.near(tof.sigma_tof[3], s0 * math.sqrt(1 + (w * 5e-3) ^ 2), 1e-4, "classical TOF size")
T.check(tof.condensate_sigma_tof == nil, "no condensate size for fermions")

-- THERMO-L6: lattice matching through the binding (band structure from the lattice
-- solver): the entropy is conserved and the fermion filling is a probability; the
-- physics is checked against exact limits in the unit tests (THERMO-11..13).
local ml = cp.thermo.match_lattice { number = 2e4, omega_bar = w, mass = m, statistics = "fermion",
  temperature = 0.3 * cp.thermo.fermi { number = 2e4, omega_bar = w, mass = m, temperature = 1e-7 }.fermi_temperature,
  depth_er = 10, wavelength = 1064e-9, envelope_omega_bar = w }
local before = cp.thermo.fermi { number = 2e4, omega_bar = w, mass = m, t_over_tf = 0.3 }
T.near(ml.entropy_per_particle, before.entropy_per_particle, 1e-9, "match_lattice conserves S/N")
-- Pauli: at most one fermion per band combination, bands^3 per site (by hand)
T.check(ml.peak_filling > 0 and ml.peak_filling <= ml.bands ^ 3, "fermion filling per site in (0, bands^3]")
T.check(ml.band_margin >= cp.thermo.lattice_margin and ml.bands_needed <= ml.bands,
  "the automatic band choice leaves the first omitted band 20 kB T up")
local one = cp.thermo.match_lattice { number = 2e4, omega_bar = w, mass = m, statistics = "fermion",
  temperature = ml.temperature, depth_er = 10, wavelength = 1064e-9, envelope_omega_bar = w, bands = 1 }
T.check(one.bands == 1 and one.peak_filling > 0 and one.peak_filling <= 1, "one band: filling in (0, 1]")
-- filling through the binding: probabilities sum to 1, at most one fermion per orbital
local fl = cp.thermo.lattice_filling { number = 2e4, mass = m, statistics = "fermion",
  temperature = ml.temperature, depth_er = 10, wavelength = 1064e-9, envelope_omega_bar = w }
T.near(fl.center_empty + fl.center_single + fl.center_multiple, 1, 1e-12, "filling: probabilities")
T.check(fl.bands >= 1 and fl.center_filling <= fl.bands ^ 3 and fl.sites_single <= fl.sites_occupied,
  "filling: counts consistent")
local st = cp.thermo.lattice_state { number = 2e4, mass = m, statistics = "boson", temperature = 20e-9,
  depth_er = { 5, 5, 10 }, wavelength = 1064e-9, envelope_omega_bar = w, bands = 2 }
T.check(st.condensed_fraction >= 0 and st.condensed_fraction < 1, "lattice_state boson fraction")

-- THERMO-L7: errors: unknown key with suggestion, missing argument, wrong type, NaN,
-- ranges from the core, conflicting arguments.
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, temprature = 1e-7 } end,
  { "unknown argument 'temprature'", "did you mean 'temperature'" }, "unknown key")
-- a key near none of the known ones (more than a third of its length in edits: names.h)
-- gets the list of known keys, not a far-off suggestion
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, colour = 1 } end,
  { "unknown argument 'colour' (known: ", "temperature" }, "unknown key near none")
T.check(not select(2, pcall(cp.thermo.fermi, { number = 1e5, omega_bar = w, mass = m, colour = 1 }))
  :find("did you mean", 1, true), "unknown key near none: no suggestion")
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m } end,
  { "exactly one of 'temperature'" }, "neither T nor T/T_F")
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, temperature = 1e-7, t_over_tf = 0.2 } end,
  { "exactly one" }, "both T and T/T_F")
T.raises(function() cp.thermo.bose { number = 1e5, mass = m, temperature = 1e-7 } end,
  { "omega_bar" }, "missing trap frequency")
T.raises(function() cp.thermo.bose { number = 1e5, omega_bar = w, omega_x = w, mass = m, temperature = 1e-7 } end,
  { "not both" }, "omega_bar and omega_x together")
T.raises(function() cp.thermo.bose { number = "many", omega_bar = w, mass = m, temperature = 1e-7 } end,
  { "'number' must be a number" }, "wrong type")
T.raises(function() cp.thermo.bose { number = 0 / 0, omega_bar = w, mass = m, temperature = 1e-7 } end,
  { "finite" }, "NaN")
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = -w, mass = m, temperature = 1e-7 } end,
  { "omega_bar", "out of range", "rad/s" }, "negative frequency (named as given)")
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = w, mass = m, t_over_tf = 1e-4 } end,
  { "T/T_F", "out of range" }, "T/T_F too small")
T.raises(function() cp.thermo.temperature_from_entropy { number = 1e5, omega_bar = w, mass = m, statistics = "anyon", entropy_per_particle = 1 } end,
  { "statistics \"anyon\" is not allowed", "allowed" }, "bad statistics")
T.raises(function() cp.thermo.tof { number = 1e5, omega_bar = w, mass = m, statistics = "boson", temperature = 1e-7, time = -1 } end,
  { "time", "out of range" }, "negative time of flight")
T.raises(function() cp.thermo.match_lattice { number = 2e4, omega_bar = w, mass = m, statistics = "fermion",
  temperature = 1e-7, depth_er = -3, wavelength = 1064e-9, envelope_omega_bar = w } end,
  { "depth_er", "out of range" }, "negative lattice depth")
T.raises(function() cp.thermo.lattice_state { number = 2e4, mass = m, statistics = "fermion",
  temperature = 1e-7, depth_er = { 1, 2 }, wavelength = 1064e-9, envelope_omega_bar = w } end,
  { "depth_er" }, "depth_er with two values")
T.raises(function() cp.thermo.lattice_state { number = 2e4, mass = m, statistics = "fermion",
  temperature = 1e-7, depth_er = 10, wavelength = 1064e-9, envelope_omega_bar = w, bands = 33 } end,
  { "bands", "33", "[1, 32]" }, "more bands than the model keeps")
T.raises(function() cp.thermo.lattice_filling { number = 2e4, mass = m, statistics = "boson",
  temperature = 1e-7, depth_er = 40, wavelength = 1064e-9, envelope_omega_bar = w, onsite_u = 0 } end,
  { "onsite_u", "0 J", "not positive" }, "ideal bosons have no atomic-limit filling")
T.raises(function() cp.thermo.lattice_filling { number = 2e4, mass = m, statistics = "fermion",
  temperature = 1e-7, depth_er = 40, wavelength = 1064e-9, envelope_omega_bar = w, onsit_u = 1 } end,
  { "unknown argument 'onsit_u'", "onsite_u" }, "filling: unknown key")
T.raises(function() cp.thermo.fermi(5) end, { "expects one table" }, "not a table")
T.raises(function() cp.thermo.fermi { number = 1e5, omega_bar = 0, mass = m, temperature = 1e-7 } end,
  { "omega_bar", "out of range", "rad/s" }, "zero omega_bar is named as given")
T.raises(function() cp.thermo.match_harmonic { number = 1e5, omega_bar = w, mass = m, statistics = "fermion",
  temperature = 1e-7, omega_bar_to = -1 } end, { "omega_bar_to", "out of range" }, "negative omega_bar_to")

-- HELP-L: every public function has a help text.
for k, fn in pairs(cp.thermo) do
  if type(fn) == "function" then
    local h = cp.get_help(fn)
    T.check(type(h) == "string" and h:find("Example", 1, true) ~= nil, "help text for thermo." .. k)
  end
end

-- A fraction of molecules alone on their site never exceeds 1: this dilute Fermi gas in a
-- very weak envelope gave 1.0000000000000033 (the number solve's rounding), found by the fuzzer.
local dilute = cp.thermo.lattice_filling { depth_er = 40, envelope_omega_bar = 0.5, mass = 2.1e-25,
  number = 20000, statistics = "fermion", temperature = 5e-8, wavelength = 1.064e-6 }
T.check(dilute.single_fraction <= 1 and dilute.single_fraction > 0.999, "single_fraction in (0.999, 1]")
-- A cloud squeezed onto a few sites (envelope 1e6 rad/s) fills every orbital there: 32
-- bands per axis give 32^3 = 32768 orbitals, all full at the centre (counted by hand:
-- the atomic limit holds one fermion per orbital).  It cost 2.4 s of CPU when every site
-- summed all 32768 orbitals; the full ones now enter through prefix sums.
local clock = os.clock()
local squeezed = cp.thermo.lattice_filling { number = 2e4, mass = 2.1e-25, statistics = "fermion",
  temperature = 50e-9, depth_er = 40, wavelength = 1064e-9, envelope_omega_bar = 1e6 }
local used = os.clock() - clock
T.check(squeezed.bands == 32 and squeezed.center_filling == 32 ^ 3, "every orbital of the centre full")
T.check(squeezed.sites_occupied > 2e4 / 32 ^ 3 and squeezed.sites_occupied < 1,
  "2e4 fermions on less than one site's worth of orbitals, more than 2e4/32^3 sites")
T.check(used < 1, string.format("squeezed lattice filling in %.2f s of CPU (< 1 s)", used))
T.done()
