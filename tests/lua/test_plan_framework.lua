-- Lua-level tests of the plan framework (cp.plan, cp.stages.custom, the verdict, the
-- limiting-stage analysis and the report) with user-defined stages whose effect is known,
-- checked against closed forms worked out here by hand.
local T = require "testlib"
local cp = require "coldprep"
local u, c = cp.units, cp.consts
local pi = math.pi

-- A hot, dilute start (T/T_F ~ 16 for the 40K minority), where the ideal gas is classical
-- to ~1e-5: S/N = 4 - ln rho with rho = N (hbar w / kB T)^3 (harmonic trap, Boltzmann
-- statistics: the Sackur-Tetrode analogue, Pethick & Smith ch. 2 [M]).
local W = 2 * pi * 100
local T0 = 3 * u.uK
local function start(nk)
  return { molecule = "23Na40K", temperature = T0, atoms = {
    { atom = "23Na", number = 5e4, trap_frequencies = W },
    { atom = "40K", number = nk or 1e4, trap_frequencies = { W, W, W } } } }
end

-- Makes molecules out of a fraction `f` of the minority atoms, same T and trap.
local function convert(f)
  return cp.stages.custom { name = "convert", accepts = "atom-mixture", produces = "feshbach-molecules",
    fn = function(s)
    local n = f * s.number
    s.number, s.mass, s.statistics = n, s.molecule.mass, s.molecule.statistics
    for _, a in ipairs(s.atoms) do a.number = a.number - n end
    return s, { duration = 2 * u.ms, notes = { "converted" } }
  end }
end
local function keep(k, name)
  return cp.stages.custom { name = name or "keep", fn = function(s)
    s.number = s.number * k
    return s, { duration = 10 * u.ms }
  end }
end
local function heat(h, name)
  return cp.stages.custom { name = name or "heat", fn = function(s)
    s.temperature = s.temperature * h
    return s, { duration = 5 * u.ms }
  end }
end
local function rho(N, T, w) return N * (c.hbar * w / (c.kB * T)) ^ 3 end

-- PLAN-F1: the start's degeneracy is computed from the model: T_F = hbar w (6N)^(1/3)/kB
-- (Butts & Rokhsar 1997; docs/models/thermo.md), entropy as the classical limit above.
local plan = cp.plan { name = "framework", start = start(), stages = { convert(0.3), heat(2), keep(0.1) } }
local b = plan:run()
local TF = c.hbar * W * (6 * 1e4) ^ (1 / 3) / c.kB
T.near(b.start.degeneracy, T0 / TF, 1e-6, "start T/T_F of 40K by hand")
T.check(b.start.degeneracy_name == "T/T_F", "40K minority: fermionic degeneracy")
T.near(b.start.entropy_per_particle, 4 - math.log(rho(1e4, T0, W)), 1e-4, "classical entropy per particle")
T.check(b.start.particles == "40K atoms", "the minority species is followed")

-- PLAN-F2: bookkeeping: numbers, efficiencies, durations, elapsed.
T.near(b.stages[1].number, 3e3, 1e-12, "convert keeps 30 % of 1e4")
T.near(b.stages[3].number, 300, 1e-12, "keep 10 %")
T.near(b.stages[2].temperature, 2 * T0, 1e-12, "heat doubles T")
T.near(b.stages[1].efficiency, 0.3, 1e-12, "convert: step efficiency 30 %")
T.near(b.stages[2].efficiency, 1, 1e-12, "heating: step efficiency 100 %")
T.near(b.stages[3].efficiency, 0.1, 1e-12, "keep: step efficiency 10 %")
T.near(b.final.cumulative_efficiency, 0.03, 1e-12, "cumulative efficiency 0.3 x 0.1")
T.near(b.final.elapsed, 17 * u.ms, 1e-12, "elapsed = sum of durations")
T.check(b.stages[1].kind == "feshbach-molecules" and b.stages[1].particles == "23Na40K (Feshbach)",
  "custom stage with produces= changes the kind")
