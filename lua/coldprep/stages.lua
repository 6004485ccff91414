-- coldprep.stages: the stage library.  Each constructor takes one table of named
-- arguments, checks it, and returns a stage: a table with
--   name       the label in the budget (argument `label`, default the stage's kind)
--   kind       "associate", "transfer", "remove_atoms", "change_trap", "load_lattice",
--              "hold", "evaporate" or "custom"
--   accepts    set of sample kinds it can act on; produces: the kind it hands on (nil =
--              unchanged); adiabatic: true when it conserves entropy except for the
--              excitation it reports; equipment: what the safety cautions look at
--   run        function(self, sample) -> sample, info {duration (s), notes = {...}}
-- The physics comes from the C models (cp.feshbach, cp.raman, cp.lattice, cp.thermo,
-- cp.collisions); each stage is a thin layer that feeds them the sample's numbers.
-- Molecule data (statistics, C6, reactivity) come from the sample's species record.
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"

local M = {}
local Stage = {}
Stage.__index = Stage
M.Stage = Stage

local MOLECULES = { ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }
local ANY = { ["atom-mixture"] = true, ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }

local function new_stage(kind, args, fields)
  if args.label ~= nil and type(args.label) ~= "string" then
    A.fail("stages." .. kind, "argument 'label' must be a string")
  end
  local st = setmetatable(fields, Stage)
  st.kind = kind
  st.name = args.label or kind
  st.equipment = st.equipment or {}
  return st
end

local function pct(x) return string.format("%.3g %%", 100 * x) end

-- ---- custom ---------------------------------------------------------------------------

-- cp.stages.custom{name, fn [, accepts, produces, adiabatic, equipment]}
function M.custom(args)
  local fname = "stages.custom"
  A.table(fname, args, { "name", "fn", "accepts", "produces", "adiabatic", "equipment" })
  if type(args.name) ~= "string" or args.name == "" then
    A.fail(fname, "missing argument 'name' (the stage's label in the budget, a string)")
  end
  local fn = A.func(fname, args, "fn")
  local accepts = ANY
  if args.accepts ~= nil then
    accepts = {}
    for _, k in ipairs(type(args.accepts) == "table" and args.accepts or { args.accepts }) do
      accepts[A.option(fname, { accepts = k }, "accepts", S.KINDS)] = true
    end
  end
  local produces = args.produces and A.option(fname, args, "produces", S.KINDS) or nil
  if args.equipment ~= nil and type(args.equipment) ~= "table" then
    A.fail(fname, "argument 'equipment' must be a list of {kind = \"laser\"|\"coil\"|\"electric\", ...}")
  end
  return new_stage("custom", { label = args.name }, {
    accepts = accepts, produces = produces, adiabatic = args.adiabatic and true or false,
    equipment = args.equipment,
    run = function(self, s)
      local ok, out, rec = pcall(fn, s)
      if not ok then error(string.format("stage %s: %s", self.name, tostring(out)), 0) end
      rec = rec or {}
      if type(rec) ~= "table" then
        error(string.format("stage %s: the second result must be a record table, got %s",
          self.name, type(rec)), 0)
      end
      local duration = rec.duration or 0
      if type(duration) ~= "number" or not (duration >= 0) or duration == math.huge then
        error(string.format("stage %s: record field 'duration' = %s must be >= 0 (s)", self.name,
          tostring(duration)), 0)
      end
      if type(out) == "table" and self.produces then out.kind = self.produces end
      return out, { duration = duration, notes = rec.notes or {} }
    end,
  })
end

-- ---- remove_atoms ---------------------------------------------------------------------

-- cp.stages.remove_atoms{[efficiency = 1, molecule_loss = 0, heating_per_atom = 0 J,
--   duration = 0 s, label]}
function M.remove_atoms(args)
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
      local out = S.with(s, { number = s.number * (1 - p.molecule_loss) })
      if removed > 0 and p.heating_per_atom > 0 and not S.is_empty(out) then
        -- the energy the removed atoms leave behind is shared by the molecules
        local e = out.energy_per_particle + p.heating_per_atom * removed / out.number
        out.temperature = S.temperature_for_energy(out, e)
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

return M
