-- coldprep.plan: a preparation plan (the starting atomic mixture and the stages of the
-- sequence), its run into a budget, the verdict and the limiting-stage analysis.
--
--   local plan = cp.plan{name = "...", start = {...}, stages = {...} [, threshold = 0.5]}
--   local budget = plan:run()      -- see coldprep.report for what a budget holds
--
-- cp.plan is both this module and callable (cp.plan{...} is cp.plan.new{...}).
-- The limiting stage is found by perturbation: for each stage in turn its recorded
-- outcome is made slightly better (it loses a fraction `perturbation` less of the
-- particles it lost, and adds that fraction less of the entropy per particle it added)
-- and the stages after it are run again; the stage whose improvement raises the final
-- phase-space density N (hbar w / kB T)^3 most is the one that limits the plan.
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local report = require "coldprep.report"
local common = require "coldprep.stage.common"

local P = {}
local Plan = {}
Plan.__index = Plan

local DEFAULT_THRESHOLD = { fermion = 0.5, boson = 1.0 }
local DEFAULT_PERTURBATION = 0.1

-- An error message from inside the library without the library's own source position
-- ("lua/coldprep/stages.lua:83: "), which tells a user nothing; positions in the user's
-- own files are kept.
local function plain(msg)
  msg = tostring(msg)
  return (msg:gsub("^[^:\n]*coldprep/[%w_/]+%.lua:%d+: ", ""))
end

-- ---- the start ------------------------------------------------------------------------

local CLOUD_KEYS = { "atom", "number", "trap_frequencies", "beam_power", "scattering_length" }

