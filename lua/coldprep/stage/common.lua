-- coldprep.stage.common: what the stage files share: the stage metatable, the sets of
-- sample kinds, the stage constructor, and the loss and validity notes of hold and evaporate.
local cp = require "coldprep"
local A = require "coldprep.argcheck"

local M = {}

local Stage = {}
M.Stage = Stage
Stage.__index = Stage

M.MOLECULES = { ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }
M.ANY = { ["atom-mixture"] = true, ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }

function M.new_stage(kind, args, fields)
  if args.label ~= nil and type(args.label) ~= "string" then
    A.fail("stages." .. kind, "argument 'label' must be a string")
  end
  local st = setmetatable(fields, Stage)
  st.kind = kind
  st.name = args.label or kind
  st.equipment = st.equipment or {}
  return st
end

-- A stage whose physics does not work out (an evaporation that never reaches its end
-- point, a model driven out of its range by the sample) calls M.fail(reason): the plan
-- then returns its budget with that stage marked failed and the verdict "not degenerate",
-- instead of an error.  Errors (error(...), A.fail) stay for wrong input.
local FAILURE = {}
FAILURE.__tostring = function(e) return e.reason end

function M.fail(reason)
  error(setmetatable({ reason = reason }, FAILURE), 0)
end

-- The reason when e is a failure raised by M.fail, else nil.
function M.failure_reason(e)
  if getmetatable(e) == FAILURE then return e.reason end
  return nil
end

-- A validity flag: an estimate a stage used outside its model's stated range.  Appended to
-- `flags` (the stage record's list of {model, flag, text}, readable by the caller) and, as
-- a note "outside its range (model.flag): text", to `notes`.
function M.flag(flags, notes, model, flag, text)
  flags[#flags + 1] = { model = model, flag = flag, text = text }
  notes[#notes + 1] = string.format("outside its range (%s.%s): %s", model, flag, text)
end

-- Two-body loss coefficient of the sample's molecules (m^3/s) at its temperature: the
-- given one, or the universal rate from the molecule's C6 (Idziaszek & Julienne 2010,
-- through cp.collisions.universal_rate); notes say which and what it assumes, and the
-- rate's validity flag (above a tenth of the p-wave barrier) goes into `flags` when given.
function M.loss_rate(s, given, notes, flags)
  if given then
    notes[#notes + 1] = string.format("two-body loss coefficient %.3g cm^3/s as given", given / cp.units.cm3)
    return given
  end
  local mol = s.molecule
  local ur = cp.collisions.universal_rate { c6_au = mol.c6_au, mass = mol.mass / 2,
    temperature = s.temperature, statistics = s.statistics }
  local beta = ur.rate
  local why = {}
  if s.kind == "feshbach-molecules" then
    why[#why + 1] = "Feshbach molecules relax faster than this ground-state estimate"
  end
  if not mol.reactive then
    why[#why + 1] = "non-reactive " .. mol.name .. ": sticky-complex loss taken at the universal rate"
  end
  notes[#notes + 1] = string.format("two-body loss: universal %s-wave rate %.3g cm^3/s at %.3g nK "
    .. "(C6 = %.4g a.u.)%s", s.statistics == "fermion" and "p" or "s", beta / cp.units.cm3,
    s.temperature / cp.units.nK, mol.c6_au, #why > 0 and ("; " .. table.concat(why, "; ")) or "")
  -- the threshold laws behind the universal rate hold well below the p-wave barrier
  for _, f in ipairs(ur.flags) do
    M.flag(flags or {}, notes, "collisions", f, string.format("T is %.2g of the p-wave barrier: "
      .. "beyond the threshold regime the universal rate is only an estimate", ur.barrier_fraction))
  end
  return beta
end

function M.leftover_note(s, notes)
  local left = s.atoms[1].number + s.atoms[2].number
  if left >= 1 then
    notes[#notes + 1] = string.format("%.3g leftover atoms still present: atom-molecule collisions "
      .. "are not modelled (remove them first)", left)
  end
end

-- The hold and evaporation models assume a thermal (non-degenerate) cloud; say so when the
-- cloud `when` ("starts" or "ends") the stage degenerate.
function M.thermal_note(s, notes, what, when)
  if s.degeneracy < 1 then
    notes[#notes + 1] = string.format("the %s model treats the cloud as thermal; it %s at %s = %.2g",
      what, when, s.degeneracy_name, s.degeneracy)
  end
end

-- Evaporation longer than this (s) gets a note that one-body loss is missing from it
-- (common practice, no source: molecule lifetimes in optical traps are of order seconds).
M.LONG_EVAPORATION = 1


return M