T.near(b.final.degeneracy, 2 * T0 / (c.hbar * W * (6 * 300) ^ (1 / 3) / c.kB), 1e-6,
  "final T/T_F of the molecules by hand")
T.check(b.degenerate == false and b.verdict:find("not degenerate", 1, true), "hot plan is not degenerate")

-- PLAN-F3: limiting stage by perturbation (d = 0.1).  Classical gas, later stages scale N
-- and T: a stage keeping k at fixed T gains (1 - (1-d)(1-k))/k - 1; a stage heating by h
-- at fixed N adds 3 ln h of entropy, of which (1-d) remains, so T' = T h^(1-d) and the
-- final rho gains h^(3d) - 1 (derived here from S/N = 4 - ln rho).
local gain = {}
for _, g in ipairs(b.ranking) do gain[g.name] = g.gain end
T.near(gain.keep, (1 - 0.9 * 0.9) / 0.1 - 1, 2e-3, "gain of the 10 % stage")
T.near(gain.heat, 2 ^ 0.3 - 1, 2e-3, "gain of the heating stage")
T.check(b.limiting_stage == "keep" and b.limiting_index == 3, "the lossy stage limits")
T.check(b.reason:find("stage is 3 (keep)", 1, true) ~= nil, "reason names the limiting stage")

