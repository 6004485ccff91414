-- coldprep.stage.change_trap: the change_trap stage (constructor cp.stages.change_trap).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local MODEL = require "coldprep.stage.models"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage
local MOLECULES = common.MOLECULES

-- Rule of thumb for a smooth trap ramp: |d omega/dt| / omega^2 well below 1 on every axis
-- (common practice, no source); above ADIABATIC_LIMIT the budget warns.
local ADIABATIC_LIMIT = 0.1

-- cp.stages.change_trap{trap_frequencies (rad/s), ramp_time (s) [, beam_power (W), label]}
local function change_trap(args)
  local fname = "stages.change_trap"
  A.table(fname, args, { "trap_frequencies", "ramp_time", "beam_power", "label" })
  local w_to = A.frequencies(fname, args, "trap_frequencies")
  local ramp = A.number(fname, args, "ramp_time", "s", { positive = true, max = 1e3 })
  local power = A.number(fname, args, "beam_power", "W", { optional = true, positive = true })
  return new_stage("change_trap", args, {
    accepts = MOLECULES, adiabatic = true,
    params = { trap_frequencies = w_to, ramp_time = ramp, beam_power = power },
    equipment = { { kind = "laser", what = "new optical trap", power = power } },
    hint = "the trap change acts on molecules; associate first",
    run = function(_, s)
      local notes = {}
      local worst = 0
      for i = 1, 3 do
        local w0, w1 = s.trap_frequencies[i], w_to[i]
        worst = math.max(worst, math.abs(w1 - w0) / (ramp * math.min(w0, w1) ^ 2))
      end
      if worst > ADIABATIC_LIMIT then
        notes[#notes + 1] = string.format("trap ramp not adiabatic: |dw/dt|/w^2 = %.2g "
          .. "(want << 1); the temperature shown assumes an adiabatic change", worst)
      end
      local T = MODEL.match_harmonic(s, w_to)
      local out = S.with(s, { trap_frequencies = w_to, temperature = T })
      if s.lattice then
        -- the lattice sample is described by its envelope trap at the same entropy, so the
        -- change is the lattice ramped down adiabatically into the new trap
        out.lattice = nil
        notes[#notes + 1] = "leaves the lattice: its photon-scattering heating no longer applies"
      end
      return out, { duration = ramp, notes = notes, adiabatic = true }
    end,
  })
end

return { constructor = change_trap, help = [[
stages.change_trap{trap_frequencies = {wx, wy, wz} (rad/s), ramp_time (s) [, beam_power (W),
  label]} -> stage
An adiabatic change of the harmonic trap: the temperature from entropy matching
(cp.thermo.match_harmonic).  After load_lattice it ramps the lattice down into the new
trap (the lattice's heating stops).  A note warns when |d omega/dt|/omega^2 > 0.1 on an axis (the
ramp is then too fast for the adiabatic result).  Example: cp.stages.change_trap{
trap_frequencies = {2*math.pi*60, 2*math.pi*70, 2*math.pi*200}, ramp_time = 0.05}]] }
