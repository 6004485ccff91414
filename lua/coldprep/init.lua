-- coldprep.init: completes the `coldprep` module table that luaopen_coldprep built from
-- the C bindings, by loading the Lua-side library (units, species registry, help, and
-- the planning layers as they are added).  Runs once, from luaopen_coldprep.
local cp = require "coldprep"

cp.units = require "coldprep.units"
cp.species = require "coldprep.species"
cp.help = require "coldprep.help"

-- Optional Lua-side layers: each file lua/coldprep/NAME.lua listed here becomes cp.NAME.
-- A layer is listed once its file exists; package.preload tells which are embedded.
for _, name in ipairs { "plan", "stages", "report", "sweep", "optimize", "uncertainty", "plot" } do
  if package.preload["coldprep." .. name] then
    cp[name] = require("coldprep." .. name)
  end
end

return cp
