-- coldprep.budget_check: the checks of what the report formats.  cp.report.budget(run)
-- takes the record of a plan run ({plan, start, steps, final, verdict, ranking, reason
-- [, failure]}, what plan:run hands it) and the budget methods (budget:text, print,
-- write_csv, write_json) take a budget; both are plain tables a script can change, so each
-- is checked before a number of it is formatted: a wrong type, NaN where the budget has no
-- use for it, a negative count or a step that does not start where the one before it
-- ended is an error naming the field, its value, unit and what is allowed, never a Lua
-- runtime error or a NaN written into the report.
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local common = require "coldprep.stage.common"

local M = {}

local shown = A.shown

-- t[key] as a number of `unit` in [lo, hi] (hi default inf); opt.nan: NaN allowed (a
-- value the report shows as "-"), opt.optional: nil allowed.
local function num(where, t, key, unit, lo, hi, opt)
  opt = opt or {}
  local v = t[key]
  if v == nil and opt.optional then return end
  if type(v) ~= "number" then
    A.fail(where, "field '%s' must be a number (%s), got %s", key, unit ~= "" and unit
      or "dimensionless", type(v))
  end
  if v ~= v and opt.nan then return end
  hi = hi or math.huge
  if not (v >= lo and v <= hi) or v == math.huge then
    local u = unit ~= "" and (" " .. unit) or ""
    A.fail(where, "%s %s%s is %s; allowed [%g, %s]%s", key, shown(v), u,
      v ~= v and "not a number" or "out of range", lo, hi == math.huge and "inf" or shown(hi), u)
  end
end

local function str(where, t, key, optional)
  local v = t[key]
  if v == nil and optional then return end
  if type(v) ~= "string" then A.fail(where, "field '%s' must be a string, got %s", key, type(v)) end
end

local function tbl(where, v, what)
  if type(v) ~= "table" then A.fail(where, "%s must be a table, got %s", what, type(v)) end
  return v
end

-- A list (table with keys 1..n) of strings under t[key] (nil allowed when optional).
local function strings(where, t, key, optional)
  local v = t[key]
  if v == nil and optional then return end
  tbl(where, v, "field '" .. key .. "'")
  for i, x in pairs(v) do
    if math.type(i) ~= "integer" or i < 1 or i > #v then
      A.fail(where, "field '%s' must be a list; it has the key %s", key, tostring(i))
    end
    if type(x) ~= "string" then
      A.fail(where, "%s[%d] must be a string, got %s", key, i, type(x))
    end
  end
end

-- The validity flags of a stage: a list of {model, flag, text}.
local function flags(where, t, optional)
  local v = t.flags
  if v == nil and optional then return end
  tbl(where, v, "field 'flags'")
  for i = 1, #v do
    local f = tbl(where, v[i], string.format("flags[%d]", i))
    for _, k in ipairs { "model", "flag", "text" } do str(string.format("%s: flags[%d]", where, i), f, k) end
  end
end

-- The statistics fields derived from a sample's number and temperature; an empty sample
-- (fewer than one particle) has no degeneracy or entropy (NaN, shown as "-").
local DERIVED = { { "degeneracy", "" }, { "t_over_tf", "" }, { "t_over_tc", "" },
  { "peak_density", "m^-3" }, { "phase_space_density", "" }, { "entropy_per_particle", "kB" } }

local function derived(where, s, empty)
  if s.degeneracy_name ~= "T/T_F" and s.degeneracy_name ~= "T/T_c" then
    A.fail(where, "degeneracy_name %s is not allowed; allowed T/T_F, T/T_c", shown(s.degeneracy_name))
  end
  for _, d in ipairs(DERIVED) do
    num(where, s, d[1], d[2], 0, nil,
      { nan = empty, optional = d[1] ~= "degeneracy" })
  end
end

-- An atom cloud of a sample as the start's notes read it.
local function cloud(where, c)
  tbl(where, c, "the atom cloud")
  str(where, c, "name")
  num(where, c, "number", "atoms", 0)
  num(where, c, "temperature", "K", 1e-300)
  num(where, c, "omega_bar", "rad/s", 1e-300)
  derived(where, c, not (c.number >= 1))
end

