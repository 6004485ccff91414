-- coldprep.library: completes the `coldprep` module table that luaopen_coldprep built from
-- the C bindings, by loading the Lua-side library: units, the species registry, help,
-- the preparation budget (plan, stages, report) and the studies built on it (sweep,
-- optimize, uncertainty, plot).  Runs once, from luaopen_coldprep.  (Not named init.lua:
-- a stock interpreter's '?/init.lua' search path would find it for require "coldprep" before
-- the C module, and it requires "coldprep" itself.)
local cp = require "coldprep"

cp.units = require "coldprep.units"
cp.species = require "coldprep.species"
cp.help = require "coldprep.help"

for _, name in ipairs { "plan", "stages", "report", "sweep", "optimize", "uncertainty", "plot" } do
  cp[name] = require("coldprep." .. name)
end

return cp
