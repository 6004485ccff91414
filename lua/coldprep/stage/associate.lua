-- coldprep.stage.associate: the associate stage (constructor cp.stages.associate).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local MODEL = require "coldprep.stage.models"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage

-- The resonance a stage names: nil (the first known for the molecule), an index into the
-- molecule's list, or a table {b0, width, abg, dmu} (T, T, m, J/T).
local RESONANCE_KEYS = { "b0", "width", "abg", "dmu", "c6_au", "molecule", "states", "source", "verified" }

-- A resonance table's fields checked where the stage is built (as cp.feshbach reads them).
local function check_resonance_table(spec)
  local where = "stages.associate: argument 'resonance'"
  A.table(where, spec, RESONANCE_KEYS)
  for _, k in ipairs { "b0", "width", "abg", "dmu" } do
    A.number(where, spec, k, ({ b0 = "T", width = "T", abg = "m", dmu = "J/T" })[k])
  end
  A.number(where, spec, "c6_au", "a.u.", { optional = true, positive = true })
end

local function resonance_of(spec, molecule)
  if spec == nil or math.type(spec) == "integer" then
    local ok, r = pcall(cp.species.resonance, molecule, spec or 1)
    if not ok then A.fail("argument 'resonance'", "%s", tostring(r)) end
    return r
  end
  return spec
end

-- The molecules' trap: a weakly bound molecule feels the sum of its atoms' optical
-- potentials, so its spring constants add: w_i^2 = (m_a wa_i^2 + m_b wb_i^2)/(m_a + m_b).
local function molecule_trap(a, b)
  local w = {}
  for i = 1, 3 do
    w[i] = math.sqrt((a.mass * a.trap_frequencies[i] ^ 2 + b.mass * b.trap_frequencies[i] ^ 2)
      / (a.mass + b.mass))
  end
  return w
end

-- cp.stages.associate{ramp_rate (T/s) [, resonance, span (T), max_efficiency, alpha (m^2/s),
--   samples, seed, label]}
local function associate(args)
  local fname = "stages.associate"
  A.table(fname, args, { "resonance", "ramp_rate", "span", "max_efficiency", "alpha", "samples",
    "seed", "label" })
  local p = {
    ramp_rate = A.number(fname, args, "ramp_rate", "T/s", { positive = true, max = 1e9 }),
    span = A.number(fname, args, "span", "T", { optional = true, positive = true, max = 1 }),
    max_efficiency = A.number(fname, args, "max_efficiency", "fraction", { optional = true, positive = true, max = 1 }),
    alpha = A.number(fname, args, "alpha", "m^2/s", { optional = true, positive = true }),
    samples = A.number(fname, args, "samples", "", { optional = true, default = 20000, min = 100, max = 1e7 }),
    seed = A.number(fname, args, "seed", "", { optional = true, default = 1, nonnegative = true }),
  }
  if args.resonance ~= nil and type(args.resonance) ~= "table" and math.type(args.resonance) ~= "integer" then
    A.fail(fname, "argument 'resonance' must be an index or a table {b0, width, abg, dmu}, got %s",
      type(args.resonance))
  end
  if type(args.resonance) == "table" then check_resonance_table(args.resonance) end
  return new_stage("associate", args, {
    accepts = { ["atom-mixture"] = true }, produces = "feshbach-molecules", params = p,
    hint = "magnetoassociation acts on the atom mixture, so it comes first",
    run = function(self, s)
      local mol = s.molecule
      local r = resonance_of(args.resonance, mol.name)
      self.equipment = { { kind = "coil", what = "Feshbach field", field = r.b0 } }
      local ib = S.minority(s.atoms)
      local b, a = s.atoms[ib], s.atoms[3 - ib]
      local notes = {}
      if r.verified == false then
        notes[#notes + 1] = string.format("the %s resonance at %.4g G is built-in data marked "
          .. "unverified (see its source in cp.species.resonance): check b0, width and abg before "
          .. "trusting this stage", mol.name, r.b0 / cp.units.G)
      end
      for _, c in ipairs { a, b } do
        if c.statistics == "fermion" and c.degeneracy < 1 then
          notes[#notes + 1] = string.format("%s is degenerate (T/T_F = %.2g): the molecules take the "
            .. "pairs' temperature and leave out the Fermi motion of its atoms, so they start colder "
            .. "than they would", c.name, c.degeneracy)
        end
        if c.statistics == "boson" and c.degeneracy < 1 then
          -- overlap_density has no profile for a partly condensed cloud without the atoms'
          -- scattering length (not in the species data)
          notes[#notes + 1] = string.format("%s is below T_c (condensed fraction %.2g): the overlap "
            .. "density treats it as a thermal cloud; a condensate is denser and smaller", c.name,
            c.condensed_fraction or 0)
        end
      end
      local ov = MODEL.overlap(a, b)
      local pmax = p.max_efficiency
      if not pmax then
        pmax = MODEL.max_efficiency(a, b, p.samples, p.seed)
        notes[#notes + 1] = string.format("phase-space ceiling of the conversion P_max = %.3g "
          .. "(stochastic phase-space sampling)", pmax)
      end
      local res = cp.feshbach.associate { resonance = r, molecule = mol.name, ramp_rate = p.ramp_rate,
        density = ov.density, max_efficiency = pmax, alpha = p.alpha }
      local eff = res.efficiency
      notes[#notes + 1] = string.format("overlap density %.3g cm^-3 (differential sag %.3g um); "
        .. "Landau-Zener probability %.3g", ov.density / cp.units.per_cm3, ov.sag / cp.units.um,
        eff / pmax)
      local n = eff * b.number
      local out = S.copy(s)
      out.kind, out.name, out.mass, out.statistics = "feshbach-molecules", mol.name, mol.mass, mol.statistics
      out.number = n
      -- the centre-of-mass motion of uncorrelated thermal pairs: T = (m_a T_a + m_b T_b)/M
      out.temperature = (a.mass * a.temperature + b.mass * b.temperature) / (a.mass + b.mass)
      out.trap_frequencies = molecule_trap(a, b)
      for _, c in ipairs(out.atoms) do c.number = c.number - n end
      local span = p.span or math.abs(r.width)
      return out, { duration = span / p.ramp_rate, notes = notes }
    end,
  })
end

return { constructor = associate, help = [[
stages.associate{ramp_rate (T/s) [, resonance, span (T), max_efficiency, alpha (m^2/s),
  samples = 20000, seed = 1, label]} -> stage
Magnetoassociation of the atom mixture into Feshbach molecules (cp.feshbach): the partner
density averaged over the minority cloud (overlap_density, with gravitational sag), the
phase-space ceiling P_max (max_efficiency, stochastic phase-space sampling; or give it),
and the ramp-rate law P = P_max (1 - exp(-alpha n |abg width / ramp_rate|)).  resonance: an
index into cp.species.resonance(molecule, i) (default 1) or a table {b0, width, abg, dmu}.
The ramp lasts span / ramp_rate (span default |width|).  Molecules: T = (m_a T_a + m_b T_b)/M,
trap m w^2 = m_a w_a^2 + m_b w_b^2 per axis.  Example: cp.stages.associate{ramp_rate =
0.5*cp.units.G/cp.units.ms}]] }
