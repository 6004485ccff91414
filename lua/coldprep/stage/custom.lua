-- coldprep.stage.custom: the custom stage (constructor cp.stages.custom).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage
local ANY = common.ANY

-- cp.stages.custom{name, fn [, accepts, produces, adiabatic, equipment]}
local function custom(args)
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
    A.fail(fname, "argument 'equipment' must be a list of {kind = \"laser\"|\"coil\"|\"electric\"|\"microwave\", ...}")
  end
  for i, e in ipairs(args.equipment or {}) do
    common.check_equipment(string.format("%s: equipment[%d]", fname, i), e)
  end
  return new_stage("custom", { label = args.name }, {
    accepts = accepts, produces = produces, adiabatic = args.adiabatic and true or false,
    equipment = args.equipment,
    run = function(self, s)
      local out, rec = fn(s)
      rec = rec or {}
      if type(rec) ~= "table" then
        error(string.format("the second result must be a record table, got %s", type(rec)), 0)
      end
      local duration = rec.duration or 0
      if type(duration) ~= "number" or not (duration >= 0) or duration == math.huge then
        error(string.format("record field 'duration' = %s must be >= 0 (s)", tostring(duration)), 0)
      end
      local notes = rec.notes or {}
      if type(notes) ~= "table" then
        error(string.format("record field 'notes' must be a list of strings, got %s", type(notes)), 0)
      end
      for i, n in ipairs(notes) do
        if type(n) ~= "string" then
          error(string.format("record field 'notes[%d]' must be a string, got %s", i, type(n)), 0)
        end
      end
      if type(out) == "table" and self.produces then out.kind = self.produces end
      return out, { duration = duration, notes = notes }
    end,
  })
end

return { constructor = custom, help = [[
stages.custom{name, fn [, accepts, produces, adiabatic, equipment]} -> stage
A stage of your own.  fn(sample) receives a copy of the sample (see docs/planning.md: kind,
species, molecule, number, temperature (K), trap_frequencies {wx, wy, wz} (rad/s), atoms,
elapsed ...) and returns the changed sample and optionally a record {duration (s), notes =
{...}}.  The plan recomputes degeneracy, density and entropy from the thermo model.  For an
atom mixture change s.atoms[1] and s.atoms[2].  accepts: a kind or list of kinds (default
any); produces: the kind it hands on; equipment: list of {kind = "laser", what, power (W)}
| {kind = "coil", what, field (T)} | {kind = "electric", what, field (V/m)} | {kind =
"microwave", what, rabi (rad/s)} for the safety cautions.  Example:
  cp.stages.custom{name = "imaging", fn = function(s) s.number = 0.95 * s.number; return s,
    {duration = 1e-3, notes = {"5 % lost to imaging light"}} end}]] }
