-- coldprep.stage.load_lattice: the load_lattice stage (constructor cp.stages.load_lattice).
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
-- A lattice shallower than this many kB T does not hold the molecules (common practice,
-- no source: optical traps are made ~10 kB T deep and deeper).
local SHALLOW_LATTICE = 10

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
--   label]}: a cubic lattice of three retro-reflected beams, the molecules' new trap.
local function load_lattice(args)
  local fname = "stages.load_lattice"
  A.table(fname, args, { "wavelength", "power", "waist", "polarizability_au", "ramp_time",
    "ramp_shape", "imag_polarizability_au", "reflectivity", "label" })
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
    reflectivity = A.number(fname, args, "reflectivity", "fraction", { optional = true, default = 1, positive = true, max = 1 }),
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
      notes[#notes + 1] = string.format("depth %.3g E_r (%.3g uK) per axis; envelope %.3g x %.3g x "
        .. "%.3g Hz", lat.depth_er, lat.depth / cp.consts.kB / cp.units.uK, lat.omega[1] / (2 * math.pi),
        lat.omega[2] / (2 * math.pi), lat.omega[3] / (2 * math.pi))
      -- entropy is conserved by the adiabatic part of the loading (cp.thermo.match_lattice)
      local m = MODEL.match_lattice(s, lat)
      local depth_kt = lat.depth / (cp.consts.kB * m.temperature)
      if depth_kt < SHALLOW_LATTICE then
        notes[#notes + 1] = string.format("the lattice is only %.2g kB T deep: molecules are not held "
          .. "in it (the model takes it as infinitely deep and ignores gravity)", depth_kt)
      end
      -- molecules left in excited bands carry the interband energy; once it is shared it
      -- adds dS = dE / (kB T) per particle, to first order in the excited fraction
      local f = lat.excited_fraction
      local ds = f * lat.excitation_energy / (cp.consts.kB * m.temperature)
      if f > EXCITED_WARNING then
        notes[#notes + 1] = string.format("loading ramp not adiabatic: %.3g %% excited (adds %.2g kB "
          .. "per particle)", 100 * f, ds)
      end
      local out = S.copy(s)
      out.trap_frequencies = lat.omega
      out.temperature = S.temperature_for_entropy(out, s.entropy_per_particle + ds)
      out.lattice = { depth_er = lat.depth_er, depth = lat.depth, wavelength = p.wavelength,
        spacing = lat.spacing, temperature = m.temperature, peak_filling = m.peak_filling,
        heating_rate = lat.heating_rate }
      notes[#notes + 1] = string.format("adiabatic loading alone: T = %.3g nK in the lattice, %s; the "
        .. "degeneracy shown is that of the same entropy in the envelope trap (the lattice ramped "
        .. "down adiabatically)",
        m.temperature / cp.units.nK, m.peak_filling and string.format("peak filling %.2g per site",
          m.peak_filling) or string.format("condensed fraction %.2g", m.condensed_fraction or 0))
      if lat.heating_rate > 0 then
        notes[#notes + 1] = string.format("photon scattering: %.3g /s per molecule, heating %.3g nK/s "
          .. "in later holds", lat.scattering_rate, lat.heating_rate / cp.units.nK)
      end
      return out, { duration = p.ramp_time, notes = notes, adiabatic = true }
    end,
  })
end

return { constructor = load_lattice, help = [[
stages.load_lattice{wavelength (m), power (W per beam), waist (m), ramp_time (s)
  [, polarizability_au, ramp_shape = "s-shaped" | "linear", imag_polarizability_au,
  reflectivity = 1, label]} -> stage
polarizability_au defaults, for ground-state molecules, to the built-in value at the
lattice wavelength (cp.species.polarizability); where none is built in the stage asks
for it.
Loading into a cubic lattice of three retro-reflected beams: depth and envelope from
cp.lattice.depth3d, adiabatic loading by entropy matching (cp.thermo.match_lattice), the
fraction left in excited bands by a finite ramp (cp.lattice.loading; it adds its interband
energy as entropy, dS = f dE / kB T), photon-scattering heating (cp.lattice.heating, used by
later holds).  The degeneracy shown afterwards is that of the same entropy in the envelope
trap.  Example: cp.stages.load_lattice{wavelength = 1064e-9, power = 2, waist = 150e-6,
polarizability_au = 700, ramp_time = 0.05}]] }
