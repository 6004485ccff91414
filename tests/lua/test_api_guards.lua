-- The guards of the API fuzzer's findings in the Lua layer (tests/fuzz): budget methods and
-- plan:run called on something that is not a budget or a plan, a plan or a plan run whose
-- fields a script changed (NaN, wrong types, steps out of order), the species lookups'
-- error positions, the plumbing functions' argument errors, and the list of user-added
-- names in a species binding's not-found message.  Every error must be in the house form
-- "<context>: ..." (DEVELOPERS.md), never a Lua runtime error, a raw "bad argument" or a
-- position inside the library's own files.  These are checks of behaviour, not physics:
-- no published value is involved.
package.path = arg[0]:match("(.*/)") .. "?.lua;" .. package.path
local T = require "testlib"

-- no Lua runtime error, no raw argument error, no position inside lua/coldprep
local function house(msg)
  msg = tostring(msg)
  return not msg:find("attempt to ", 1, true) and not msg:find("bad argument #", 1, true)
    and not msg:find("coldprep/[%w_/]+%.lua:%d+:")
end

local function raises_house(name, fragment, f, ...)
  local ok, err = pcall(f, ...)
  if ok then err = "no error raised" end -- (the result itself may not print)
  T.expect(name .. " (raises)", not ok)
  T.expect(name .. " (house form)", not ok and house(err), err)
  T.expect(name .. " (names '" .. fragment .. "')", not ok and tostring(err):find(fragment, 1, true) ~= nil, err)
end

local w = 2 * math.pi * 100
local function new_plan()
  return cp.plan { start = { molecule = "KRb", temperature = 300e-9, atoms = {
    { atom = "87Rb", number = 2e5, trap_frequencies = w, beam_power = 2 },
    { atom = "40K", number = 1e5, trap_frequencies = w } } },
    stages = { cp.stages.associate { ramp_rate = 10 }, cp.stages.transfer { efficiency = 0.9 },
      cp.stages.hold { duration = 0.05 } } }
end

-- ---- budget methods check self (report.lua) -------------------------------------------
local b = new_plan():run()
for _, m in ipairs { "text", "print", "write_csv", "write_json" } do
  raises_house("budget:" .. m .. " on a number", "budget:" .. m .. ": expects a budget", b[m], 5)
  raises_house("budget:" .. m .. " on a plain table", "not a budget", b[m], {})
end
raises_house("tostring of an empty table with the budget metatable", "budget:text",
  tostring, setmetatable({}, getmetatable(b)))
b.stages[2].temperature = "cold"
raises_house("budget:text with a stage temperature that is a string", "stages[2]: field 'temperature' must be a number (K)",
  b.text, b)
b = new_plan():run()
b.start.number = 0 / 0
raises_house("budget:write_csv with a NaN start number", "start: number NaN particles is not a number; allowed [0, inf]",
  b.write_csv, b, os.tmpname())
b = new_plan():run()
b.stages[1].notes[1] = {}
raises_house("budget:print with a note that is a table", "notes[1] must be a string", b.print, b, io.stdout)

-- ---- cp.report.budget checks the run it formats ---------------------------------------
-- the run plan:run hands over, captured once
local captured
do
  local real = cp.report.budget
  cp.report.budget = function(run) captured = run; return real(run) end
  new_plan():run()
  cp.report.budget = real
end
T.expect("the plan run is captured", type(captured) == "table")
local function copy(t, seen)
  if type(t) ~= "table" or getmetatable(t) then return t end
  seen = seen or {}
  if seen[t] then return seen[t] end
  local c = {}
  seen[t] = c
  for k, v in pairs(t) do c[k] = copy(v, seen) end
  return c
end
T.expect("the captured run formats", pcall(cp.report.budget, copy(captured)))
raises_house("report.budget of a number", "report.budget: expects one table", cp.report.budget, 5)
local r = copy(captured)
r.start = nil
raises_house("report.budget without a start", "report.budget: start: the sample must be a table", cp.report.budget, r)
-- the plan's fields are named once, under the function's context (not "plan: field 'plan'")
r = copy(captured)
r.plan = nil
raises_house("report.budget without a plan", "report.budget: field 'plan' must be a table, got nil",
  cp.report.budget, r)
r = copy(captured)
r.plan.start.atoms[2] = 7
raises_house("report.budget with a number for an atom cloud",
  "report.budget: plan.start.atoms[2]: the atom cloud must be a table, got number", cp.report.budget, r)
r = copy(captured)
r.plan.name = 7
raises_house("report.budget with a number for the plan's name",
  "report.budget: plan: field 'name' must be a string, got number", cp.report.budget, r)
r = copy(captured)
r.steps[2].after.temperature = 0 / 0
raises_house("report.budget with a NaN temperature", "steps[2]: after: sample field temperature NaN K is not a number",
  cp.report.budget, r)
r = copy(captured)
r.steps[3].before = copy(r.steps[3].before) -- no longer the sample step 2 handed on
r.steps[3].before.number = 3
raises_house("report.budget with a step that does not start where the one before ended",
  "steps[3]: before: number 3 particles is not the number the step before handed on", cp.report.budget, r)
