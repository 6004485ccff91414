-- coldprep.stage.hold: the hold stage (constructor cp.stages.hold).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local MODEL = require "coldprep.stage.models"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage
local MOLECULES = common.MOLECULES
local loss_rate = common.loss_rate
local leftover_note = common.leftover_note
local thermal_note = common.thermal_note

-- cp.stages.hold{duration (s) [, lifetime (s), heating_rate (K/s), loss_rate (m^3/s),
--   electric_field (V/m), microwave = {...}, confinement = {...}, label]}
local function hold(args)
  local fname = "stages.hold"
  A.table(fname, args, { "duration", "lifetime", "heating_rate", "loss_rate", "label",
    "electric_field", "rotational_j", "microwave", "confinement" })
  local p = {
    duration = A.number(fname, args, "duration", "s", { positive = true, max = 1e5 }),
    lifetime = A.number(fname, args, "lifetime", "s", { optional = true, positive = true, max = 1e9 }),
    heating_rate = A.number(fname, args, "heating_rate", "K/s", { optional = true, default = 0, nonnegative = true, max = 1 }),
    loss_rate = A.number(fname, args, "loss_rate", "m^3/s", { optional = true, nonnegative = true, max = 1e-8 }),
  }
  local protection = common.read_protection(fname, args)
  return new_stage("hold", args, {
    accepts = MOLECULES, params = p, equipment = common.protection_equipment(protection),
    hint = "the hold models molecule losses; associate first",
    run = function(_, s)
      local notes, flags = {}, {}
      local beta
      if protection and not p.loss_rate then
        local r = common.predicted_rates(s, protection, s.temperature)
        common.rates_note(s, r, s.temperature, notes)
        beta = r.loss_rate_coefficient
      else
        if protection then
          notes[#notes + 1] = "the given loss_rate overrides the rate predicted for the protection"
        end
        beta = loss_rate(s, p.loss_rate, notes, flags)
      end
      local heating = p.heating_rate
      if s.lattice then
        heating = heating + s.lattice.heating_rate
        notes[#notes + 1] = string.format("photon scattering in the lattice heats at %.3g nK/s",
          s.lattice.heating_rate / cp.units.nK)
        notes[#notes + 1] = "in the lattice: two-body loss at the mean density of the envelope trap; "
          .. "on-site loss and its suppression by the lattice (one fermion per site in the lowest "
          .. "band) are not modelled"
      end
      leftover_note(s, notes)
      thermal_note(s, notes, "hold", "starts")
      local r = MODEL.hold(s, beta, p.lifetime, heating, p.duration)
      return S.with(s, { number = r.number, temperature = r.temperature }),
        { duration = p.duration, notes = notes, flags = flags }
    end,
  })
end

return { constructor = hold, help = [[
stages.hold{duration (s) [, lifetime (s), heating_rate (K/s), loss_rate (m^3/s),
  electric_field (V/m) [, rotational_j = 0 | 1], microwave = {rabi, detuning
  [, ellipticity]} (rad/s, rad/s, rad), confinement = {axial_omega} (rad/s), label]}
  -> stage
Molecules held in their trap: two-body loss (loss_rate; else, with a protection given, the
rate predicted by cp.collisions.shielded for it; else the universal rate from the
molecule's C6 and statistics, cp.collisions.universal_rate) with its anti-evaporation
heating, one-body loss, technical heating, and the lattice's photon-scattering heating
(cp.collisions.hold, a thermal-cloud model).  rotational_j = 1: the molecules are in |1,0>,
dc-field shielded above the |1,0>|1,0> crossing.  Example: cp.stages.hold{duration = 0.1,
lifetime = 5}]] }
