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

-- A Bose cloud below T_c: its condensate (the ideal-gas fraction) is a Thomas-Fermi cloud
-- of the atoms' own scattering length (cp.feshbach, Dalfovo et al., RMP 71, 463 (1999)),
-- which must be repulsive; the note gives N0 a / a_ho, which the Thomas-Fermi form needs
-- much larger than 1 (below TF_MIN, common practice, no source, the note says the size is
-- rough).  An attractive or missing scattering length is an error of the plan's input.
local TF_MIN = 5
local function condensate_note(c)
  local a, f = c.scattering_length, c.condensed_fraction
  if not (a and a > 0) then
    A.fail("stages.associate", "%s is below T_c (condensed fraction %.2g) but its scattering "
      .. "length is %s: a condensate needs a repulsive one (an attractive condensate of %.3g "
      .. "atoms collapses); give start.atoms[i].scattering_length (m) for the state and field "
      .. "of the plan", c.name, f, a and string.format("%.4g a0", a / cp.units.a0) or "unknown",
      c.number * f)
  end
  local a_ho = math.sqrt(cp.consts.hbar / (c.mass * c.omega_bar))
  local x = c.number * f * a / a_ho
  local note = string.format("%s is below T_c (condensed fraction %.2g): its condensate is a "
    .. "Thomas-Fermi cloud (a = %.4g a0, N0 a/a_ho = %.3g) inside the saturated thermal part, in "
    .. "the overlap and in the ceiling (which pairs condensed atoms by the local ratio of the "
    .. "condensate densities)", c.name, f, a / cp.units.a0, x)
  if x < TF_MIN then
    note = note .. "; N0 a/a_ho is not >> 1, so the Thomas-Fermi size is rough (the true "
      .. "condensate is larger)"
  end
  return note
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
        if c.statistics == "boson" and (c.condensed_fraction or 0) > 0 then
          notes[#notes + 1] = condensate_note(c)
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
density averaged over the minority cloud (overlap_density, with gravitational sag; a Bose
cloud below T_c has a Thomas-Fermi condensate set by its scattering_length), the
phase-space ceiling P_max (max_efficiency, stochastic phase-space sampling; or give it),
and the ramp-rate law P = P_max (1 - exp(-alpha n |abg width / ramp_rate|)).  resonance: an
index into cp.species.resonance(molecule, i) (default 1) or a table {b0, width, abg, dmu}.
The ramp lasts span / ramp_rate (span default |width|).  Molecules: T = (m_a T_a + m_b T_b)/M,
trap m w^2 = m_a w_a^2 + m_b w_b^2 per axis.  Example: cp.stages.associate{ramp_rate =
0.5*cp.units.G/cp.units.ms}]] }