r = copy(captured)
r.steps[1].after.degeneracy = -1
raises_house("report.budget with a negative degeneracy", "degeneracy -1 is out of range; allowed [0, inf]",
  cp.report.budget, r)
r = copy(captured)
r.ranking[1].gain = "big"
raises_house("report.budget with a ranking gain that is a string", "ranking[1]: field 'gain' must be a number",
  cp.report.budget, r)
r = copy(captured)
r.steps[1].before.number, r.start.number = 0.5, 0.5
raises_house("report.budget with a start of half a particle", "start: number 0.5 particles is out of range; allowed [1, inf]",
  cp.report.budget, r)
r = copy(captured)
r.verdict.degenerate = { 0 / 0 }
raises_house("report.budget with a verdict that is not true or false", "verdict: field 'degenerate' must be true or false",
  cp.report.budget, r)
r = copy(captured)
r.start.species = 0 / 0
raises_house("report.budget with a species that is NaN", "start: field 'species' must be a string", cp.report.budget, r)

-- a stage that adds particles: the step efficiency N_out/N_in above 1 comes with its note
local grow = cp.plan { start = { molecule = "KRb", temperature = 300e-9, atoms = {
  { atom = "87Rb", number = 2e5, trap_frequencies = w }, { atom = "40K", number = 1e5, trap_frequencies = w } } },
  stages = { cp.stages.associate { ramp_rate = 10 },
    cp.stages.custom { name = "reload", accepts = { "feshbach-molecules" }, fn = function(s)
      s.number = 2 * s.number
      return s
    end } } }:run({ limiting = false })
T.expect("a stage that doubles the number has step efficiency 2", math.abs(grow.stages[2].efficiency - 2) < 1e-12,
  grow.stages[2].efficiency)
T.expect("... and its first note says so", grow.stages[2].notes[1]:find("rose by a factor 2", 1, true) ~= nil,
  grow.stages[2].notes[1])

-- the equipment a custom stage declares is checked when the stage is built (before, a coil
-- without its field failed in the safety cautions at run time with a Lua runtime error)
raises_house("stages.custom with a coil of no field", "stages.custom: equipment[1]: missing argument 'field' (T)",
  cp.stages.custom, { name = "x", fn = function(s) return s end, equipment = { { kind = "coil" } } })
raises_house("stages.custom with equipment of an unknown kind", "equipment[1]: kind oven is not allowed; allowed coil, electric, laser, microwave",
  cp.stages.custom, { name = "x", fn = function(s) return s end, equipment = { { kind = "oven" } } })

-- ---- plan:run checks self and the plan's fields (plan.lua) ------------------------------
local p = new_plan()
raises_house("plan:run on a number", "plan:run: expects a plan built by cp.plan", p.run, 5)
raises_house("plan:run on a plain table", "not a plan", p.run, {})
p = new_plan()
p.start.atoms[2].number = 0 / 0
raises_house("plan:run with a NaN cloud number", "plan:run: start.atoms[2]: number NaN atoms is not a number; allowed finite values (atoms)",
  p.run, p)
p = new_plan()
p.start.temperature = 0 / 0
raises_house("plan:run with a NaN start temperature", "plan:run: start: temperature NaN K is not the temperature of its minority cloud",
  p.run, p)
p = new_plan()
p.start.atoms[1].temperature = 1e-6
raises_house("plan:run with clouds at two temperatures", "temperatures 1e-06 K and 3e-07 K differ", p.run, p)
p = new_plan()
p.start.molecule = 5
raises_house("plan:run with a start molecule that is a number", "plan:run: start: is not the starting sample", p.run, p)
p = new_plan()
p.stages[2] = 7
raises_house("plan:run with a stage that is a number", "plan:run: stage 2: is a number", p.run, p)
p = new_plan()
p.stages[2] = nil -- a hole: the list keeps its length 3 (border) for pairs-free code
raises_house("plan:run with a hole in its stages", "plan:run: ", p.run, p)
p = new_plan()
p.perturbation = 2
raises_house("plan:run with perturbation 2", "plan:run: perturbation 2 fraction is out of range; allowed [0.0001, 0.5]",
  p.run, p)
p = new_plan()
T.expect("an unchanged plan still runs", pcall(p.run, p))

-- a model's error inside a stage is reported without the library's position (stage/models.lua)
p = new_plan()
p.start.atoms[1].name = "40K" -- both clouds the same atom: refused when the plan is checked again
raises_house("plan:run with both clouds of one atom", "plan:run: start: both clouds are 40K", p.run, p)
do
  local st = cp.stages.custom { name = "nan model", fn = function(s)
    cp.thermo.fermi { number = s.number, omega_bar = 0 / 0, temperature = s.temperature, mass = s.mass }
    return s
  end }
  local q = cp.plan { start = { molecule = "KRb", temperature = 300e-9, atoms = {
    { atom = "87Rb", number = 2e5, trap_frequencies = w }, { atom = "40K", number = 1e5, trap_frequencies = w } } },
    stages = { st } }
  -- the model is called from the test's own function: its position is this file's, kept
  local ok, err = pcall(q.run, q)
  T.expect("a model error in a custom stage keeps the user's position", not ok
    and tostring(err):find("test_api_guards.lua:%d+: thermo.fermi") ~= nil, err)
