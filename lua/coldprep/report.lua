-- coldprep.report: the budget a plan run produces, and its three outputs: an aligned
-- table with units (budget:print), CSV following RFC 4180 (budget:write_csv) and JSON
-- (budget:write_json).  Every output ends with, or carries, the safety cautions that
-- apply to the plan's equipment.
--
-- A budget holds
--   stages[i]  one record per stage: index, name, kind (of the sample after it), particles
--              (what is counted), number, temperature (K), degeneracy_name ("T/T_F" or
--              "T/T_c"), degeneracy, t_over_tf or t_over_tc, peak_density (m^-3),
--              phase_space_density (peak), entropy_per_particle (kB), efficiency (this
--              stage's N_out/N_in, above 1 only for a stage that adds particles, which
--              its first note then says), cumulative_efficiency (N/N_start), duration (s),
--              elapsed (s), adiabatic, failed (true when the stage's physics did not
--              work out), failure (its reason, or nil), flags (list of {model, flag, text}:
--              estimates used outside their stated range), notes (list of strings)
--   start, final  records of the starting and the final sample (same fields)
--   failed_stage (index) and failure (reason) when a stage failed: the verdict is then
--   "not degenerate" and the stages after it were not run
--   degenerate, threshold, verdict (text), limiting_stage (name), limiting_index, reason,
--   ranking ({index, name, gain [, failed]} sorted, gain = relative rise of the final
--   phase-space density when that stage is improved; NaN, with the message in `failed`,
--   when the plan fails with that stage improved), safety (list of caution texts)
local cp = require "coldprep"
local S = require "coldprep.sample"
local encode = require "coldprep.encode"
local check = require "coldprep.budget_check"

local R = {}
local Budget = {}
Budget.__index = Budget
-- a budget typed at the prompt (or given to print/tostring) shows as its report
Budget.__tostring = function(self) return Budget.text(self) end
-- The keys a budget and its start and final records may have (some only in some runs: no
-- limiting_stage when a stage failed, t_over_tf or t_over_tc by the statistics): cp.sweep
-- leaves such an output empty where it is absent, and stops on a name that is not here.
local RECORD_FIELDS = {}
for _, k in ipairs { "index", "name", "kind", "particles", "number", "temperature",
  "degeneracy_name", "degeneracy", "t_over_tf", "t_over_tc", "peak_density",
  "phase_space_density", "entropy_per_particle", "efficiency", "cumulative_efficiency",
  "duration", "elapsed", "adiabatic", "failed", "failure", "lattice", "flags", "notes" } do
  RECORD_FIELDS[k] = true
end
Budget.__fields = { start = RECORD_FIELDS, final = RECORD_FIELDS }
for _, k in ipairs { "name", "species", "stages", "degenerate", "threshold", "verdict", "ranking",
  "limiting_index", "limiting_stage", "reason", "failed_stage", "failure", "safety" } do
  Budget.__fields[k] = true
end

-- ---- records --------------------------------------------------------------------------

local function particles(s)
  if s.kind == "atom-mixture" then return s.name .. " atoms" end
  if s.kind == "feshbach-molecules" then return s.species .. " (Feshbach)" end
  return s.species .. " (ground)"
end

