-- coldprep.library: completes the `coldprep` module table that luaopen_coldprep built from
-- the C bindings, by loading the Lua-side library: units, the species registry, help,
-- the preparation budget (plan, stages, report) and the studies built on it (sweep,
-- optimize, uncertainty, plot).  Every one is loaded on first use, so that a start does
-- not pay for them: cp.units, cp.plan, cp.sweep etc. are placeholders whose first indexing
-- (or call, pairs, help, or Tab completion through their __load) requires the module and
-- puts it in their place.  Runs once, from luaopen_coldprep.  (Not named init.lua:
-- a stock interpreter's '?/init.lua' search path would find it for require "coldprep" before
-- the C module, and it requires "coldprep" itself.)
local cp = require "coldprep"

-- A placeholder for the module coldprep.NAME at cp[name], loaded on first use.  A C binding
-- already there (cp.species) is put back before the module runs, which extends it.
-- callable: the module is called as a function (cp.sweep{...}, help(f)).
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
    __pairs = function()
      local m = load()
      return next, type(m) == "table" and m or {}, nil -- cp.help is a function
    end,
    __call = callable and function(_, ...) return load()(...) end or nil,
    __load = load,
  })
end

cp.units = on_first_use("units", false)
cp.species = on_first_use("species", false)
cp.help = on_first_use("help", true)
cp.plan = on_first_use("plan", true)
cp.stages = on_first_use("stages", false)
cp.report = on_first_use("report", false)
cp.sweep = on_first_use("sweep", true)
cp.optimize = on_first_use("optimize", true)
cp.uncertainty = on_first_use("uncertainty", true)
cp.plot = on_first_use("plot", false)

return cp
