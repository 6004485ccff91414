-- coldprep.stages: the stage library.  Each constructor takes one table of named
-- arguments, checks it, and returns a stage: a table with
--   name       the label in the budget (argument `label`, default the stage's kind)
--   kind       "associate", "transfer", "remove_atoms", "change_trap", "load_lattice",
--              "hold", "evaporate" or "custom"
--   accepts    set of sample kinds it can act on; produces: the kind it hands on (nil =
--              unchanged); adiabatic: true when it conserves entropy except for the
--              excitation it reports; equipment: what the safety cautions look at
--   params     the stage's checked arguments with their defaults (read them, e.g. in a sweep)
--   run        function(self, sample) -> sample, info {duration (s), notes = {...}}
-- The physics comes from the C models (cp.feshbach, cp.raman, cp.lattice, cp.thermo,
-- cp.collisions); each stage is a thin layer that feeds them the sample's numbers.
local cp = require "coldprep"

local M = {}
M.Stage = require("coldprep.stage.common").Stage

for _, name in ipairs { "custom", "remove_atoms", "associate", "transfer", "change_trap", "hold",
  "evaporate", "load_lattice" } do
  local stage = require("coldprep.stage." .. name)
  -- a bad argument is reported at the line of the plan file that built the stage
  M[name] = function(args)
    local ok, built = pcall(stage.constructor, args)
    if not ok then error(built, 2) end
    return built
  end
  cp.set_help(M[name], stage.help)
end

return M
