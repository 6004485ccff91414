-- coldprep.sample: the sample a plan hands from stage to stage, and its thermodynamics.
--
-- A sample is a plain Lua table (stages may build or change one; `derive` fills in the
-- computed fields):
--   kind                "atom-mixture" | "feshbach-molecules" | "ground-state-molecules"
--   species             the target molecule's name, e.g. "23Na40K"
--   molecule            its record from cp.species.molecule (statistics, dipole_debye,
--                       c6_au, reactive, mass, ...)
--   -- the particles the budget follows: the molecules, or for an atom mixture the
--   -- minority atom species (each of its atoms can become at most one molecule)
--   name, mass (kg), statistics ("fermion" | "boson")
--   number              particles in the trap
--   temperature         K
--   trap_frequencies    {wx, wy, wz}, angular, rad/s (harmonic trap or lattice envelope)
--   atoms               {cloud_a, cloud_b}: for a mixture the two atom clouds, for molecules
--                       the atoms left over from association (number 0 once removed); each
--                       cloud has name, mass, statistics, number, temperature,
--                       trap_frequencies, scattering_length (m, the atoms' own; may be
--                       nil) and the derived fields below
--   lattice             nil, or {depth (J), depth_er, wavelength (m), spacing (m), ...}
--                       once the sample sits in an optical lattice (the state
--                       load_lattice records, see its help)
--   elapsed             s since the start of the plan
-- Derived by `derive` from the thermo model (cp.thermo.fermi / cp.thermo.bose), never
-- typed in:
--   omega_bar (rad/s), degeneracy_name ("T/T_F" | "T/T_c"), degeneracy (its value),
--   t_over_tf or t_over_tc, fermi_temperature or critical_temperature (K),
--   peak_density (m^-3), phase_space_density (peak, n(0) lambda^3),
--   entropy_per_particle (kB), energy_per_particle (J), trap_phase_space_density
--   (N (hbar omega_bar / kB T)^3, which keeps growing below T_c; used to rank stages).
local cp = require "coldprep"

local S = {}

S.KINDS = { "atom-mixture", "feshbach-molecules", "ground-state-molecules" }

local DERIVED = { "omega_bar", "degeneracy_name", "degeneracy", "t_over_tf", "t_over_tc",
  "fermi_temperature", "critical_temperature", "condensed_fraction", "peak_density",
  "phase_space_density", "entropy_per_particle", "energy_per_particle",
  "trap_phase_space_density" }

local function deep_copy(t)
  if type(t) ~= "table" then return t end
  local c = {}
  for k, v in pairs(t) do c[k] = deep_copy(v) end
  return c
end
S.copy = deep_copy

-- Fewer than one particle left: nothing to describe.
function S.is_empty(c)
  return not (c.number >= 1)
end

-- Geometric mean of three angular frequencies (rad/s).
function S.omega_bar(w)
  return (w[1] * w[2] * w[3]) ^ (1 / 3)
end

-- The ideal-gas state of a cloud of `number` particles at `temperature` (model: cp.thermo).
local function thermo_state(c, temperature)
  local args = { number = c.number, omega_bar = S.omega_bar(c.trap_frequencies),
    temperature = temperature, mass = c.mass }
  if c.statistics == "fermion" then
    return cp.thermo.fermi(args)
  end
  return cp.thermo.bose(args)
end

