-- coldprep.stage.remove_atoms: the remove_atoms stage (constructor cp.stages.remove_atoms).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage
local MOLECULES = common.MOLECULES

-- cp.stages.remove_atoms{[efficiency = 1, molecule_loss = 0, heating_per_atom = 0 J,
--   duration = 0 s, label]}
local function remove_atoms(args)
  local fname = "stages.remove_atoms"
  A.table(fname, args, { "efficiency", "molecule_loss", "heating_per_atom", "duration", "label" })
  local p = {
    efficiency = A.number(fname, args, "efficiency", "fraction", { optional = true, default = 1, min = 0, max = 1 }),
    molecule_loss = A.number(fname, args, "molecule_loss", "fraction", { optional = true, default = 0, min = 0, max = 1 }),
    heating_per_atom = A.number(fname, args, "heating_per_atom", "J", { optional = true, default = 0, nonnegative = true, max = 1e-24 }),
    duration = A.number(fname, args, "duration", "s", { optional = true, default = 0, nonnegative = true, max = 1e4 }),
  }
  return new_stage("remove_atoms", args, {
    accepts = MOLECULES, params = p,
    hint = "atoms are removed after association (cp.stages.associate)",
    run = function(_, s)
      local notes, removed = {}, 0
      for _, a in ipairs(s.atoms) do
        local r = a.number * p.efficiency
        removed = removed + r
        a.number = a.number - r
      end
      -- molecules lost with the atoms are lost at random (the energy per molecule is kept)
      local out = S.after_uniform_loss(s, s.number * (1 - p.molecule_loss))
      if removed > 0 and p.heating_per_atom > 0 and not S.is_empty(out) then
        -- the energy the removed atoms leave behind is shared by the molecules
        out = S.with(out, { temperature = S.temperature_after_heating(out, p.heating_per_atom * removed / out.number) })
        notes[#notes + 1] = string.format("the energy left by the removed atoms raises T by %.3g nK",
          (out.temperature - s.temperature) / cp.units.nK)
      end
      local left = out.atoms[1].number + out.atoms[2].number
      if left >= 1 then
        notes[#notes + 1] = string.format("%.3g leftover atoms remain (%s %.3g, %s %.3g)", left,
          out.atoms[1].name, out.atoms[1].number, out.atoms[2].name, out.atoms[2].number)
      end
      return out, { duration = p.duration, notes = notes }
    end,
  })
end

return { constructor = remove_atoms, help = [[
stages.remove_atoms{[efficiency = 1, molecule_loss = 0, heating_per_atom = 0 (J),
  duration = 0 (s), label]} -> stage
Removes the fraction `efficiency` of the leftover atoms (resonant light, microwave
sweeps); a fraction molecule_loss of the molecules is lost with them (at random, energy
per molecule kept), and each removed atom
leaves heating_per_atom of energy in the molecules (the new temperature from the thermo
model's energy per particle).  Example: cp.stages.remove_atoms{heating_per_atom =
2*cp.units.nK*cp.consts.kB}]] }
