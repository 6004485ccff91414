-- coldprep.library: completes the `coldprep` module table that luaopen_coldprep built from
-- the C bindings, by loading the Lua-side library: units, the species registry, help,
-- the preparation budget (plan, stages, report) and the studies built on it (sweep,
-- optimize, uncertainty, plot).  The studies are loaded on first use, so that a start does
-- not pay for them: cp.sweep etc. are placeholders whose first indexing (or pairs, or
-- help, or Tab completion through their __load) requires the module and puts it in their
-- place.  Runs once, from luaopen_coldprep.  (Not named init.lua:
-- a stock interpreter's '?/init.lua' search path would find it for require "coldprep" before
-- the C module, and it requires "coldprep" itself.)
local cp = require "coldprep"

cp.units = require "coldprep.units"
cp.species = require "coldprep.species"
cp.help = require "coldprep.help"

for _, name in ipairs { "plan", "stages", "report" } do
  cp[name] = require("coldprep." .. name)
end

-- A placeholder for the module coldprep.NAME at cp[name], loaded on first use.  A C binding
-- already there (cp.plot.render) is put back before the module runs, which extends it.
-- callable: the module is called as a function (cp.sweep{...}).
local function on_first_use(name, callable)
  local binding = rawget(cp, name)
  local function load()
    rawset(cp, name, binding)
    local m = require("coldprep." .. name)
    rawset(cp, name, m)
    return m
  end
  return setmetatable({}, {
    __index = function(_, k) return load()[k] end,
    __newindex = function(_, k, v) load()[k] = v end,
    __pairs = function() return next, load(), nil end,
    __call = callable and function(_, ...) return load()(...) end or nil,
    __load = load,
  })
end

cp.sweep = on_first_use("sweep", true)
cp.optimize = on_first_use("optimize", true)
cp.uncertainty = on_first_use("uncertainty", true)
cp.plot = on_first_use("plot", false)

return cp