-- A sample of the run (S.check's fields, the names the report shows, the derived ones).
local function sample(where, s)
  tbl(where, s, "the sample")
  S.check(s, where)
  str(where, s, "species")
  if s.kind == "atom-mixture" then
    str(where, s, "name")
    tbl(where, s.atoms, "field 'atoms'")
    for i = 1, 2 do cloud(string.format("%s: atoms[%d]", where, i), s.atoms[i]) end
  end
  derived(where, s, S.is_empty(s))
end


-- The run's plan, run.plan; `where` is the function's name.
local function plan(where, p)
  tbl(where, p, "field 'plan'")
  str(where .. ": plan", p, "name")
  tbl(where, p.start, "field 'plan.start'")
  tbl(where, p.start.atoms, "field 'plan.start.atoms'")
  for i = 1, 2 do
    local w = string.format("%s: plan.start.atoms[%d]", where, i)
    local c = tbl(w, p.start.atoms[i], "the atom cloud")
    str(w, c, "name")
    num(w, c, "beam_power", "W", 1e-300, nil, { optional = true })
  end
  tbl(where, p.stages, "field 'plan.stages'")
  for i = 1, #p.stages do
    local w = string.format("%s: plan.stages[%d]", where, i)
    local st = tbl(w, p.stages[i], "the stage")
    str(w, st, "name")
    if st.equipment ~= nil then
      tbl(w, st.equipment, "field 'equipment'")
      for j = 1, #st.equipment do
        common.check_equipment(string.format("%s: equipment[%d]", w, j), st.equipment[j])
      end
    end
  end
end

-- The ranking of the stages: {index, name, gain [, failed]} (gain NaN when failed).
local function ranking(where, list)
  tbl(where, list, "field 'ranking'")
  for i = 1, #list do
    local w = string.format("%s: ranking[%d]", where, i)
    local g = tbl(w, list[i], "the entry")
    num(w, g, "index", "", 1)
    str(w, g, "name")
    str(w, g, "failed", true)
    num(w, g, "gain", "", -1, nil, { nan = g.failed ~= nil })
  end
end

-- cp.report.budget's argument: the record of one plan run.
function M.run(fname, run)
  A.table(fname, run, { "plan", "start", "steps", "final", "verdict", "ranking", "reason", "failure" })
  plan(fname, run.plan)
  sample(fname .. ": start", run.start)
  num(fname .. ": start", run.start, "number", "particles", 1) -- cp.plan's clouds hold >= 1 atom
  local steps = tbl(fname, run.steps, "field 'steps'")
  if #steps == 0 then A.fail(fname, "field 'steps' must list the stages run, got none") end
  local before = run.start
  for k = 1, #steps do
    local w = string.format("%s: steps[%d]", fname, k)
    local st = tbl(w, steps[k], "the step")
    num(w, st, "index", "", 1)
    tbl(w, st.stage, "field 'stage'")
    str(w .. ": stage", st.stage, "name")
    sample(w .. ": before", st.before)
    sample(w .. ": after", st.after)
    if st.before.number ~= before.number then
      A.fail(w .. ": before", "number %s particles is not the number the step before handed on (%s); "
        .. "allowed: the steps of one plan run, in order", shown(st.before.number), shown(before.number))
    end
    if S.is_empty(st.before) and st.after.number ~= st.before.number then
      A.fail(w .. ": after", "number %s particles after a stage that got fewer than one particle "
        .. "(%s) and so did not run; allowed %s particles", shown(st.after.number),
        shown(st.before.number), shown(st.before.number))
    end
    if st.info ~= nil then
      local info = tbl(w, st.info, "field 'info'")
      if not info.duration_unknown then num(w .. ": info", info, "duration", "s", 0, nil, { optional = true }) end
      str(w .. ": info", info, "failed", true)
      strings(w .. ": info", info, "notes", true)
      flags(w .. ": info", info, true)
    end
    before = st.after
  end
  local v = tbl(fname, run.verdict, "field 'verdict'")
  str(fname .. ": verdict", v, "text")
  if type(v.degenerate) ~= "boolean" then
    A.fail(fname .. ": verdict", "field 'degenerate' must be true or false, got %s", type(v.degenerate))
  end
  num(fname .. ": verdict", v, "threshold", "T/T_F or T/T_c", 1e-300)
  ranking(fname, run.ranking)
  str(fname, run, "reason")
  if run.failure ~= nil then
    tbl(fname, run.failure, "field 'failure'")
    num(fname .. ": failure", run.failure, "index", "", 1)
    str(fname .. ": failure", run.failure, "reason")
  end
end

-- One row of a budget (its start or a stage), as the methods format it.
local function row(where, r)
  tbl(where, r, "the row")
  num(where, r, "index", "", 0)
  if math.type(r.index) ~= "integer" then A.fail(where, "index %s must be an integer", shown(r.index)) end
  for _, k in ipairs { "name", "particles" } do str(where, r, k) end
  num(where, r, "number", "particles", 0)
  num(where, r, "temperature", "K", 1e-300)
  derived(where, r, not (r.number >= 1))
  -- N_out/N_in: above 1 only for a stage that adds particles, which its notes say
  num(where, r, "efficiency", "N_out/N_in", 0)
  num(where, r, "cumulative_efficiency", "N/N_start", 0)
  num(where, r, "duration", "s", 0, nil, { nan = true })
  num(where, r, "elapsed", "s", 0)
  strings(where, r, "notes")
  flags(where, r)
end

-- A budget given to one of its methods (fname "budget:text", ...).
function M.budget(fname, b, Budget)
  if getmetatable(b) ~= Budget then
    A.fail(fname, "expects a budget from plan:run() (call it as %s(...)), got %s",
      (fname:gsub("^budget", "b")),
      type(b) == "table" and "a table that is not a budget" or type(b))
  end
  for _, k in ipairs { "name", "species", "verdict", "reason" } do str(fname, b, k) end
  row(fname .. ": start", b.start)
  tbl(fname, b.stages, "field 'stages'")
  for i = 1, #b.stages do row(string.format("%s: stages[%d]", fname, i), b.stages[i]) end
  ranking(fname, b.ranking)
  strings(fname, b, "safety")
end

return M
