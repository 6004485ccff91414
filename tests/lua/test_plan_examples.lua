-- Runs the example plans in scripts/examples/ and checks what each is meant to show.
local T = require "testlib"
local cp = require "coldprep"


local function run(name)
  local ok, r = pcall(dofile, "../../scripts/examples/" .. name .. ".lua")
  T.check(ok, name .. " runs: " .. tostring(ok or r))
  return ok and r or nil
end

-- EX-1 another species pair: fermionic, reactive 40K87Rb with the universal p-wave loss.
local krb = run("krb_reactive")
if krb then
  T.check(krb.species == "40K87Rb" and krb.final.degeneracy_name == "T/T_F", "KRb: fermionic budget")
  T.check(krb.stages[4].notes[1]:find("universal p-wave", 1, true) ~= nil, "KRb: universal p-wave loss in the hold")
  T.check(krb.stages[4].efficiency < 0.8, "KRb: the reactive hold loses more than 20 %")
  T.check(not krb.degenerate, "KRb without shielding does not reach degeneracy")
end

-- EX-2 a bosonic molecule: judged by T/T_c, and this plan condenses.
local rbcs = run("rbcs_bosons")
if rbcs then
  T.check(rbcs.final.degeneracy_name == "T/T_c" and rbcs.threshold == 1, "RbCs: bosonic threshold T/T_c <= 1")
  T.check(rbcs.degenerate and rbcs.final.degeneracy < 1, "RbCs: the evaporation reaches T < T_c")
end

-- EX-3 the lattice-loading study: slower ramps excite less and leave less entropy.
local rows = run("lattice_loading")
if rows then
  T.check(#rows == 4, "four ramp durations")
  for i = 2, #rows do
    T.check(rows[i].entropy <= rows[i - 1].entropy * (1 + 1e-9),
      string.format("entropy after loading does not grow with a slower ramp (%d)", i))
  end
  T.check(rows[1].entropy > rows[#rows].entropy + 0.1, "the fastest ramp adds visible entropy")
  local note = table.concat(rows[1].budget.stages[4].notes, " ")
  T.check(note:find("loading ramp not adiabatic", 1, true) ~= nil, "the fast ramp is flagged")
  -- 0.6 W per lattice beam is above the 0.5 W Class 4 boundary (IEC 60825-1, docs/planning.md)
  local safety = table.concat(rows[#rows].budget.safety, " ")
  T.check(safety:find("Class 4 laser", 1, true) and safety:find("lattice beams (each of three), 0.6 W", 1, true),
    "the lattice beams are flagged Class 4")
end

-- EX-5 the microwave-detuning study: every setting shields well enough to evaporate.
-- Schindewolf et al., Nature 607, 677 (2022), arXiv:2201.05143, measured elastic/inelastic
-- ratios of at least 460 for microwave-shielded 23Na40K (Rabi frequencies of tens of MHz,
-- blue detunings of a few MHz [M for the settings]) and reached T/T_F = 0.36; the model
-- must give at least that ratio and a degenerate gas at those settings.
local mw = run("microwave_detuning")
if mw then
  T.check(#mw == 10, "ten detunings")
  for _, r in ipairs(mw) do
    T.check(r.ratio >= 460, string.format("elastic/loss %.3g >= 460 at %g MHz", r.ratio, r.detuning_mhz))
    T.check(r.degenerate, string.format("degenerate at %g MHz", r.detuning_mhz))
  end
  -- larger detuning: smaller effective dipole d/sqrt(12 (1 + (Delta/Omega)^2)) (Karman &
  -- Hutson, PRL 121, 163401 (2018))
  T.check(mw[#mw].dipole < mw[1].dipole, "the effective dipole falls with the detuning")
end

-- EX-4 the help examples of cp.plan and of every stage constructor run as pasted (a fresh
-- environment with only cp and the standard library); the budget methods have one.
local function run_example(name, fn)
  local example = (cp.get_help(fn) or ""):match("Example:%s*(.*)$")
  if not example then return T.check(false, name .. ": help text has no example") end
  local env = setmetatable({ cp = cp, print = function() end }, { __index = _G })
  local chunk = load(example, "example", "t", env) or load("return " .. example, "example", "t", env)
  local ok, err = false, "does not compile"
  if chunk then ok, err = pcall(chunk) end
  T.check(ok, name .. " example runs" .. (ok and "" or (": " .. tostring(err))))
end
run_example("cp.plan", cp.plan.new)
for _, k in ipairs { "custom", "associate", "transfer", "remove_atoms", "change_trap", "load_lattice",
  "hold", "evaporate" } do
  run_example("cp.stages." .. k, cp.stages[k])
end
for _, k in ipairs { "run" } do
  T.check((cp.get_help(cp.plan.Plan[k]) or ""):find("Example", 1, true) ~= nil, "plan:" .. k .. " help has an example")
end
local R = require "coldprep.report"
for _, k in ipairs { "print", "text", "write_csv", "write_json" } do
  T.check((cp.get_help(R.Budget[k]) or ""):find("Example", 1, true) ~= nil, "budget:" .. k .. " help has an example")
end

T.done()