local function record(index, name, s, info, start_number, before_number)
  local r = {
    index = index, name = name, kind = s.kind, particles = particles(s),
    number = s.number, temperature = s.temperature,
    degeneracy_name = s.degeneracy_name, degeneracy = s.degeneracy,
    t_over_tf = s.t_over_tf, t_over_tc = s.t_over_tc,
    peak_density = s.peak_density, phase_space_density = s.phase_space_density,
    entropy_per_particle = s.entropy_per_particle,
    efficiency = before_number and (before_number > 0 and s.number / before_number or 0) or 1,
    cumulative_efficiency = s.number / start_number,
    -- an unknown duration is NaN: "-" in the table, empty in CSV, null in JSON
    duration = info and (info.duration_unknown and 0 / 0 or info.duration) or 0, elapsed = s.elapsed,
    adiabatic = info and info.adiabatic or false,
    failed = info and info.failed ~= nil or false, failure = info and info.failed,
    lattice = info and info.lattice, -- the lattice state, from load_lattice
    flags = {}, notes = {},
  }
  -- a step efficiency above 1 is a stage that adds particles: say so where it is shown
  if before_number and before_number > 0 and s.number > before_number * (1 + 1e-12) then
    r.notes[1] = string.format("the number of particles rose by a factor %.3g: check that this "
      .. "stage really adds particles", s.number / before_number)
  end
  for _, n in ipairs(info and info.notes or {}) do r.notes[#r.notes + 1] = n end
  for _, f in ipairs(info and info.flags or {}) do r.flags[#r.flags + 1] = f end
  return r
end

-- ---- safety ---------------------------------------------------------------------------

-- W; IEC 60825-1 / ANSI Z136.1 boundaries for CW sources (IEC 60825-1:2014, Class 3B/4 limits [M]):
-- Class 4 above 0.5 W, Class 3B above 5 mW (Class 3R up to 5x the Class 1/2 limit)
local CLASS4_W = 0.5
local CLASS3B_W = 5e-3

-- Collect the equipment the plan declares: the start's trap beams and each stage's
-- `equipment` list ({kind = "laser", what, power (W) [, wavelength]}, {kind = "coil",
-- what, field (T)}, {kind = "electric", what, field (V/m)}, {kind = "microwave", what,
-- rabi (rad/s)}).
local function equipment(plan)
  local list = {}
  for _, c in ipairs(plan.start.atoms) do
    list[#list + 1] = { kind = "laser", what = "optical trap for " .. c.name, power = c.beam_power }
  end
  for i, st in ipairs(plan.stages) do
    for _, e in ipairs(st.equipment or {}) do
      local item = {}
      for k, v in pairs(e) do item[k] = v end
      item.what = string.format("stage %d (%s): %s", i, st.name, e.what or e.kind)
      list[#list + 1] = item
    end
  end
  return list
end

local function cautions(plan)
  local out, class4, class3b, unknown, coils, hv, mw = {}, {}, {}, {}, {}, {}, {}
  for _, e in ipairs(equipment(plan)) do
    if e.kind == "laser" then
      if e.power == nil then
        unknown[#unknown + 1] = e.what
      elseif e.power > CLASS4_W then
        class4[#class4 + 1] = string.format("%s, %.3g W", e.what, e.power)
      elseif e.power > CLASS3B_W then
        class3b[#class3b + 1] = string.format("%s, %.3g mW", e.what, e.power * 1e3)
      end
    elseif e.kind == "coil" then
      coils[#coils + 1] = string.format("%s, %.4g G", e.what, e.field / cp.units.G)
    elseif e.kind == "electric" then
      hv[#hv + 1] = string.format("%s, %.3g kV/cm", e.what, e.field / 1e5)
    elseif e.kind == "microwave" then
      mw[#mw + 1] = string.format("%s, Rabi frequency 2 pi x %.3g MHz", e.what,
        e.rabi / (2 * math.pi * 1e6))
    end
  end
  if #class4 > 0 then
    out[#out + 1] = "Class 4 laser (beam power above 0.5 W): " .. table.concat(class4, "; ")
      .. ". Diffuse reflections, skin and fire hazards; eyewear rated for every wavelength in use"
      .. " (infrared beams are invisible), enclosed beams and dumps, interlocked controlled area,"
      .. " alignment at reduced power."
  end
  if #class3b > 0 then
    out[#out + 1] = "Class 3B laser (beam power 5 mW to 0.5 W): " .. table.concat(class3b, "; ")
      .. ". The direct beam and its specular reflections are eye hazards: eyewear rated for the"
      .. " wavelength, beams kept below eye level and terminated in dumps, controlled access."
  end
  if #unknown > 0 then
    out[#out + 1] = "Beam power not given for: " .. table.concat(unknown, "; ")
      .. ". Optical traps and Raman lasers with amplifiers are commonly Class 3B or Class 4;"
      .. " classify them before use."
  end
  if #coils > 0 then
    out[#out + 1] = "High-current coils for Feshbach fields: " .. table.concat(coils, "; ")
      .. ". Hundreds of amperes: protect against the inductive voltage spike when current is"
      .. " interrupted (never open a live coil circuit), interlock the supply on cooling-water"
      .. " flow and temperature, mind forces on nearby metal and keep pacemakers away."
  end
  if #hv > 0 then
    out[#out + 1] = "High voltage for electric fields: " .. table.concat(hv, "; ")
      .. ". Current-limited supplies, interlocked covers, proper grounding, discharge before"
      .. " handling, feedthroughs rated for the voltage; never work alone on live high voltage."
  end
  if #mw > 0 then
    out[#out + 1] = "Microwave sources for shielding: " .. table.concat(mw, "; ")
      .. ". Rabi frequencies of tens of MHz take amplifiers of watts to tens of watts into an"
      .. " antenna or waveguide near the cell: RF exposure of people near the antenna (keep"
      .. " to the exposure limits, e.g. ICNIRP 2020 / IEEE C95.1, and check with a field"
      .. " meter), shielded and terminated lines, amplifier power interlocked off before"
      .. " work near the antenna, never run an amplifier into an open or unmatched load."
  end
  out[#out + 1] = "These numbers plan an experiment; they are not a safety clearance. Follow your"
    .. " local codes and regulations, your laser safety officer, radiation (RF) safety officer"
    .. " and licensed practice (ANSI Z136.1, IEC 60825-1)."
  return out
end

-- ---- the budget -----------------------------------------------------------------------

-- Build a budget from a plan run: {plan, start, steps, final, verdict, ranking, reason}.
function R.budget(run)
  check.run("report.budget", run)
  local plan = run.plan
  local b = setmetatable({}, Budget)
  b.name = plan.name
  b.species = run.start.species
  b.start = record(0, "start", run.start, nil, run.start.number, nil)
  b.start.notes = {}
  for _, c in ipairs(run.start.atoms) do
    b.start.notes[#b.start.notes + 1] = string.format("%s: %.3g atoms at %.4g nK, %s = %.3g",
      c.name, c.number, c.temperature / cp.units.nK, c.degeneracy_name, c.degeneracy)
    b.start.notes[#b.start.notes + 1] = S.semiclassical_note(c)
  end
  b.stages = {}
  for k, st in ipairs(run.steps) do
    b.stages[k] = record(st.index, st.stage.name, st.after, st.info, run.start.number, st.before.number)
    b.stages[k].adiabatic = st.stage.adiabatic == true
  end
  b.final = b.stages[#b.stages]
  b.degenerate = run.verdict.degenerate
  b.threshold = run.verdict.threshold
  b.verdict = run.verdict.text
  b.ranking = run.ranking
  if run.ranking[1] then
    b.limiting_index = run.ranking[1].index
    b.limiting_stage = run.ranking[1].name
  end
  b.reason = run.reason
  if run.failure then b.failed_stage, b.failure = run.failure.index, run.failure.reason end
  b.safety = cautions(plan)
  return b
end

-- ---- text -----------------------------------------------------------------------------

local function fmt(v, f)
  if v == nil or v ~= v then return "-" end
  return string.format(f, v)
end

local COLUMNS = {
  { "#", "", "%d", function(r) return r.index end, 2 },
  { "stage", "", "%s", function(r) return r.failed and (r.name .. " FAILED") or r.name end, -16 },
  { "particles", "", "%s", function(r) return r.particles end, -22 },
  { "N", "", "%.3g", function(r) return r.number end, 9 },
  { "T", "nK", "%.4g", function(r) return r.temperature / cp.units.nK end, 8 },
  { "T/Tdeg", "", "%.3g", function(r) return r.degeneracy end, 7 },
  { "", "", "%s", function(r) return r.degeneracy_name == "T/T_F" and "F" or "c" end, -1 },
  { "n_peak", "cm^-3", "%.3g", function(r) return r.peak_density and r.peak_density / cp.units.per_cm3 end, 9 },
  { "PSD", "", "%.3g", function(r) return r.phase_space_density end, 8 },
  { "S/N", "kB", "%.3g", function(r) return r.entropy_per_particle end, 6 },
  { "step", "%", "%.1f", function(r) return 100 * r.efficiency end, 6 },
  { "cumul.", "%", "%.3g", function(r) return 100 * r.cumulative_efficiency end, 7 },
  { "time", "ms", "%.4g", function(r) return r.duration / cp.units.ms end, 8 },
}

-- Text as it takes one line of the table: line breaks, tabs and other control characters
-- become spaces.
local function one_line(text)
  return (tostring(text):gsub("%c", " "))
end

-- Characters on screen: UTF-8 sequences count once (bytes of invalid UTF-8 each once).
local function display_width(text)
  return utf8.len(text) or #text
end

-- Text padded to |width| characters (width < 0: left-aligned).
local function cell(text, width)
  local pad = string.rep(" ", math.max(0, math.abs(width) - display_width(text)))
  if width < 0 then return text .. pad end
  return pad .. text
end

local function wrap(text, indent, width)
  local lines, line = {}, ""
  for word in text:gmatch("%S+") do
    if #line > 0 and #line + 1 + #word > width - #indent then
      lines[#lines + 1] = indent .. line
      line = word
    else
      line = (#line > 0) and (line .. " " .. word) or word
    end
  end
  if #line > 0 then lines[#lines + 1] = indent .. line end
  return table.concat(lines, "\n")
end

-- The printed report as one string.
function Budget:text()
  check.budget("budget:text", self, Budget)
  local out = {}
  out[#out + 1] = one_line(string.format("Preparation budget: %s (%s)", self.name, self.species))
  -- every cell's text first, then each column as wide as its widest cell (a long label
  -- or a long number widens its column instead of shifting the row)
  local rows = {}
  for _, r in ipairs { self.start, table.unpack(self.stages) } do
    local cells = {}
    for i, c in ipairs(COLUMNS) do cells[i] = one_line(fmt(c[4](r), c[3])) end
    rows[#rows + 1] = cells
  end
  local widths = {}
  for i, c in ipairs(COLUMNS) do
    local w = math.max(math.abs(c[5]), display_width(c[1]), display_width(c[2]))
    for _, cells in ipairs(rows) do w = math.max(w, display_width(cells[i])) end
    widths[i] = c[5] < 0 and -w or w
  end
  local function line(texts)
    local cells = {}
    for i, t in ipairs(texts) do cells[i] = cell(t, widths[i]) end
    out[#out + 1] = (table.concat(cells, " "):gsub("%s+$", ""))
  end
  local head, units = {}, {}
  for i, c in ipairs(COLUMNS) do head[i], units[i] = c[1], c[2] end
  line(head)
  line(units)
  for _, cells in ipairs(rows) do line(cells) end
  out[#out + 1] = "T/Tdeg: T/T_F (F, fermions) or T/T_c (c, bosons); PSD: peak phase-space density n(0) lambda^3."
  out[#out + 1] = ""
  out[#out + 1] = "Notes:"
  for _, r in ipairs { self.start, table.unpack(self.stages) } do
    for _, n in ipairs(r.notes) do
      out[#out + 1] = wrap(string.format("%d %s: %s", r.index, r.name, n), "  ", 96)
    end
  end
  out[#out + 1] = ""
  out[#out + 1] = wrap("Verdict: " .. self.verdict .. ".", "", 96)
  out[#out + 1] = wrap(self.reason, "  ", 96)
  local rank = {}
  for _, g in ipairs(self.ranking or {}) do
    if g.failed then
      rank[#rank + 1] = string.format("%d %s not ranked (the rerun failed: %s)", g.index, g.name, g.failed)
    else
      local gain = math.abs(g.gain) < 1e-9 and 0 or g.gain
      rank[#rank + 1] = string.format("%d %s %+.3g %%", g.index, g.name, 100 * gain)
    end
  end
  if #rank > 0 then
    out[#out + 1] = wrap("Gain in final phase-space density per stage made better: "
      .. table.concat(rank, ", ") .. ".", "  ", 96)
  end
  out[#out + 1] = ""
  out[#out + 1] = "Safety:"
  for _, s in ipairs(self.safety) do out[#out + 1] = wrap("- " .. s, "  ", 96):gsub("^  ", "") end
  return table.concat(out, "\n") .. "\n"
end

-- budget:print([file]): write the report to `file` (default io.stdout).
function Budget:print(file)
  check.budget("budget:print", self, Budget)
  if file ~= nil and io.type(file) ~= "file" then
    error("budget:print: expects an open file (e.g. io.stdout or io.open(path, \"w\")), got "
      .. (io.type(file) or type(file)) .. "; to write to a path use io.open or budget:text()", 2)
  end
  local ok, err = (file or io.stdout):write(self:text())
  if not ok then error("budget:print: cannot write: " .. tostring(err), 2) end
end

-- ---- CSV (RFC 4180) -------------------------------------------------------------------

local CSV_FIELDS = { "index", "name", "kind", "particles", "number", "temperature_K",
  "degeneracy_name", "degeneracy", "peak_density_per_m3", "phase_space_density",
  "entropy_per_particle_kB", "efficiency", "cumulative_efficiency", "duration_s", "elapsed_s",
  "adiabatic", "failed", "flags", "notes" }

local function csv_value(r, f)
  local map = { temperature_K = "temperature", peak_density_per_m3 = "peak_density",
    entropy_per_particle_kB = "entropy_per_particle", duration_s = "duration", elapsed_s = "elapsed" }
  local v = r[map[f] or f]
  if f == "notes" then v = table.concat(r.notes, "; ") end
  if f == "flags" then
    local names = {}
    for _, g in ipairs(r.flags) do names[#names + 1] = g.model .. "." .. g.flag end
    v = table.concat(names, " ")
  end
  if type(v) == "number" then
    if v ~= v or v == math.huge or v == -math.huge then return "" end
    if math.type(v) == "integer" then return tostring(v) end
    return string.format("%.10g", v)
  end
  return tostring(v == nil and "" or v)
end

local csv_field = encode.csv_field -- RFC 4180 quoting, valid UTF-8

local function open_for_writing(fname, path)
  if type(path) ~= "string" or path == "" then
    error(fname .. ": expects a file path (string), got " .. type(path), 3)
  end
  local f, err = io.open(path, "wb")
  if not f then error(fname .. ": cannot write " .. path .. ": " .. tostring(err), 3) end
  return f
end

-- budget:write_csv(path): one header line, then the start and one line per stage;
-- lines end in CRLF as RFC 4180 asks.
function Budget:write_csv(path)
  check.budget("budget:write_csv", self, Budget)
  local f = open_for_writing("budget:write_csv", path)
  local lines = { table.concat(CSV_FIELDS, ",") }
  for _, r in ipairs { self.start, table.unpack(self.stages) } do
    local cells = {}
    for i, fld in ipairs(CSV_FIELDS) do cells[i] = csv_field(csv_value(r, fld)) end
    lines[#lines + 1] = table.concat(cells, ",")
  end
  local ok, err = f:write(table.concat(lines, "\r\n"), "\r\n")
  local closed, cerr = f:close()
  if not ok or not closed then
    error("budget:write_csv: cannot write " .. path .. ": " .. tostring(err or cerr), 2)
  end
end

-- ---- JSON -----------------------------------------------------------------------------

-- budget:write_json(path): the whole budget as one JSON object (NaN written as null).
function Budget:write_json(path)
  check.budget("budget:write_json", self, Budget)
  local f = open_for_writing("budget:write_json", path)
  local doc = {
    name = self.name, species = self.species, start = self.start, stages = self.stages,
    final = self.final, degenerate = self.degenerate, threshold = self.threshold,
    verdict = self.verdict, limiting_stage = self.limiting_stage,
    limiting_index = self.limiting_index, reason = self.reason, ranking = self.ranking,
    failed_stage = self.failed_stage, failure = self.failure, safety = self.safety,
  }
  local ok, err = f:write(encode.json(doc, 0, "budget:write_json"), "\n")
  local closed, cerr = f:close()
  if not ok or not closed then
    error("budget:write_json: cannot write " .. path .. ": " .. tostring(err or cerr), 2)
  end
end

R.Budget = Budget

cp.set_help(Budget.print, [[
budget:print([file]) prints the budget: one aligned row per stage with units (number,
temperature in nK, T/T_F or T/T_c, peak density in cm^-3, peak phase-space density, entropy
per particle in kB, step and cumulative efficiency in %, duration in ms), the notes, the
verdict with the limiting stage and its reason, and the safety cautions for this plan.
Columns widen to fit long labels.  Example: cp.plan{...}:run():print()]])
cp.set_help(Budget.text, [[
budget:text() -> string: the report budget:print() writes (table, notes, verdict, ranking,
safety cautions).  Example: io.open("budget.txt", "w"):write(cp.plan{...}:run():text())]])
cp.set_help(Budget.write_csv, [[
budget:write_csv(path) writes the start and one line per stage as CSV (RFC 4180: comma
separated, CRLF line ends, fields with commas, quotes or line breaks quoted).  Columns:
index, name, kind, particles, number, temperature_K, degeneracy_name (T/T_F or T/T_c),
degeneracy (its value), peak_density_per_m3, phase_space_density, entropy_per_particle_kB,
efficiency, cumulative_efficiency, duration_s, elapsed_s, adiabatic, failed, flags (model.flag
names, space separated), notes (joined by "; ").
Example: cp.plan{...}:run():write_csv("budget.csv")]])
cp.set_help(Budget.write_json, [[
budget:write_json(path) writes the whole budget (stages, start, final, verdict, ranking,
reason, safety) as one JSON object, SI units, NaN as null, always valid UTF-8 (bytes of
another encoding in a label or note become U+FFFD).
Example: cp.plan{...}:run():write_json("budget.json")]])

return R