-- Fill the derived fields of a cloud (or of a sample's followed particles) in place from
-- its name, mass, statistics, number, temperature and trap_frequencies; returns c.
function S.derive(c)
  for _, k in ipairs(DERIVED) do c[k] = nil end
  c.omega_bar = S.omega_bar(c.trap_frequencies)
  c.degeneracy_name = c.statistics == "fermion" and "T/T_F" or "T/T_c"
  if S.is_empty(c) then
    c.degeneracy, c.peak_density, c.phase_space_density = 0 / 0, 0, 0
    c.entropy_per_particle, c.trap_phase_space_density = 0 / 0, 0
    return c
  end
  local r = thermo_state(c, c.temperature)
  if c.statistics == "fermion" then
    c.t_over_tf, c.fermi_temperature = r.t_over_tf, r.fermi_temperature
    c.degeneracy = r.t_over_tf
  else
    c.t_over_tc, c.critical_temperature = r.t_over_tc, r.critical_temperature
    c.condensed_fraction = r.condensed_fraction
    c.degeneracy = r.t_over_tc
  end
  c.peak_density = r.peak_density
  c.phase_space_density = r.phase_space_density
  c.entropy_per_particle = r.entropy_per_particle
  c.energy_per_particle = r.energy_per_particle
  local x = cp.consts.hbar * c.omega_bar / (cp.consts.kB * c.temperature)
  c.trap_phase_space_density = c.number * x * x * x
  return c
end

-- The thermo model is semiclassical: it needs many trap levels thermally occupied,
-- kB T >> hbar omega_bar (docs/models/thermo.md).  Below SEMICLASSICAL times hbar omega_bar (common
-- practice, no source: the corrections grow as (hbar omega_bar / kB T)^2) this returns a
-- note for the budget, else nil.
local SEMICLASSICAL = 3
function S.semiclassical_note(c)
  if S.is_empty(c) then return nil end
  local r = cp.consts.kB * c.temperature / (cp.consts.hbar * c.omega_bar)
  if r >= SEMICLASSICAL then return nil end
  return string.format("kB T is only %.2g hbar omega_bar for the %s: the thermodynamics assumes many "
    .. "trap levels occupied (kB T >> hbar omega_bar), so %s and the densities are rough", r, c.name,
    c.degeneracy_name)
end

-- The trap of cloud c in the form cp.thermo takes (number, mass, three frequencies).
local function thermo_trap(c)
  return { number = c.number, mass = c.mass, statistics = c.statistics,
    omega_x = c.trap_frequencies[1], omega_y = c.trap_frequencies[2], omega_z = c.trap_frequencies[3] }
end
S.thermo_trap = thermo_trap

-- The temperature at which cloud c (its number, mass, statistics, trap) has `entropy`
-- kB per particle (cp.thermo.temperature_from_entropy).
function S.temperature_for_entropy(c, entropy)
  local args = thermo_trap(c)
  args.entropy_per_particle = entropy
  return cp.thermo.temperature_from_entropy(args).temperature
end

-- The temperature of cloud c after `energy` (J) per particle is added at fixed number and
-- trap: where the gas rethermalises, at E/N + energy (cp.thermo.temperature_from_energy).
function S.temperature_after_heating(c, energy)
  local args = thermo_trap(c)
  args.energy_per_particle = c.energy_per_particle + energy
  return cp.thermo.temperature_from_energy(args).temperature
end

-- Cloud or sample c after losing particles at random, uniformly in phase space (a
-- transfer that fails for some molecules, a lossy cleaning pulse), down to `number`: the
-- lost particles carry the mean energy, so the energy per particle is kept and the rest
-- rethermalise at it in the same trap.  A classical gas keeps its temperature; a
-- degenerate Fermi gas heats (the losses leave holes below the Fermi energy, Timmermans,
-- PRL 87, 240403 (2001) [M]); a gas below T_c cools (its energy, all in the thermal part,
-- does not depend on N).  Returns the new sample, re-derived.
function S.after_uniform_loss(c, number)
  local n = S.with(c, { number = number })
  if S.is_empty(n) or S.is_empty(c) then return n end
  local de = c.energy_per_particle - n.energy_per_particle
  if math.abs(de) <= 1e-9 * c.energy_per_particle then return n end
  return S.with(n, { temperature = S.temperature_after_heating(n, de) })
end

-- A copy of cloud or sample c with the fields of `changes` replaced, re-derived.
function S.with(c, changes)
  local n = deep_copy(c)
  for k, v in pairs(changes) do n[k] = v end
  return S.derive(n)
end

-- The followed particles of a mixture: the atom species with fewer atoms (ties: the first).
function S.minority(atoms)
  return (atoms[2].number < atoms[1].number) and 2 or 1
end

-- Copy the fields of cloud a into the top level of sample s (the followed particles).
function S.follow(s, a)
  for _, k in ipairs { "name", "mass", "statistics", "number", "temperature", "trap_frequencies" } do
    s[k] = deep_copy(a[k])
  end
  return S.derive(s)
end

-- Validate what a stage handed back: a table with the fields every later stage relies
-- on.  `who` names the stage in the message.
function S.check(s, who)
  if type(s) ~= "table" then
    error(string.format("%s: must return a sample table, got %s", who, type(s)), 0)
  end
  local ok_kind = false
  for _, k in ipairs(S.KINDS) do if s.kind == k then ok_kind = true end end
  if not ok_kind then
    error(string.format("%s: sample field kind %s is not allowed; allowed %s", who, tostring(s.kind),
      table.concat(S.KINDS, ", ")), 0)
  end
  local function num(k, unit, lo)
    local v = s[k]
    if type(v) ~= "number" then
      error(string.format("%s: sample field '%s' must be a number (%s), got %s", who, k, unit,
        type(v)), 0)
    end
    if v ~= v or v == math.huge or v < lo then
      error(string.format("%s: sample field %s %s %s is %s; allowed [%g, inf) %s", who, k,
        v ~= v and "NaN" or tostring(v), unit, v ~= v and "not a number"
        or v == math.huge and "infinite" or "out of range", lo, unit), 0)
    end
  end
  num("number", "particles", 0)
  num("temperature", "K", 1e-300)
  num("mass", "kg", 1e-300)
  num("elapsed", "s", 0)
  if s.statistics ~= "fermion" and s.statistics ~= "boson" then
    error(string.format("%s: sample field 'statistics' = %s; allowed fermion, boson", who,
      tostring(s.statistics)), 0)
  end
  local w = s.trap_frequencies
  if type(w) ~= "table" or #w ~= 3 then
    error(who .. ": sample field 'trap_frequencies' must be {wx, wy, wz} in rad/s", 0)
  end
  for i = 1, 3 do
    if type(w[i]) ~= "number" or not (w[i] > 0) or w[i] == math.huge then
      error(string.format("%s: sample field 'trap_frequencies[%d]' = %s must be > 0 (rad/s)", who,
        i, tostring(w[i])), 0)
    end
  end
  return s
end

return S