-- PLAN-F3a: the rerun from a better association takes the extra molecules out of the
-- leftover atoms: 5e4 Na + 1e4 K, half the K converted -> 5e3 molecules, 4.5e4 Na left;
-- made 10 % better: 1e4 - 0.9 * 5e3 = 5.5e3 molecules, so 4.45e4 Na left (by hand).
local seen = {}
local recorder = cp.stages.custom { name = "look", accepts = { "feshbach-molecules" }, fn = function(s)
  seen[#seen + 1] = s.atoms[1].number
  return s
end }
cp.plan { start = start(), stages = { convert(0.5), recorder } }:run()
T.near(seen[1], 4.5e4, 1e-12, "leftover Na after the association")
T.near(seen[2], 4.45e4, 1e-12, "leftover Na in the rerun from the better association")

-- PLAN-F3b: the analysis can be skipped (for sweeps); the rest of the budget is the same.
local quick = plan:run { limiting = false }
T.check(quick.limiting_stage == nil and #quick.ranking == 0, "limiting = false: no ranking")
T.near(quick.final.degeneracy, b.final.degeneracy, 1e-12, "limiting = false: same final state")
T.raises(function() plan:run { limting = false } end, { "plan:run", "did you mean 'limiting'" }, "run option checked")
T.raises(function() plan:run { limiting = "no" } end, { "plan:run", "'limiting'", "true or false" },
  "run option is a boolean (\"no\" ran the analysis)")

-- PLAN-F4: the threshold is settable and flips the verdict.
local pass = cp.plan { start = start(), stages = { convert(1) }, threshold = 50 }:run()
T.check(pass.degenerate and pass.threshold == 50, "threshold 50 passes a T/T_F ~ 20 gas")
T.check(pass.verdict:find("<= 50", 1, true) ~= nil, "verdict states the threshold")

-- PLAN-F5: a plan whose numbers all improve never gets a worse verdict.
local worse = cp.plan { start = start(1e4), stages = { convert(0.2), heat(1.5), keep(0.3) } }:run()
local better = cp.plan { start = start(2e4), stages = { convert(0.4), heat(1.2), keep(0.6) } }:run()
T.check(better.final.degeneracy < worse.final.degeneracy, "better numbers: lower T/T_F")

-- PLAN-F6: bad plans name the stage and the field.
T.raises(function() cp.plan { start = start(), stages = { keep(0.5), cp.stages.transfer { efficiency = 0.9 } } } end,
  { "stage 2 (transfer)", "feshbach-molecules", "atom-mixture" }, "transfer before association")
T.raises(function() cp.plan { start = start(), stages = { cp.stages.remove_atoms {} } } end,
  { "stage 1 (remove_atoms)", "after association" }, "removal before association")
T.raises(function() cp.plan { start = start(), stages = { convert(0.5), convert(0.5) } } end,
  { "stage 2 (convert)", "atom-mixture", "feshbach-molecules" }, "custom stage accepts= is checked")
T.raises(function() cp.stages.transfer { rabi_pump = 1e7, rabi_stokes = 1e7, delay = 1e-6, gamma = 1e7 } end,
  { "stages.transfer", "missing argument 'width'" }, "missing pulse width")
T.raises(function() cp.stages.hold { duraton = 1 } end,
  { "stages.hold", "unknown argument 'duraton'", "did you mean 'duration'" }, "misspelt key")
T.raises(function() cp.stages.hold { duration = -1 } end,
  { "stages.hold", "duration -1 s is out of range" }, "negative duration")
T.raises(function() cp.stages.hold { duration = 0 / 0 } end,
  { "stages.hold", "duration NaN s is not a number", "finite" }, "NaN duration")
T.raises(function() cp.stages.evaporate { eta = 8, keep = 0.3 } end,
  { "stages.evaporate", "electric_field" }, "evaporation without a collision source")
local s0 = start()
s0.temperature = nil
T.raises(function() cp.plan { start = s0, stages = { keep(1) } } end,
  { "plan: start", "missing argument 'temperature'" }, "start without temperature")
s0 = start()
s0.atoms[2].number = nil
T.raises(function() cp.plan { start = s0, stages = { keep(1) } } end,
  { "plan: start.atoms[2]", "missing argument 'number'" }, "cloud without number")
s0 = start()
s0.molecule = "NaXe"
T.raises(function() cp.plan { start = s0, stages = { keep(1) } } end,
  { "plan: start", "molecule 'NaXe' is unknown" }, "unknown molecule")
s0 = start()
s0.atoms[1].atom = "87Rb"
T.raises(function() cp.plan { start = s0, stages = { keep(1) } } end,
  { "plan: start.atoms[1]", "'87Rb' is not a constituent of 23Na40K" }, "wrong atom for the molecule")
T.raises(function() cp.plan { start = start(), stages = { keep(1), "hold" } } end,
  { "plan: stage 2", "not a stage" }, "a string is not a stage")
T.raises(function() cp.plan { start = start(), stages = {} } end, { "plan", "'stages'" }, "no stages")
T.raises(function() cp.plan { start = start(), stages = { keep(1) }, threshhold = 1 } end,
  { "unknown argument 'threshhold'", "'threshold'" }, "misspelt plan key")

-- PLAN-F7: a custom stage that breaks the sample is reported with the stage and the field.
local bad = cp.stages.custom { name = "breaker", fn = function(s) s.temperature = -1; return s end }
T.raises(function() cp.plan { start = start(), stages = { bad } }:run() end,
  { "stage 1 (breaker)", "sample field temperature -1 K is out of range" }, "negative temperature from a custom stage")
local raiser = cp.stages.custom { name = "raiser", fn = function() error("lab on fire") end }
T.raises(function() cp.plan { start = start(), stages = { raiser } }:run() end,
  { "stage 1 (raiser)", "lab on fire" }, "an error inside a custom stage names it")
T.raises(function() cp.stages.custom { fn = function() end } end,
  { "stages.custom", "'name'" }, "custom stage without a name")

-- PLAN-F7b: a custom stage that changes what it must not, or hands on a sample outside the
-- thermodynamics model, is an error naming the stage and the field (not a silent no-op or
-- a message from deep inside the library).
local top_only = cp.stages.custom { name = "lose half", fn = function(s) s.number = s.number / 2; return s end }
T.raises(function() cp.plan { start = start(), stages = { top_only } }:run() end,
  { "stage 1 (lose half)", "'number'", "s.atoms[1]" }, "mixture changed through s.number, not s.atoms")
local magic = cp.stages.custom { name = "magic", fn = function(s) s.kind = "ground-state-molecules"; return s end }
T.raises(function() cp.plan { start = start(), stages = { magic, keep(1) } }:run() end,
  { "stage 1 (magic)", "'kind'", "produces" }, "undeclared change of kind")
local frozen = cp.stages.custom { name = "freeze", fn = function(s) s.temperature = 1e-15; return s end }
local err = select(2, pcall(function() cp.plan { start = start(), stages = { convert(0.5), frozen } }:run() end))
T.check(tostring(err):find("^stage 2 %(freeze%): .*temperature") ~= nil
  and not tostring(err):find("coldprep/", 1, true), "too cold a sample: named stage, no library path: " .. tostring(err))
T.raises(function() cp.plan { start = start(), stages = { cp.stages.custom { name = "n", fn = function(s)
  return s, { notes = "one note" } end } } }:run() end, { "stage 1 (n)", "'notes'" }, "notes must be a list")
local fake = cp.stages.custom { name = "magic cooling", adiabatic = true, fn = function(s)
  s.temperature = s.temperature / 2; return s end }
local fb = cp.plan { start = start(), stages = { convert(0.5), fake } }:run { limiting = false }
T.check(fb.stages[2].notes[1]:find("declared adiabatic", 1, true) ~= nil,
  "an 'adiabatic' stage that lowers the entropy per particle is flagged")
-- 2 nK in a 100 Hz trap is kB T / (hbar w) = 2e-9 * 1.380649e-23 / (1.054571817e-34 * 2 pi
-- 100) = 0.42 (by hand, CODATA 2018): far from the semiclassical regime the thermo model
-- assumes; 3 uK (the start) is 625, fine.
local few = cp.plan { start = start(), stages = { convert(0.5), cp.stages.custom { name = "deep cool",
  fn = function(s) s.number, s.temperature = 50, 2e-9; return s end } } }:run { limiting = false }
local semi = table.concat(few.stages[2].notes, " ")
T.check(semi:find("kB T is only 0.42 hbar omega_bar", 1, true) ~= nil, "semiclassical limit flagged: " .. semi)
T.check(not table.concat(few.stages[1].notes, " "):find("hbar omega_bar", 1, true), "hot sample: no note")
local grow = cp.plan { start = start(), stages = { convert(0.5), keep(2, "reload") } }:run { limiting = false }
T.check(grow.stages[2].notes[1]:find("rose by a factor 2", 1, true) ~= nil, "a stage that adds particles is flagged")
local s1 = start()
s1.atoms[1].trap_frequencies = 1e-5
T.raises(function() cp.plan { start = s1, stages = { keep(1) } } end,
  { "plan: start.atoms[1]", "trap_frequencies 1e-05 rad/s is out of range" }, "absurd trap frequency")
s1 = start()
s1.temperature = 1e-14
T.raises(function() cp.plan { start = s1, stages = { keep(1) } } end,
  { "plan: start.atoms[1]", "temperature" }, "a temperature below the model's range names the cloud")

-- PLAN-F8: losing everything is a verdict, not a crash.
local gone = cp.plan { start = start(), stages = { convert(0.5), keep(1e-9, "wipe"), heat(2) } }:run()
T.check(not gone.degenerate and gone.verdict:find("no molecules survive", 1, true), "empty plan verdict")
T.check(gone.stages[3].notes[1]:find("no particles left", 1, true) ~= nil, "later stages marked not run")

-- PLAN-F9: the printed table is aligned and has units; CSV follows RFC 4180; JSON.
local text = b:text()
local rows, in_table = {}, false
for line in text:gmatch("[^\n]+") do
  if line:match("^ # ") then in_table = true end
  if line:match("^T/Tdeg") then in_table = false end
  if in_table then rows[#rows + 1] = line end
end
T.check(#rows == 6, "header, units, start and three stages")
local width_ok = true
for _, r in ipairs(rows) do width_ok = width_ok and #r == #rows[1] end
T.check(width_ok, "all table rows have the same width")
T.check(text:find("nK", 1, true) and text:find("cm^-3", 1, true) and text:find("ms", 1, true), "units shown")
T.check(text:find("Safety:", 1, true) and text:find("laser safety officer", 1, true), "ends with safety")

-- A label longer than its column, with a line break and non-ASCII letters, widens the
-- column instead of shifting its row: every row's particles column starts under the
-- header (positions counted in characters, utf8.len).
local long = cp.plan { start = start(), stages = { convert(0.5),
  keep(0.9, "µwave clean, \"fast\"\nwith a very long label") } }:run { limiting = false }
local lrows = {}
for line in long:text():gmatch("[^\n]+") do
  if line:match("^T/Tdeg") then break end
  if line:find("particles", 1, true) or line:find("40K atoms", 1, true) or line:find("(Feshbach)", 1, true) then
    lrows[#lrows + 1] = line
  end
end
T.check(#lrows == 4, "long label: header, start and two stages on one line each")
local col = utf8.len(lrows[1]:sub(1, lrows[1]:find("particles", 1, true) - 1))
for i = 2, #lrows do
  local at = lrows[i]:find("40K atoms", 1, true) or lrows[i]:find("23Na40K (", 1, true)
  T.check(utf8.len(lrows[i]:sub(1, at - 1)) == col, "long label: particles column aligned in row " .. i)
end

local noisy = cp.stages.custom { name = "quote", fn = function(s)
  return s, { notes = { 'a "quoted", noted\nline', "tab\tctrl\1 ünï", "latin-1 \233t\233" } } end }
local nb = cp.plan { start = start(), stages = { convert(0.5), noisy } }:run()
local path = os.tmpname()
nb:write_csv(path)
local f = assert(io.open(path, "rb"))
local csv = f:read("a")
f:close()
-- RFC 4180: records end in CRLF; a field with a quote, comma or line break is quoted and
-- its quotes doubled.  A small parser written here reads it back.
local function parse_csv(str)
  local recs, rec, field, i, quoted = {}, {}, "", 1, false
  while i <= #str do
    local ch = str:sub(i, i)
    if quoted then
      if ch == '"' and str:sub(i + 1, i + 1) == '"' then field = field .. '"'; i = i + 1
      elseif ch == '"' then quoted = false
      else field = field .. ch end
    elseif ch == '"' then quoted = true
    elseif ch == "," then rec[#rec + 1] = field; field = ""
    elseif ch == "\r" and str:sub(i + 1, i + 1) == "\n" then
      rec[#rec + 1] = field; recs[#recs + 1] = rec; rec, field = {}, ""; i = i + 1
    else field = field .. ch end
    i = i + 1
  end
  return recs
end
T.check(csv:sub(-2) == "\r\n", "CSV ends in CRLF")
local recs = parse_csv(csv)
T.check(#recs == 4, "CSV: header, start and two stages")
T.check(recs[1][1] == "index" and recs[1][#recs[1]] == "notes", "CSV header")
-- every column with a unit names it (SI): K, per m^3, kB, s
local col = {}
for i, name in ipairs(recs[1]) do col[name] = i end
for _, name in ipairs { "temperature_K", "peak_density_per_m3", "entropy_per_particle_kB", "duration_s",
  "elapsed_s", "degeneracy_name", "degeneracy", "failed", "flags" } do
  T.check(col[name] ~= nil, "CSV column " .. name)
end
T.near(tonumber(recs[4][col.peak_density_per_m3]), nb.final.peak_density, 1e-9, "CSV peak density in m^-3")
T.check(recs[4][col.degeneracy_name] == nb.final.degeneracy_name and recs[4][col.failed] == "false",
  "CSV: T/T_F or T/T_c named in every row; not failed")
T.check(recs[4][#recs[4]] == 'a "quoted", noted\nline; tab\tctrl\1 ünï; latin-1 \233t\233',
  "CSV quoting round-trips (notes joined by '; ')")
T.near(tonumber(recs[4][5]), nb.final.number, 1e-9, "CSV number column")
os.remove(path)

nb:write_json(path)
f = assert(io.open(path, "rb"))
local js = f:read("a")
f:close()
os.remove(path)
-- A small JSON reader written here (RFC 8259 grammar: objects, arrays, strings with
-- escapes, numbers, true/false/null) must accept the whole file, and the file must be
-- valid UTF-8 (RFC 8259 section 8.1).
local function parse_json(str)
  local i = 1
  local function ws() i = str:find("[^ \t\r\n]", i) or #str + 1 end
  local value
  local function string_()
    local out = {}
    i = i + 1
    while true do
      local ch = str:sub(i, i)
      if ch == "" or ch:byte() < 32 then error("bad string at " .. i) end
      if ch == '"' then i = i + 1; return table.concat(out) end
      if ch == "\\" then
        local e = str:sub(i + 1, i + 1)
        local simple = { ['"'] = '"', ["\\"] = "\\", ["/"] = "/", b = "\b", f = "\f", n = "\n", r = "\r", t = "\t" }
        if simple[e] then out[#out + 1] = simple[e]; i = i + 2
        elseif e == "u" and str:sub(i + 2, i + 5):match("^%x%x%x%x$") then
          out[#out + 1] = utf8.char(tonumber(str:sub(i + 2, i + 5), 16)); i = i + 6
        else error("bad escape at " .. i) end
      else out[#out + 1] = ch; i = i + 1 end
    end
  end
  function value()
    ws()
    local ch = str:sub(i, i)
    if ch == "{" then
      local o = {}
      i = i + 1; ws()
      if str:sub(i, i) == "}" then i = i + 1; return o end
      while true do
        ws()
        if str:sub(i, i) ~= '"' then error("key expected at " .. i) end
        local k = string_()
        ws()
        if str:sub(i, i) ~= ":" then error("':' expected at " .. i) end
        i = i + 1
        o[k] = value()
        ws()
        local sep = str:sub(i, i); i = i + 1
        if sep == "}" then return o end
        if sep ~= "," then error("',' expected at " .. i) end
      end
    elseif ch == "[" then
      local a = {}
      i = i + 1; ws()
      if str:sub(i, i) == "]" then i = i + 1; return a end
      while true do
        a[#a + 1] = value()
        ws()
        local sep = str:sub(i, i); i = i + 1
        if sep == "]" then return a end
        if sep ~= "," then error("',' expected at " .. i) end
      end
    elseif ch == '"' then return string_()
    elseif str:sub(i, i + 3) == "true" then i = i + 4; return true
    elseif str:sub(i, i + 4) == "false" then i = i + 5; return false
    elseif str:sub(i, i + 3) == "null" then i = i + 4; return nil
    end
    local num = str:match("^-?%d+%.?%d*[eE]?[-+]?%d*", i)
    if not num or not tonumber(num) then error("value expected at " .. i) end
    i = i + #num
    return tonumber(num)
  end
  local v = value()
  ws()
  if i <= #str then error("trailing text at " .. i) end
  return v
end
T.check(utf8.len(js) ~= nil, "JSON is valid UTF-8 (a Latin-1 byte in a note is replaced)")
local okj, doc = pcall(parse_json, js)
T.check(okj, "JSON parses: " .. tostring(okj or doc))
if okj then
  T.check(doc.stages[2].notes[1] == 'a "quoted", noted\nline', "JSON note round-trips")
  T.check(doc.stages[2].notes[2] == "tab\tctrl\1 ünï", "JSON control characters and UTF-8 round-trip")
  T.check(doc.stages[2].notes[3] == "latin-1 \u{FFFD}t\u{FFFD}", "invalid UTF-8 bytes become U+FFFD")
  T.check(doc.stages[2].adiabatic == false and doc.stages[1].adiabatic == false, "adiabatic is a boolean in every stage")
  T.near(doc.final.number, nb.final.number, 1e-15, "JSON number")
end
T.check(js:find('"degenerate": false', 1, true) ~= nil, "JSON verdict")
T.check(js:find('a \\"quoted\\", noted\\nline', 1, true) ~= nil, "JSON string escapes")
T.check(not js:find("nan", 1, true) and not js:find("inf", 1, true), "JSON has no NaN or inf")
T.raises(function() nb:write_csv("/nonexistent-dir/x.csv") end, { "budget:write_csv", "cannot write" },
  "unwritable path")
T.raises(function() nb:print("budget.txt") end, { "budget:print", "expects an open file", "string" },
  "print given a path instead of a file")
if io.open("/dev/full", "wb") then
  -- a full disk (Linux /dev/full: every write fails with ENOSPC) is an error, not a silent loss
  T.raises(function() nb:write_json("/dev/full") end, { "budget:write_json", "cannot write" }, "full disk")
end

-- PLAN-F9b: molecules lost at random (a transfer of efficiency 0.9) carry the mean energy,
-- so E/N is kept and a degenerate Fermi gas heats.  By hand: the Sommerfeld expansion
-- (Ashcroft & Mermin ch. 2 [M]) with the harmonic-trap density of states g ~ e^2 (Butts &
-- Rokhsar 1997) ends at (kB T)^4 for a polynomial g, so with m = mu/E_F and x = T/T_F
--   m^3 + pi^2 x^2 m = 1,   E/(N E_F) = 3 [m^4/4 + (pi^2/2) x^2 m^2 + (7 pi^4/60) x^4]
-- up to terms ~exp(-mu/kB T) ~ 1e-5 here; E_F ~ N^(1/3).  Keeping E/N as N drops by 0.9
-- takes T/T_F from 0.05 to ~0.09 (keeping T instead would give 0.0518).
local x0, Nm = 0.05, 3e3
local TFm = c.hbar * W * (6 * Nm) ^ (1 / 3) / c.kB
local cold = cp.stages.custom { name = "cold molecules", accepts = "atom-mixture", produces = "feshbach-molecules",
  fn = function(s)
    s.number, s.mass, s.statistics, s.temperature = Nm, s.molecule.mass, s.molecule.statistics, x0 * TFm
    for _, a in ipairs(s.atoms) do a.number = a.number - Nm end
    return s
  end }
local lossy = cp.plan { start = start(), stages = { cold, cp.stages.transfer { efficiency = 0.9 } } }:run { limiting = false }
T.near(lossy.stages[1].degeneracy, x0, 1e-9, "degenerate Feshbach molecules at T/T_F = 0.05")
local function e_per_n(x)
  local m = 1
  for _ = 1, 60 do m = m - (m ^ 3 + pi * pi * x * x * m - 1) / (3 * m * m + pi * pi * x * x) end
  return 3 * (m ^ 4 / 4 + pi * pi / 2 * x * x * m * m + 7 * pi ^ 4 / 60 * x ^ 4)
end
local want_e, lo, hi = e_per_n(x0) / 0.9 ^ (1 / 3), x0, 0.5
for _ = 1, 100 do
  local mid = 0.5 * (lo + hi)
  if e_per_n(mid) < want_e then lo = mid else hi = mid end
end
T.check(lo > 0.088 and lo < 0.092, "hand value near 0.09")
T.near(lossy.final.degeneracy, lo, 1e-3, "random loss heats the Fermi sea (E/N kept, Sommerfeld by hand)")

-- PLAN-F10: every public function has a help text.
for _, k in ipairs { "custom", "associate", "transfer", "remove_atoms", "change_trap", "load_lattice",
  "hold", "evaporate" } do
  local h = cp.get_help(cp.stages[k])
  T.check(type(h) == "string" and h:find("stages." .. k, 1, true) == 1, "help text of cp.stages." .. k)
end
T.check(cp.get_help(cp.plan.new) ~= nil and cp.get_help(cp.plan.Plan.run) ~= nil, "help of cp.plan and plan:run")
for _, k in ipairs { "print", "write_csv", "write_json" } do
  T.check(cp.get_help(b[k]) ~= nil, "help text of budget:" .. k)
end
T.check(getmetatable(cp.plan).__call ~= nil and type(cp.plan.new) == "function", "cp.plan is callable and a module")

T.done()