-- One atom cloud of the start at temperature T, checked; `where` is e.g.
-- "plan: start.atoms[2]".
local function start_cloud(where, c, molecule, temperature)
  A.table(where, c, CLOUD_KEYS)
  if type(c.atom) ~= "string" then
    A.fail(where, "missing argument 'atom' (an atom name such as \"40K\")")
  end
  local ok, atom = pcall(cp.species.atom, c.atom)
  if not ok then A.fail(where, "atom '%s' is unknown: %s", c.atom, tostring(atom)) end
  if atom.name ~= molecule.atoms[1] and atom.name ~= molecule.atoms[2] then
    A.fail(where, "atom '%s' is not a constituent of %s (made of %s and %s)", atom.name,
      molecule.name, molecule.atoms[1], molecule.atoms[2])
  end
  local cloud = {
    name = atom.name, mass = atom.mass, statistics = atom.statistics,
    number = A.number(where, c, "number", "atoms", { min = 1 }),
    temperature = temperature,
    trap_frequencies = A.frequencies(where, c, "trap_frequencies"),
    beam_power = A.number(where, c, "beam_power", "W", { optional = true, positive = true }),
    -- the atoms' own s-wave scattering length in the state and field of the plan; it sets
    -- the size of a condensate (default: the atom's a_bb)
    scattering_length = A.number(where, c, "scattering_length", "m",
      { optional = true, default = atom.a_bb, min = -1e-6, max = 1e-6 }),
  }
  local ok, err = pcall(S.derive, cloud)
  if not ok then A.fail(where, "%s", plain(err)) end
  return cloud
end

-- The starting sample from the `start` table of a plan; fname names the caller in
-- messages ("plan", or "plan:run" when a plan's own start is checked again).
local function start_sample(st, fname)
  local where = (fname or "plan") .. ": start"
  A.table(where, st, { "molecule", "temperature", "atoms" })
  if type(st.molecule) ~= "string" then
    A.fail(where, "missing argument 'molecule' (a molecule name such as \"23Na40K\")")
  end
  local ok, mol = pcall(cp.species.molecule, st.molecule)
  if not ok then A.fail(where, "molecule '%s' is unknown: %s", st.molecule, tostring(mol)) end
  if type(st.atoms) ~= "table" or #st.atoms ~= 2 then
    A.fail(where, "argument 'atoms' must list the two atom clouds, {{atom = ..., number = ..., "
      .. "trap_frequencies = ...}, {...}}")
  end
  local T = A.number(where, st, "temperature", "K", { positive = true, max = 1e-3 })
  local atoms = {}
  for i = 1, 2 do
    atoms[i] = start_cloud(string.format("%s.atoms[%d]", where, i), st.atoms[i], mol, T)
  end
  if atoms[1].name == atoms[2].name then
    A.fail(where, "both clouds are %s; %s needs one cloud of %s and one of %s", atoms[1].name,
      mol.name, mol.atoms[1], mol.atoms[2])
  end
  local s = { kind = "atom-mixture", species = mol.name, molecule = mol, atoms = atoms, elapsed = 0 }
  return S.follow(s, atoms[S.minority(atoms)])
end

-- ---- plans ----------------------------------------------------------------------------

-- Check that each stage accepts the kind of sample the stage before it hands on.
local function check_order(stages)
  local kind = "atom-mixture"
  for i, st in ipairs(stages) do
    if not st.accepts[kind] then
      local want = {}
      for k in pairs(st.accepts) do want[#want + 1] = k end
      table.sort(want)
      A.fail(string.format("plan: stage %d (%s)", i, st.name),
        "needs a sample of kind %s, but at this point of the plan it is %s%s",
        table.concat(want, " or "), kind, st.hint and ("; " .. st.hint) or "")
    end
    kind = st.produces or kind
  end
end

-- The checked fields of a plan from arguments {name, start, stages, threshold,
-- perturbation} (start: the table cp.plan takes); fname names the caller in messages.
local function build(fname, args)
  A.table(fname, args, { "name", "start", "stages", "threshold", "perturbation" })
  if args.start == nil then A.fail(fname, "missing argument 'start' (the atomic mixture)") end
  if type(args.stages) ~= "table" or #args.stages == 0 then
    A.fail(fname, "argument 'stages' must be a non-empty list of stages (cp.stages.*{...})")
  end
  for i in pairs(args.stages) do
    if math.type(i) ~= "integer" or i < 1 or i > #args.stages then
      A.fail(fname, "argument 'stages' must be a list; it has the key %s", tostring(i))
    end
  end
  for i = 1, #args.stages do -- (a hole in the list is no key for pairs)
    local st = args.stages[i]
    if getmetatable(st) ~= cp.stages.Stage then
      A.fail(string.format("%s: stage %d", fname, i), "is a %s, not a stage built by cp.stages.*{...}",
        type(st))
    end
  end
  if args.name ~= nil and type(args.name) ~= "string" then
    A.fail(fname, "argument 'name' must be a string")
  end
  local fields = {
    name = args.name or "plan",
    start = start_sample(args.start, fname),
    stages = { table.unpack(args.stages) },
    threshold = A.number(fname, args, "threshold", "T/T_F or T/T_c", { optional = true, positive = true }),
    perturbation = A.number(fname, args, "perturbation", "fraction",
      { optional = true, default = DEFAULT_PERTURBATION, min = 1e-4, max = 0.5 }),
  }
  check_order(fields.stages)
  return fields
end

-- cp.plan.new{start, stages [, name, threshold, perturbation]} -> plan
function P.new(args)
  return setmetatable(build("plan", args), Plan)
end

-- The `start` table cp.plan takes, read back from a plan's starting sample: a plan is a
-- plain table, and a script may have changed its fields since cp.plan built it, so
-- plan:run checks them again as cp.plan does.  In the start the two clouds hold the
-- numbers and the temperature; the followed fields at its top level copy the minority
-- cloud, and a change made there only is refused rather than silently undone.
local function start_args(fname, s)
  local where = fname .. ": start"
  if type(s) ~= "table" or s.kind ~= "atom-mixture" or type(s.molecule) ~= "table"
    or type(s.atoms) ~= "table" then
    A.fail(where, "is not the starting sample cp.plan built (an atom mixture with a molecule "
      .. "record and two atom clouds); build the plan again with cp.plan{...}")
  end
  local atoms = {}
  for i = 1, 2 do
    local c, at = s.atoms[i], string.format("%s.atoms[%d]", where, i)
    if type(c) ~= "table" then A.fail(at, "must be an atom cloud (a table), got %s", type(c)) end
    A.number(at, c, "temperature", "K", { positive = true, max = 1e-3 })
    atoms[i] = { atom = c.name, number = c.number, trap_frequencies = c.trap_frequencies,
      beam_power = c.beam_power, scattering_length = c.scattering_length }
  end
  if s.atoms[1].temperature ~= s.atoms[2].temperature then
    A.fail(where, "the clouds' temperatures %g K and %g K differ; allowed one temperature for "
      .. "both (they start in equilibrium)", s.atoms[1].temperature, s.atoms[2].temperature)
  end
  return { molecule = s.molecule.name, temperature = s.atoms[1].temperature, atoms = atoms }
end

-- The plan's fields checked again (see start_args): {name, start, stages, threshold,
-- perturbation}, the start rebuilt from them.
local function checked(self)
  local fname = "plan:run"
  if getmetatable(self) ~= Plan then
    A.fail(fname, "expects a plan built by cp.plan{...} (call it as plan:run()), got %s",
      type(self) == "table" and "a table that is not a plan" or type(self))
  end
  local fields = build(fname, { name = self.name, start = start_args(fname, self.start),
    stages = self.stages, threshold = self.threshold, perturbation = self.perturbation })
  for _, ku in ipairs { { "number", "atoms" }, { "temperature", "K" } } do
    local k, unit = ku[1], ku[2]
    if self.start[k] ~= fields.start[k] then
      A.fail(fname .. ": start", "%s %s %s is not the %s of its minority cloud (%s %s); in an "
        .. "atom mixture the clouds start.atoms[1] and start.atoms[2] hold the numbers and the "
        .. "temperature: change those", k, A.shown(self.start[k]), unit, k, A.shown(fields.start[k]), unit)
    end
  end
  return fields
end

-- For a mixture the followed fields are copies of the minority cloud: a stage that
-- changed them, not the clouds, would see its change silently undone.
local function check_mixture(before, after, who)
  local m = after.atoms[S.minority(after.atoms)]
  for _, k in ipairs { "number", "temperature" } do
    if after[k] ~= m[k] and after[k] ~= before[k] then
      error(string.format("%s: sample field '%s' changed, but in an atom mixture the clouds "
        .. "s.atoms[1] and s.atoms[2] hold the numbers and temperatures: change those", who, k), 0)
    end
  end
end

-- Run stages first..last on sample s; returns the list of {stage, before, after, info},
-- the final sample and, when a stage's physics did not work out (common.fail), the
-- failure {index, name, reason}: that stage hands on its input unchanged, marked failed,
-- and the stages after it are not run.
local function run_stages(self, s, first, last)
  local steps, failure = {}, nil
  for i = first, last do
    local st = self.stages[i]
    local before = s
    local after, info
    local who = string.format("stage %d (%s)", i, st.name)
    if failure then
      after, info = S.copy(before), { duration = 0, skipped = true,
        notes = { string.format("not run: stage %d (%s) failed", failure.index, failure.name) } }
    elseif S.is_empty(before) then
      after, info = S.copy(before), { duration = 0, notes = { "not run: no particles left" }, skipped = true }
    else
      local ok
      ok, after, info = pcall(st.run, st, S.copy(before))
      local why = not ok and common.failure_reason(after)
      if why then
        failure = { index = i, name = st.name, reason = why }
        after, info = S.copy(before), { duration = 0, failed = why,
          notes = { "FAILED: " .. why .. "; the sample is shown as it entered this stage" } }
      else
        if not ok then error(who .. ": " .. plain(after), 0) end
        S.check(after, who)
        -- the kind a stage hands on is the one the order check assumed
        local want = st.produces or before.kind
        if after.kind ~= want then
          error(string.format("%s: sample field 'kind' = %s, but the stage declares that it hands on "
            .. "%s (give produces = \"%s\" to cp.stages.custom)", who, after.kind, want, after.kind), 0)
        end
        info = info or {}
        after.elapsed = before.elapsed + (info.duration or 0)
        ok, info.error = pcall(function()
          if after.kind == "atom-mixture" then
            check_mixture(before, after, who)
            -- a stage acting on a mixture changes the clouds; the followed fields follow them
            for _, c in ipairs(after.atoms) do S.derive(c) end
            S.follow(after, after.atoms[S.minority(after.atoms)])
          else
            S.derive(after)
          end
        end)
        if not ok then
          local msg = plain(info.error)
          error(msg:find(who, 1, true) == 1 and msg
            or string.format("%s: the sample it hands on is outside the thermodynamics model: %s", who, msg), 0)
        end
        info.error = nil
        local sc = S.semiclassical_note(after)
        if sc then
          info.notes = info.notes or {}
          info.notes[#info.notes + 1] = sc
        end
        if st.adiabatic and before.kind == after.kind
          and after.entropy_per_particle < before.entropy_per_particle * (1 - 1e-6) then
          -- an adiabatic change keeps the entropy per particle or adds to it, never lowers it
          info.notes = info.notes or {}
          table.insert(info.notes, 1, string.format("entropy per particle fell from %.4g to %.4g kB in a "
            .. "stage declared adiabatic: it cannot", before.entropy_per_particle, after.entropy_per_particle))
        end
      end
    end
    steps[#steps + 1] = { index = i, stage = st, before = before, after = after, info = info }
    s = after
  end
  return steps, s, failure
end

-- Cloud `after` made better by a fraction d relative to `before`: a fraction d less of
-- the particles it lost are lost, and a fraction d less of the entropy per particle it
-- added is added (at the new number, by lowering the temperature).
local function improve_cloud(before, after, d)
  local n = after.number
  if n < before.number then n = before.number - (1 - d) * (before.number - n) end
  local better = S.with(after, { number = n })
  local s_after, s_before = after.entropy_per_particle, before.entropy_per_particle
  if S.is_empty(better) or not (s_after > s_before) then return better end
  local s_target = s_before + (1 - d) * (s_after - s_before)
  if s_target < better.entropy_per_particle then
    better = S.with(better, { temperature = S.temperature_for_entropy(better, s_target) })
  end
  return better
end

-- The stage output made better by a fraction d: for an atom mixture each cloud is
-- improved, otherwise the followed particles.
local function improved(d)
  return function(before, after)
    if after.kind ~= "atom-mixture" then
      local better = improve_cloud(before, after, d)
      if before.kind == "atom-mixture" then
        -- the extra molecules of a better association are made of leftover atoms
        local extra = better.number - after.number
        for _, a in ipairs(better.atoms) do a.number = math.max(0, a.number - extra) end
      end
      return better
    end
    local out = S.copy(after)
    for i = 1, 2 do out.atoms[i] = improve_cloud(before.atoms[i], after.atoms[i], d) end
    return S.follow(out, out.atoms[S.minority(out.atoms)])
  end
end

-- The verdict on the final sample (not degenerate when a stage failed).
local function verdict(self, final, failure)
  local stat = final.statistics
  local thr = self.threshold or DEFAULT_THRESHOLD[stat]
  local v = { threshold = thr, degeneracy_name = final.degeneracy_name, degeneracy = final.degeneracy }
  if failure then
    v.degenerate = false
    v.text = string.format("not degenerate: stage %d (%s) failed: %s", failure.index,
      failure.name, failure.reason)
  elseif S.is_empty(final) then
    v.degenerate = false
    v.text = "not degenerate: no molecules survive the plan"
  else
    v.degenerate = final.degeneracy <= thr
    v.text = string.format("%s: final %s = %.3g %s %.3g (%s %s)",
      v.degenerate and "degenerate" or "not degenerate", final.degeneracy_name, final.degeneracy,
      v.degenerate and "<=" or ">", thr, stat == "fermion" and "fermionic" or "bosonic",
      final.kind == "atom-mixture" and final.name or final.species)
  end
  return v
end

-- Rank the stages by the gain in final trap phase-space density when each is improved.
-- A rerun that fails (e.g. the improved sample is already colder than a later
-- evaporation's final temperature) leaves that stage unranked: gain NaN, `failed` = the
-- message, sorted last; the plan's own run is not affected.
local function limiting(self, steps, final)
  local base = final.trap_phase_space_density
  local ranking = {}
  for i = 1, #steps do
    local entry = { index = i, name = steps[i].stage.name }
    if steps[i].info.skipped then
      entry.gain = 0
    else
      -- the stage's recorded outcome, made better, handed to the stages after it
      local ok, f = pcall(function()
        local better = improved(self.perturbation)(steps[i].before, steps[i].after)
        local _, out, failure = run_stages(self, better, i + 1, #steps)
        if failure then
          error(string.format("stage %d (%s) failed: %s", failure.index, failure.name, failure.reason), 0)
        end
        return out
      end)
      if ok then
        entry.gain = (base > 0) and (f.trap_phase_space_density / base - 1) or f.trap_phase_space_density
      else
        entry.gain, entry.failed = 0 / 0, plain(f)
      end
    end
    ranking[#ranking + 1] = entry
  end
  table.sort(ranking, function(a, b)
    if (a.failed ~= nil) ~= (b.failed ~= nil) then return b.failed ~= nil end
    if not a.failed and a.gain ~= b.gain then return a.gain > b.gain end
    return a.index < b.index
  end)
  return ranking
end

-- The plain-language reason for the verdict, naming the limiting stage (or the failed one).
local function reason(self, steps, ranking, v, start, final, failure)
  local parts = {}
  if failure then
    return string.format("Stage %d (%s) failed: %s. The budget shows the sample as it entered "
      .. "that stage; the stages after it were not run, and no stage is ranked.", failure.index,
      failure.name, failure.reason)
  end
  if S.is_empty(final) then
    parts[1] = "No molecules are left at the end of the plan."
  else
    parts[1] = string.format("%d of %.3g starting %s survive as %s (%.3g %%) at %s = %.3g.",
      math.floor(final.number + 0.5), start.number, start.name,
      final.kind == "atom-mixture" and "atoms" or (final.species .. " molecules"),
      100 * final.number / start.number, final.degeneracy_name, final.degeneracy)
  end
  local top = ranking[1]
  if not top then return parts[1] end
  local unranked = {}
  for _, g in ipairs(ranking) do
    if g.failed then unranked[#unranked + 1] = string.format("%d (%s)", g.index, g.name) end
  end
  local st = steps[top.index]
  local kept = st.before.number > 0 and st.after.number / st.before.number or 0
  local ds = st.after.entropy_per_particle - st.before.entropy_per_particle
  local what = { string.format("keeps %.3g %% of the particles", 100 * kept) }
  if ds == ds and ds > 0 then
    what[#what + 1] = string.format("adds %.2g kB of entropy per particle", ds)
  end
  if top.failed then
    parts[2] = "No stage could be ranked: the plan fails when a stage is made better (" .. top.failed .. ")."
  elseif top.gain > 0 then
    parts[2] = string.format("The limiting stage is %d (%s): it %s; making it %.0f %% better would "
      .. "raise the final phase-space density by %.3g %%, more than any other stage.",
      top.index, top.name, table.concat(what, " and "), 100 * self.perturbation, 100 * top.gain)
  else
    parts[2] = "No stage loses particles or adds entropy in a way that limits the final phase-space density."
  end
  if not v.degenerate and ranking[2] and not ranking[2].failed and ranking[2].gain > 0 then
    parts[3] = string.format("Next: stage %d (%s), %+.3g %%.", ranking[2].index, ranking[2].name,
      100 * ranking[2].gain)
  end
  if #unranked > 0 and not top.failed then
    parts[#parts + 1] = string.format("Not ranked, because a later stage fails when they are made "
      .. "better: %s.", table.concat(unranked, ", "))
  end
  return table.concat(parts, " ")
end

-- plan:run([{limiting = true}]) -> budget (see coldprep.report).  limiting = false skips
-- the limiting-stage analysis (one rerun per stage), e.g. inside a sweep.
function Plan:run(opts)
  local plan = checked(self)
  if opts ~= nil then
    A.table("plan:run", opts, { "limiting" })
    if opts.limiting ~= nil and type(opts.limiting) ~= "boolean" then
      A.fail("plan:run", "argument 'limiting' must be true or false, got %s", type(opts.limiting))
    end
  end
  local steps, final, failure = run_stages(plan, plan.start, 1, #plan.stages)
  local v = verdict(plan, final, failure)
  local ranking = ((opts and opts.limiting == false) or failure) and {} or limiting(plan, steps, final)
  return report.budget {
    plan = plan, start = plan.start, steps = steps, final = final, verdict = v, failure = failure,
    ranking = ranking, reason = reason(plan, steps, ranking, v, plan.start, final, failure),
  }
end

P.Plan = Plan

-- cp.plan{...}: a bad plan is reported at the line of the file that wrote it
setmetatable(P, { __call = function(_, args)
  local ok, plan = pcall(P.new, args)
  if not ok then error(plan, 2) end
  return plan
end })

cp.set_help(P.new, [[
cp.plan{start = {...}, stages = {...} [, name, threshold, perturbation]} -> plan
  (cp.plan{...} and cp.plan.new{...} are the same)
start = {molecule = "23Na40K", temperature = 250*nK (K, both clouds in equilibrium), atoms = {
           {atom = "23Na", number = 3e5, trap_frequencies = {wx, wy, wz}},
           {atom = "40K",  number = 1.5e5, trap_frequencies = {...}}}}
  trap_frequencies: angular, rad/s (one number = isotropic); optional beam_power (W) of
  the trap beams, used only for the safety cautions; optional scattering_length (m), the
  atoms' own s-wave scattering length in the plan's state and field (default the atom's
  a_bb, cp.species.atom): it sets the size of a condensate.  Degeneracy of each cloud is
  computed.
stages: a list built with cp.stages.* (help(cp.stages) lists them); the order is checked.
threshold: the degeneracy threshold (default T/T_F <= 0.5 for fermionic molecules,
  T/T_c <= 1 for bosonic ones); perturbation: how much better a stage is made when
  looking for the limiting stage (fraction, default 0.1).
plan:run() -> budget with stages, final, degenerate, verdict, limiting_stage, reason,
  failed_stage (index of a stage whose physics did not work out, e.g. an evaporation that
  never reaches its final temperature: marked failed, verdict "not degenerate");
  budget:print(), budget:write_csv(path), budget:write_json(path).  A full scenario:
  scripts/demo.lua and docs/planning.md.
Example:
  w = 2*math.pi*100
  p = cp.plan{start = {molecule = 'KRb', temperature = 300e-9, atoms = {
        {atom = '87Rb', number = 2e5, trap_frequencies = w},
        {atom = '40K', number = 1e5, trap_frequencies = w}}},
      stages = {cp.stages.associate{ramp_rate = 10}, cp.stages.transfer{efficiency = 0.9},
                cp.stages.hold{duration = 0.05}}}
  print(p:run().verdict)]])
cp.set_help(Plan.run, [[
plan:run([{limiting = true}]) -> budget: runs every stage, then reruns the plan from each
stage's outcome made `perturbation` better to find the limiting stage (limiting = false
skips that analysis, e.g. inside a sweep).
budget.stages[i] = {name, number, temperature (K), t_over_tf | t_over_tc, peak_density (m^-3),
  phase_space_density, entropy_per_particle (kB), efficiency, cumulative_efficiency,
  duration (s), elapsed (s), failed, failure, flags, notes [, lattice: load_lattice's lattice
  state]}; budget.final, budget.degenerate, budget.verdict, budget.limiting_stage,
  budget.reason, budget.ranking ({index, name, gain [, failed]}), budget.failed_stage and
  budget.failure when a stage failed.
Example (p from help(cp.plan)): b = p:run(); print(b.final.number, b.limiting_stage)]])

return P
