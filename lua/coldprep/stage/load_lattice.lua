-- coldprep.stage.load_lattice: the load_lattice stage (constructor cp.stages.load_lattice).
-- The stage record carries the lattice state as fields (record.lattice, see the help text);
-- the notes say the same in words.
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local MODEL = require "coldprep.stage.models"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage
local MOLECULES = common.MOLECULES

-- Excited fraction above which the budget warns that loading was not adiabatic
-- (common practice, no source).
local EXCITED_WARNING = 0.01
-- A trap shallower than this many kB T does not hold the molecules (common practice,
-- no source: optical traps are made ~10 kB T deep and deeper).
local SHALLOW = 10
-- The atomic limit behind the filling statistics needs J << kB T; above this ratio the
-- note says it does not hold (common practice, no source).
local ATOMIC_LIMIT = 0.1

-- Bose-Hubbard U of the lowest band in the harmonic approximation of the wells,
-- U = sqrt(8/pi) k a E_r (V0/E_r)^(3/4) (Bloch, Dalibard & Zwerger, RMP 80, 885 (2008),
-- the harmonic-oscillator Wannier function in g int |w|^4).
local function onsite_u(lat, a)
  local k = 2 * math.pi / lat.wavelength
  return math.sqrt(8 / math.pi) * k * a * lat.recoil * lat.depth_er ^ 0.75
end