end
do
  -- a model called by the library (stage/models.lua) with a sample a custom stage spoiled:
  -- the message names the stage and the model, not lua/coldprep/stage/models.lua
  local spoil = cp.stages.custom { name = "spoil", fn = function(s)
    s.atoms[1].name = 5 -- not an atom name: cp.feshbach.overlap_density refuses it
    return s
  end }
  local q = cp.plan { start = { molecule = "KRb", temperature = 300e-9, atoms = {
    { atom = "87Rb", number = 2e5, trap_frequencies = w }, { atom = "40K", number = 1e5, trap_frequencies = w } } },
    stages = { spoil, cp.stages.associate { ramp_rate = 10 } } }
  local ok, err = pcall(q.run, q)
  T.expect("a library model's error in a stage is in the house form", not ok and house(err), err)
  T.expect("... naming the stage and the model", not ok
    and tostring(err):find("stage 2 (associate): feshbach.overlap_density: cloud 'a'", 1, true) == 1, err)
end

-- ---- species.lua: errors at the caller's position ---------------------------------------
local function position_here(f, ...)
  local args = table.pack(...)
  local ok, err = pcall(function() f(table.unpack(args, 1, args.n)) end)
  return not ok and tostring(err):match("^[^:]*test_api_guards%.lua:%d+: ") ~= nil, err
end
T.expect("species.resonance of an unknown molecule names the caller's line", position_here(cp.species.resonance, "1e3"))
T.expect("species.resonance with a bad index names the caller's line", position_here(cp.species.resonance, "KRb", 0))
T.expect("species.add_resonance of an unknown molecule names the caller's line",
  position_here(cp.species.add_resonance, { molecule = "Zz", b0 = 0.05, width = 1e-4, abg = 1e-9, dmu = 1e-23 }))
T.expect("species.add_molecule of an unknown atom names the caller's line",
  position_here(cp.species.add_molecule, { name = "QQ", atoms = { "Zz", "40K" }, dipole_debye = 1, rot_const_hz = 1e9, c6_au = 1e4 }))
raises_house("species.add_resonance with a molecule that is a number", "species.add_resonance: argument 'molecule' must be a molecule name",
  cp.species.add_resonance, { molecule = 1e308, b0 = 0.05, width = 1e-4, abg = 1e-9, dmu = 1e-23 })
raises_house("feshbach.binding_energy with an unknown resonance name", "species: unknown molecule",
  cp.feshbach.binding_energy, { resonance = "Zz", field = 0.05, molecule = "KRb" })
T.expect("species.atom still returns a record", cp.species.atom("40K").statistics == "fermion")

-- ---- the plumbing (bind_species.c, module.c): house errors ------------------------------
for _, name in ipairs { "builtin_atom", "builtin_molecule", "builtin_resonance", "builtin_suggest",
  "builtin_polarizability", "builtin_user_key" } do
  raises_house("species." .. name .. " of a table", "species." .. name .. ": expects a species name (string), got table",
    cp.species[name], {})
end
raises_house("species.builtin_resonance with index 1.5", "argument 2 'index' must be an integer", cp.species.builtin_resonance, "KRb", 1.5)
raises_house("species.builtin_resonance with index 0", "index 0 is out of range; allowed [1, 1000]", cp.species.builtin_resonance, "KRb", 0)
raises_house("species.builtin_polarizability without a wavelength", "argument 2 'wavelength' must be a number (m)",
  cp.species.builtin_polarizability, "87Rb")
T.expect("species.builtin_user_tables returns three tables", select("#", cp.species.builtin_user_tables()) == 3)
raises_house("cp.set_help of a table without text", "cp.set_help: argument 2 'text' must be a string", cp.set_help, {})
raises_house("cp.set_help of NaN", "cp.set_help: argument 1", cp.set_help, 0 / 0, "text")
raises_house("cp.get_help of nothing", "cp.get_help: argument 1", cp.get_help)

-- ---- the user-added names in a binding's not-found message (bind_species.c) -------------
-- 200 names overflow the message buffer, which the old code grew with other values on the
-- stack above it (a heap use after free under AddressSanitizer, a crash without)
for i = 1, 200 do
  cp.species.add_atom { name = string.format("Userium%03d", i), mass_u = 10, statistics = "boson" }
end
local ok, err = pcall(cp.feshbach.binding_energy, { resonance = "Zz", field = 0.05, molecule = "KRb" })
T.expect("not found with 200 user-added names: an error", not ok)
T.expect("... listing the first names in order", tostring(err):find("user-added: QQ, Userium001, Userium002", 1, true) ~= nil
  or tostring(err):find("user-added: Userium001, Userium002", 1, true) ~= nil, err)
T.expect("... and the count of the rest", tostring(err):find(" and %d+ more$") ~= nil, err)

T.done()
