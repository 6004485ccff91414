-- coldprep.stage.evaporate: the evaporate stage (constructor cp.stages.evaporate).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local MODEL = require "coldprep.stage.models"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage
local loss_rate = common.loss_rate
local leftover_note = common.leftover_note
local thermal_note = common.thermal_note
local LONG_EVAPORATION = common.LONG_EVAPORATION

-- The largest elastic-to-loss ratio cp.collisions.evaporation accepts.
local NO_LOSS_RATIO = 1e12

-- cp.stages.evaporate{eta, final_number | keep | final_temperature (K) | final_depth (J) |
--   duration (s), electric_field (V/m) | microwave | confinement | cross_section (m^2) |
--   ratio [, kappa, loss_rate, label]}
local function evaporate(args)
  local fname = "stages.evaporate"
  A.table(fname, args, { "eta", "final_number", "keep", "final_temperature", "final_depth",
    "duration", "electric_field", "rotational_j", "microwave", "confinement", "cross_section", "ratio", "kappa",
    "loss_rate", "label" })
  local p = {
    eta = A.number(fname, args, "eta", "U/kB T", { min = 5, max = 30 }),
    final_number = A.number(fname, args, "final_number", "particles", { optional = true, min = 1 }),
    keep = A.number(fname, args, "keep", "fraction", { optional = true, positive = true, max = 1 }),
    final_temperature = A.number(fname, args, "final_temperature", "K", { optional = true, positive = true }),
    final_depth = A.number(fname, args, "final_depth", "J", { optional = true, positive = true }),
    duration = A.number(fname, args, "duration", "s", { optional = true, positive = true, max = 1e5 }),
    cross_section = A.number(fname, args, "cross_section", "m^2", { optional = true, positive = true,
      max = 1e-8 }),
    ratio = A.number(fname, args, "ratio", "elastic/loss", { optional = true, positive = true }),
    kappa = A.number(fname, args, "kappa", "kB T", { optional = true, min = 0, max = 2 }),
    loss_rate = A.number(fname, args, "loss_rate", "m^3/s", { optional = true, nonnegative = true, max = 1e-8 }),
  }
  if p.keep == 1 then
    A.fail(fname, "keep 1 fraction is out of range; allowed (0, 1) fraction "
      .. "(an evaporation must lose particles)")
  end
  local ends = 0
  for _, k in ipairs { "final_number", "keep", "final_temperature", "final_depth", "duration" } do
    if p[k] then ends = ends + 1 end
  end
  if ends ~= 1 then
    A.fail(fname, "give exactly one end point: 'final_number', 'keep' (fraction kept), "
      .. "'final_temperature' (K), 'final_depth' (J) or 'duration' (s)")
  end
  local protection = common.read_protection(fname, args)
  if not (p.ratio or protection or p.cross_section) then
    A.fail(fname, "missing argument 'electric_field' (V/m, polarises the molecules for dipolar "
      .. "elastic collisions), 'microwave' {rabi, detuning} (shielding), 'confinement' "
      .. "{axial_omega} (pancakes), 'cross_section' (m^2) or 'ratio' (elastic to loss collisions)")
  end
  if p.duration and p.ratio then
    A.fail(fname, "argument 'duration' needs the collision rates: give a protection "
      .. "('electric_field', 'microwave', 'confinement') or 'cross_section' instead of 'ratio'")
  end
  local equipment = common.protection_equipment(protection)
  return new_stage("evaporate", args, {
    accepts = { ["ground-state-molecules"] = true }, params = p, equipment = equipment,
    hint = "evaporation of molecules needs ground-state molecules: place it after cp.stages.transfer",
    run = function(_, s)
      local notes, flags = {}, {}
      local mol = s.molecule
      local predicted = protection and not p.ratio and not p.cross_section
      -- rates that follow the temperature: predicted for the protection at every step
      local follow = predicted and not p.loss_rate
      local function rates(T)
        local r = common.predicted_rates(s, protection, T)
        return { ratio = r.ratio, elastic = r.elastic_rate_coefficient,
          loss = r.loss_rate_coefficient, result = r }
      end
      local beta, sigma, ratio = nil, p.cross_section, p.ratio
      if follow then
        local r0 = rates(s.temperature).result
        common.rates_note(s, r0, s.temperature, notes)
        common.unprotected_note(protection, r0.ratio, notes)
        beta, sigma, ratio = r0.loss_rate_coefficient, r0.cross_section, r0.ratio
      else
        beta = loss_rate(s, p.loss_rate, notes, flags)
      end
      if predicted and not follow then
        -- the given loss rate overrides; the elastic cross section is still predicted
        local r = common.predicted_rates(s, protection, s.temperature)
        sigma = r.cross_section
        notes[#notes + 1] = string.format("the given loss_rate overrides the predicted %.3g cm^3/s; "
          .. "%s dipole %.3g D%s, dipolar elastic cross section %.3g cm^2 (%s)",
          r.loss_rate_coefficient / cp.units.cm3, r.regime == "microwave" and "effective" or "induced",
          r.dipole_debye, r.regime == "microwave" and "" or " (exact Stark effect)", sigma / 1e-4,
          r.method)
      end
      if follow then -- noted above
      elseif not ratio and beta == 0 then
        -- no two-body loss: the largest ratio the scaling model takes stands for "no loss"
        ratio = NO_LOSS_RATIO
        notes[#notes + 1] = string.format("no two-body loss: ratio of elastic to loss collisions "
          .. "taken as %.0e, the model's limit", ratio)
      else
        ratio = ratio or cp.collisions.collision_ratio { cross_section = sigma, rate = beta,
          mass = mol.mass, temperature = s.temperature }.ratio
        notes[#notes + 1] = string.format("ratio of elastic to loss collisions %.3g at the start", ratio)
        if not p.ratio and not p.loss_rate then common.unprotected_note(protection, ratio, notes) end
      end
      leftover_note(s, notes)
      thermal_note(s, notes, "evaporation", "starts")
      local target = { number = p.final_number or (p.keep and p.keep * s.number),
        temperature = p.final_temperature or (p.final_depth and p.final_depth / (p.eta * cp.consts.kB)),
        duration = p.duration, sigma = sigma, beta = beta }
      if target.number and target.number >= s.number then
        error(string.format("final_number %.4g is not below the %.4g molecules the "
          .. "evaporation starts with", target.number, s.number), 0)
      end
      if target.temperature and target.temperature >= s.temperature then
        error(string.format("argument '%s' asks for %.4g nK, not below the %.4g nK the evaporation "
          .. "starts at%s", p.final_temperature and "final_temperature" or "final_depth",
          target.temperature / cp.units.nK, s.temperature / cp.units.nK,
          p.final_depth and string.format(" (final_depth / (eta kB) at eta = %g)", p.eta) or ""), 0)
      end
      if s.lattice then
        notes[#notes + 1] = "in the lattice: the evaporation model uses the envelope trap of the same "
          .. "entropy; evaporation out of a deep lattice is not what it describes"
      end
      local r = follow and MODEL.evaporate_predicted(s, p.eta, p.kappa, rates, target)
        or MODEL.evaporate(s, p.eta, p.kappa, ratio, target)
      if follow then
        local rf = r.finish.result
        notes[#notes + 1] = string.format("at the end (%.3g nK): loss %.3g cm^3/s, elastic/loss %.3g",
          r.temperature / cp.units.nK, rf.loss_rate_coefficient / cp.units.cm3, rf.ratio)
        if rf.valid == false and r.start.result.valid then
          notes[#notes + 1] = "outside the collision model's validity at the end: " .. rf.note
        end
      end
      if r.efficiency <= 0 then
        notes[#notes + 1] = string.format("evaporation does not gain phase-space density "
          .. "(efficiency %.2g): losses outrun thermalisation", r.efficiency)
      end
      local out = S.with(s, { number = r.number, temperature = r.temperature })
      if s.degeneracy >= 1 then thermal_note(out, notes, "evaporation", "ends") end
      local duration, unknown = 0, false
      if sigma then
        duration = r.duration
        if duration > LONG_EVAPORATION then
          notes[#notes + 1] = string.format("the evaporation takes %.3g s%s: one-body loss "
            .. "(background gas, light scattering) during it is not modelled, and molecule "
            .. "lifetimes in optical traps are typically seconds", duration,
            duration > 60 and " (minutes: not a realistic plan)" or "")
        end
      else
        unknown = true
        notes[#notes + 1] = "duration unknown (only the collision ratio was given); not counted in the elapsed time"
      end
      return out, { duration = duration, duration_unknown = unknown, notes = notes, flags = flags }
    end,
  })
end

return { constructor = evaporate, help = [[
stages.evaporate{eta, final_number | keep | final_temperature (K) | final_depth (J) |
  duration (s), electric_field (V/m) [, rotational_j = 0 | 1] | microwave = {rabi, detuning [,
  ellipticity]} |
  confinement = {axial_omega} | cross_section (m^2) | ratio [, kappa, loss_rate (m^3/s),
  label]}
  -> stage
Evaporation of ground-state molecules at truncation eta (5..30) in the fixed trap
(cp.collisions.evaporation, the scaling model).  With a protection (a dc electric_field,
a blue-detuned microwave {rabi, detuning} in rad/s, and/or pancake confinement
{axial_omega} in rad/s) and no loss_rate, the elastic and loss rates are predicted by
cp.collisions.shielded at every step of the trajectory (they follow the temperature); a
given loss_rate overrides the predicted loss.  Otherwise a given cross_section, or a
given ratio of elastic to loss collisions, with the universal loss rate.  Ends at a
number, a kept fraction (0 < keep < 1), a temperature, or a trap depth (T = depth/(eta kB)),
which must lie below the sample's, or after a duration (needs a protection or
cross_section).  An end point the physics never reaches (losses outrun the cooling, the
cloud empties first) marks the stage failed in the budget.  Duration from the trajectory
(unknown, NaN, with only a ratio); one-body loss is not modelled (a note flags
evaporations longer than 1 s).  rotational_j = 1: the molecules are in |1,0>, dc-field
shielded above the |1,0>|1,0> crossing.  Example: cp.stages.evaporate{eta = 8,
final_temperature = 60e-9, microwave = {rabi = 2*math.pi*40e6, detuning = 2*math.pi*8e6}}]] }