local function add(notes, fmt, ...)
  notes[#notes + 1] = string.format(fmt, ...)
end

-- Notes on the lattice and its envelope against gravity (kB T from the matched state m).
local function trap_notes(lat, m, notes)
  local kB, uK, g = cp.consts.kB, cp.units.uK, lat.gravity
  local hz = function(w) return w / (2 * math.pi) end
  add(notes, "depth %.3g E_r (%.3g uK) per axis; on-site frequency %.3g kHz, J/h = %.3g Hz; "
    .. "envelope %.3g x %.3g x %.3g Hz", lat.depth_er, lat.depth / kB / uK,
    hz(lat.omega_site) / 1e3, lat.tunnelling / cp.consts.h, hz(lat.omega[1]), hz(lat.omega[2]),
    hz(lat.omega[3]))
  if g.held then
    add(notes, "against gravity the envelope sags %.3g um and is %.3g uK deep (%.3g uK without "
      .. "gravity)", g.sag / cp.units.um, g.depth / kB / uK, g.depth_no_gravity / kB / uK)
  else
    add(notes, "the lattice beams do not hold the molecules against gravity: their envelope's "
      .. "largest force is m x %.3g m/s^2 < m g; the thermodynamics below uses the harmonic "
      .. "envelope as if held", g.max_gravity)
  end
  local kt = kB * m.temperature
  local depth = g.held and g.depth or 0
  if depth < SHALLOW * kt then
    add(notes, "the envelope is only %.2g kB T deep against gravity: molecules are not held",
      depth / kt)
  end
  if lat.depth < SHALLOW * kt then
    add(notes, "the lattice wells are only %.2g kB T deep: many molecules move above the wells, "
      .. "held by the envelope alone", lat.depth / kt)
  end
  if m.band_margin < cp.thermo.lattice_margin then
    add(notes, "the %d bands per axis the model keeps end %.2g kB T above the lowest state "
      .. "(wanted %g): the gas is hotter than the band model covers", m.bands, m.band_margin,
      cp.thermo.lattice_margin)
  end
end

-- Site filling at the matched state m (cp.thermo.lattice_filling), or nil with a note.
local function filling(s, lat, m, u, notes)
  local ok, fill = pcall(MODEL.lattice_filling, s, lat, m.temperature, m.bands, u)
  if not ok then
    add(notes, "no filling statistics: %s", tostring(fill))
    return nil
  end
  if s.statistics == "boson" and not u then
    add(notes, "bosonic filling in the hard-core limit (no scattering_length given)")
  end
  if lat.tunnelling > ATOMIC_LIMIT * cp.consts.kB * m.temperature then
    add(notes, "J = %.2g kB T: the filling statistics (atomic limit, J << kB T) are rough here",
      lat.tunnelling / (cp.consts.kB * m.temperature))
  end
  return { empty = fill.center_empty, single = fill.center_single,
    multiple = fill.center_multiple, mean = fill.center_filling,
    sites_occupied = fill.sites_occupied, sites_single = fill.sites_single,
    sites_multiple = fill.sites_multiple, single_fraction = fill.single_fraction }
end

-- The molecules' polarizability at the lattice wavelength: the one given, else for
-- ground-state molecules the built-in value (cp.species.polarizability); the error asks
-- for polarizability_au where there is none.
local function polarizability(fname, p, s)
  if p.polarizability_au then return p.polarizability_au, nil end
  if s.kind ~= "ground-state-molecules" then
    A.fail(fname, "%s", string.format("argument 'polarizability_au' is needed for %s (%s): built-in "
      .. "polarizabilities are those of ground-state molecules", s.species, s.kind))
  end
  local ok, r = pcall(cp.species.polarizability, s.species, p.wavelength)
  if not ok then A.fail(fname, "%s", (tostring(r):gsub("^species polarizability: ", ""))) end
  return r, string.format("polarizability %.4g a.u. of %s at %.6g nm from the built-in data "
    .. "(cp.species.sources(%q) gives its source and status)", r, s.species,
    p.wavelength / cp.units.nm, s.species)
end

-- cp.stages.load_lattice{wavelength (m), power (W per beam), waist (m), ramp_time (s)
--   [, polarizability_au, ramp_shape = "s-shaped", imag_polarizability_au, reflectivity = 1,
--   scattering_length (m), label]}: a cubic lattice of three retro-reflected beams, the
--   molecules' new trap.
local function load_lattice(args)
  local fname = "stages.load_lattice"
  A.table(fname, args, { "wavelength", "power", "waist", "polarizability_au", "ramp_time",
    "ramp_shape", "imag_polarizability_au", "reflectivity", "scattering_length", "label" })
  local p = {
    wavelength = A.number(fname, args, "wavelength", "m", { positive = true }),
    power = A.number(fname, args, "power", "W", { positive = true }),
    waist = A.number(fname, args, "waist", "m", { positive = true }),
    polarizability_au = A.number(fname, args, "polarizability_au", "a.u.",
      { optional = true, positive = true }),
    ramp_time = A.number(fname, args, "ramp_time", "s", { positive = true, max = 1e4 }),
    ramp_shape = A.option(fname, args, "ramp_shape", { "linear", "s-shaped" }, "s-shaped"),
    imag_polarizability_au = A.number(fname, args, "imag_polarizability_au", "a.u.",
      { optional = true, default = 0, nonnegative = true }),
    reflectivity = A.number(fname, args, "reflectivity", "fraction",
      { optional = true, default = 1, positive = true, max = 1 }),
    scattering_length = A.number(fname, args, "scattering_length", "m",
      { optional = true, positive = true, max = 1e-6 }),
  }
  return new_stage("load_lattice", args, {
    accepts = MOLECULES, adiabatic = true, params = p,
    equipment = { { kind = "laser", what = "lattice beams (each of three)", power = p.power,
      wavelength = p.wavelength } },
    hint = "the lattice holds molecules; associate first",
    run = function(_, s)
      local notes = {}
      local alpha, alpha_note = polarizability(fname, p, s)
      notes[#notes + 1] = alpha_note
      local lat = MODEL.lattice(s, setmetatable({ polarizability_au = alpha }, { __index = p }))
      -- entropy is conserved by the adiabatic part of the loading (cp.thermo.match_lattice)
      local m = MODEL.match_lattice(s, lat)
      trap_notes(lat, m, notes)
      -- molecules left in excited bands carry the interband energy; once it is shared it
      -- adds dS = dE / (kB T) per particle, to first order in the excited fraction
      local kt = cp.consts.kB * m.temperature
      local f = lat.excited_fraction
      local ds = f * lat.excitation_energy / kt
      if f > EXCITED_WARNING then
        add(notes, "loading ramp not adiabatic: %.3g %% excited (adds %.2g kB per particle)",
          100 * f, ds)
      end
      local boson = s.statistics == "boson"
      local u = boson and p.scattering_length and onsite_u(lat, p.scattering_length) or nil
      local fill = filling(s, lat, m, u, notes)
      local out = S.copy(s)
      out.trap_frequencies = lat.omega
      out.temperature = S.temperature_for_entropy(out, s.entropy_per_particle + ds)
      local after = S.copy(out)
      S.derive(after)
      local g = lat.gravity
      local state = { depth_er = lat.depth_er, depth = lat.depth, wavelength = p.wavelength,
        spacing = lat.spacing, recoil = lat.recoil, tunnelling = lat.tunnelling,
        onsite_frequency = lat.omega_site, onsite_interaction = u, hard_core = boson and not u,
        temperature = m.temperature, kt_over_gap = kt / (cp.consts.hbar * lat.omega_site),
        entropy_per_particle = s.entropy_per_particle, entropy_added = ds,
        bands = m.bands, bands_needed = m.bands_needed, band_margin = m.band_margin,
        peak_filling = m.peak_filling, condensed_fraction = m.condensed_fraction,
        filling = fill, t_over_tf = after.t_over_tf, t_over_tc = after.t_over_tc,
        excited_fraction = f, heating_rate = lat.heating_rate,
        scattering_rate = lat.scattering_rate,
        envelope = { omega = { lat.omega[1], lat.omega[2], lat.omega[3] }, held = g.held,
          sag = g.sag, depth = g.depth, depth_no_gravity = g.depth_no_gravity } }
      out.lattice = state
      add(notes, "adiabatic loading alone: T = %.3g nK in the lattice (kB T = %.2g of the on-site "
        .. "gap; %d bands per axis)%s; the degeneracy shown is that of the same entropy in the "
        .. "envelope trap (the lattice ramped down adiabatically)", m.temperature / cp.units.nK,
        state.kt_over_gap, m.bands, fill and string.format("; central site empty %.2g, single "
        .. "%.2g, 2+ %.2g; %.3g %% of the molecules alone on their site", fill.empty, fill.single,
        fill.multiple, 100 * fill.single_fraction) or "")
      if lat.heating_rate > 0 then
        add(notes, "photon scattering: %.3g /s per molecule, heating %.3g nK/s in later holds",
          lat.scattering_rate, lat.heating_rate / cp.units.nK)
      end
      -- the loading and heating models' validity flags (first-order excitation beyond ~5 %,
      -- heating estimates in lattices shallower than ~3 E_r) go into the budget
      local flags = {}
      for _, f in ipairs(lat.loading_flags) do
        common.flag(flags, notes, "lattice.loading", f, string.format("%.3g %% excited: the "
          .. "first-order loading estimate is beyond its range", 100 * lat.excited_fraction))
      end
      for _, f in ipairs(lat.heating_flags) do
        common.flag(flags, notes, "lattice.heating", f, string.format("a %.3g E_r lattice: the "
          .. "Lamb-Dicke heating estimate is beyond its range", lat.depth_er))
      end
      return out, { duration = p.ramp_time, notes = notes, adiabatic = true, lattice = state,
        flags = flags }
    end,
  })
end

return { constructor = load_lattice, help = [[
stages.load_lattice{wavelength (m), power (W per beam), waist (m), ramp_time (s)
  [, polarizability_au, ramp_shape = "s-shaped" | "linear", imag_polarizability_au,
  reflectivity = 1, scattering_length (m, bosons), label]} -> stage
polarizability_au defaults, for ground-state molecules, to the built-in value at the
lattice wavelength (cp.species.polarizability); where none is built in the stage asks
for it.
Loading into a cubic lattice of three retro-reflected beams: depth and envelope from
cp.lattice.depth3d, with the envelope against gravity along z (its frequency at the sagged
minimum, its depth against escape downwards); adiabatic loading by entropy matching with as
many bands as kB T needs (cp.thermo.match_lattice); site filling in the atomic limit
(cp.thermo.lattice_filling; bosons hard-core unless scattering_length gives U); the
fraction left in excited bands by a finite ramp (cp.lattice.loading; it adds its interband
energy as entropy, dS = f dE / kB T), photon-scattering heating (cp.lattice.heating, used by
later holds).  The degeneracy shown afterwards is that of the same entropy in the envelope
trap.  The budget's stage record has record.lattice = {depth_er, depth (J), wavelength,
spacing (m), recoil (J), tunnelling (J), onsite_frequency (rad/s), onsite_interaction (J or
nil), hard_core, temperature (K), kt_over_gap, entropy_per_particle (kB), entropy_added,
bands, bands_needed, band_margin, peak_filling | condensed_fraction, filling = {empty,
single, multiple, mean (central site), sites_occupied, sites_single, sites_multiple,
single_fraction}, t_over_tf | t_over_tc, excited_fraction, heating_rate (K/s),
scattering_rate (1/s), envelope = {omega, held, sag (m), depth (J), depth_no_gravity (J)}}.
Example: cp.stages.load_lattice{wavelength = 1064e-9, power = 2, waist = 150e-6,
polarizability_au = 700, ramp_time = 0.05}]] }
