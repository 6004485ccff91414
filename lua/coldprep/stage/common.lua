-- coldprep.stage.common: what the stage files share: the stage metatable, the sets of
-- sample kinds, the stage constructor, the loss and validity notes of hold and evaporate,
-- and the protection of the molecules (dc field, microwave, pancake confinement) from
-- which those two stages predict their collision rates (cp.collisions.shielded).
local cp = require "coldprep"
local A = require "coldprep.argcheck"

local M = {}

local Stage = {}
M.Stage = Stage
Stage.__index = Stage

M.MOLECULES = { ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }
M.ANY = { ["atom-mixture"] = true, ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }

-- The equipment a stage may declare for the budget's safety cautions: each kind with the
-- field that sizes it and its unit (a laser's power may be left out: "not given").
M.EQUIPMENT = { laser = { "power", "W" }, coil = { "field", "T" }, electric = { "field", "V/m" },
  microwave = { "rabi", "rad/s" } }

-- Check one equipment item {kind, what, <its field>}; `where` names it in the message.
function M.check_equipment(where, e)
  if type(e) ~= "table" then A.fail(where, "must be a table {kind, what, ...}, got %s", type(e)) end
  local q = M.EQUIPMENT[e.kind]
  if not q then
    A.fail(where, "kind %s is not allowed; allowed coil, electric, laser, microwave", tostring(e.kind))
  end
  if e.what ~= nil and type(e.what) ~= "string" then
    A.fail(where, "field 'what' must be a string, got %s", type(e.what))
  end
  if e.kind == "laser" then
    A.number(where, e, q[1], q[2], { optional = true, positive = true })
  else
    A.number(where, e, q[1], q[2], { nonnegative = true })
  end
end

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

-- The protection keys hold and evaporate take: electric_field (V/m), microwave = {rabi
-- (rad/s), detuning (rad/s, blue > 0) [, ellipticity (rad)]}, confinement = {axial_omega
-- (rad/s)} (pancakes of a 1D lattice, the dc field along the tight axis).
M.PROTECTION_KEYS = { "electric_field", "rotational_j", "microwave", "confinement" }

-- Reads the protection from a stage's arguments: nil when none is given.
function M.read_protection(fname, args)
  local pr = {
    electric_field = A.number(fname, args, "electric_field", "V/m", { optional = true, positive = true, max = 1e8 }),
  }
  -- the rotational state the molecules are held in: 0 (|0,0>, the ground state) or 1 (|1,0>,
  -- prepared by a microwave pulse: dc-field shielding above the |1,0>|1,0> crossing)
  if args.rotational_j ~= nil then
    if args.rotational_j ~= 0 and args.rotational_j ~= 1 then
      A.fail(fname, "rotational_j %s is not allowed; allowed 0 (|0,0>) or 1 (|1,0>)",
        tostring(args.rotational_j))
    end
    if args.rotational_j == 1 and not pr.electric_field then
      A.fail(fname, "rotational_j = 1 (dc-field shielding of |1,0>) needs 'electric_field'")
    end
    pr.rotational_j = math.tointeger(args.rotational_j)
  end
  if args.microwave ~= nil then
    local mw = args.microwave
    if type(mw) ~= "table" then
      A.fail(fname, "argument 'microwave' must be a table {rabi (rad/s), detuning (rad/s) "
        .. "[, ellipticity (rad)]}, got %s", type(mw))
    end
    local f = fname .. ": microwave"
    A.table(f, mw, { "rabi", "detuning", "ellipticity" })
    pr.microwave = {
      rabi = A.number(f, mw, "rabi", "rad/s", { positive = true, max = 2 * math.pi * 1e10 }),
      detuning = A.number(f, mw, "detuning", "rad/s", { min = -2 * math.pi * 1e10, max = 2 * math.pi * 1e10 }),
      ellipticity = A.number(f, mw, "ellipticity", "rad", { optional = true, default = 0, min = 0, max = math.pi / 4 }),
    }
    if pr.microwave.detuning < 0 then
      A.fail(fname, "microwave detuning %g rad/s is red; allowed [0, 2 pi x 1e10] rad/s "
        .. "(microwave shielding needs a blue-detuned microwave)", pr.microwave.detuning)
    end
  end
  if args.confinement ~= nil then
    local c = args.confinement
    if type(c) ~= "table" then
      A.fail(fname, "argument 'confinement' must be a table {axial_omega (rad/s)}, got %s", type(c))
    end
    local f = fname .. ": confinement"
    A.table(f, c, { "axial_omega" })
    pr.confinement = { axial_omega = A.number(f, c, "axial_omega", "rad/s",
      { min = 2 * math.pi * 1e3, max = 2 * math.pi * 1e6 }) }
  end
  if pr.microwave and (pr.electric_field or pr.confinement) then
    A.fail(fname, "a microwave together with 'electric_field' or 'confinement' is not "
      .. "modelled; give the microwave alone")
  end
  if not (pr.electric_field or pr.microwave or pr.confinement) then return nil end
  return pr
end

-- The equipment a protection needs (for the budget's safety cautions).
function M.protection_equipment(pr)
  local eq = {}
  if pr and pr.electric_field then
    eq[#eq + 1] = { kind = "electric", what = "electric field for the molecules' dipoles", field = pr.electric_field }
  end
  if pr and pr.microwave then
    eq[#eq + 1] = { kind = "microwave", what = "microwave for shielding (near the J = 0 -> 1 "
      .. "transition)", rabi = pr.microwave.rabi }
  end
  return eq
end

-- Elastic and loss rate coefficients predicted for the sample's molecules at temperature T
-- under protection pr (cp.collisions.shielded).
function M.predicted_rates(s, pr, T)
  return cp.collisions.shielded { molecule = s.molecule, temperature = T,
    electric_field = pr.electric_field, microwave = pr.microwave, confinement = pr.confinement,
    rotational_j = pr.rotational_j }
end

local REGIME_NAMES = { dc_3d = "dc field in free space", quasi_2d = "quasi-2D pancakes",
  microwave = "microwave shielding", dc_shield = "dc-field shielding of |1,0>" }

-- A note on predicted rates r at temperature T (K) for the sample s's molecules.
function M.rates_note(s, r, T, notes)
  local pr = r.regime == "dc_3d" and r.dipole_debye == 0 and "no field (field-free)"
    or REGIME_NAMES[r.regime]
  notes[#notes + 1] = string.format("collision rates predicted for %s (%s dipole %.3g D) at "
    .. "%.3g nK: loss %.3g cm^3/s, elastic %.3g cm^3/s, elastic/loss %.3g; method: %s", pr,
    r.regime == "microwave" and "effective" or "induced, exact Stark effect", r.dipole_debye, T / cp.units.nK,
    r.loss_rate_coefficient / cp.units.cm3, r.elastic_rate_coefficient / cp.units.cm3,
    r.ratio, r.method)
  if r.regime == "quasi_2d" then
    notes[#notes + 1] = string.format("in pancakes: the rates are 3D-equivalent (2D loss "
      .. "%.3g cm^2/s times sqrt(2 pi) a_z); the cloud's density and the hold and evaporation "
      .. "models are still those of the 3D trap", r.loss_rate_coefficient_2d / 1e-4)
  end
  if not s.molecule.reactive and r.regime ~= "microwave" then
    notes[#notes + 1] = "non-reactive " .. s.molecule.name .. ": loss at short range (sticky "
      .. "complexes) taken as certain, as for reactive molecules"
  end
  if not r.valid then
    notes[#notes + 1] = "outside the collision model's validity: " .. r.note
  end
end

-- Below this ratio of elastic to loss collisions evaporation does not gain phase-space
-- density for long (common practice, no source: labs ask for 100 or more).
M.GOOD_RATIO = 100

-- A note when molecules evaporate without shielding and lose fast.
function M.unprotected_note(pr, ratio, notes)
  local shielded = pr and (pr.microwave or pr.confinement)
  if not shielded and ratio < M.GOOD_RATIO then
    notes[#notes + 1] = string.format("no protection from loss (no microwave shielding, "
      .. "dc-field shielding or pancake confinement): elastic/loss is only %.3g, below the "
      .. "~%d evaporation needs; these molecules lose faster than they thermalise", ratio, M.GOOD_RATIO)
  end
end


return M
