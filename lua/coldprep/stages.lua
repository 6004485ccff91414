-- coldprep.stages: the stage library.  Each constructor takes one table of named
-- arguments, checks it, and returns a stage: a table with
--   name       the label in the budget (argument `label`, default the stage's kind)
--   kind       "associate", "transfer", "remove_atoms", "change_trap", "load_lattice",
--              "hold", "evaporate" or "custom"
--   accepts    set of sample kinds it can act on; produces: the kind it hands on (nil =
--              unchanged); adiabatic: true when it conserves entropy except for the
--              excitation it reports; equipment: what the safety cautions look at
--   params     the stage's checked arguments with their defaults (read them, e.g. in a sweep)
--   run        function(self, sample) -> sample, info {duration (s), notes = {...}}
-- The physics comes from the C models (cp.feshbach, cp.raman, cp.lattice, cp.thermo,
-- cp.collisions); each stage is a thin layer that feeds them the sample's numbers.
-- Molecule data (statistics, C6, reactivity) come from the sample's species record.
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"

local M = {}
local Stage = {}
Stage.__index = Stage
M.Stage = Stage

local MOLECULES = { ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }
local ANY = { ["atom-mixture"] = true, ["feshbach-molecules"] = true, ["ground-state-molecules"] = true }

-- ---- bridges to the model bindings --------------------------------------------------
-- The few places where a stage turns a sample into a model call's arguments.
local MODEL = {}

-- A cloud of the sample in the form cp.feshbach takes.
local function fb_cloud(c)
  return { atom = c.name, number = c.number, omega_x = c.trap_frequencies[1],
    omega_y = c.trap_frequencies[2], omega_z = c.trap_frequencies[3] }
end

-- Overlap density of partner cloud a seen by minority cloud b (cp.feshbach.overlap_density):
-- {density (m^-3), sag (m)}.
function MODEL.overlap(a, b)
  return cp.feshbach.overlap_density { a = fb_cloud(a), b = fb_cloud(b), temperature = b.temperature }
end

-- Phase-space ceiling of the conversion (cp.feshbach.max_efficiency, deterministic seed).
function MODEL.max_efficiency(a, b, samples, seed)
  return cp.feshbach.max_efficiency { a = fb_cloud(a), b = fb_cloud(b), temperature = b.temperature,
    samples = math.floor(samples), seed = math.floor(seed) }.max_efficiency
end

-- The time the two-photon pulse sequence takes: the model's integration window.
function MODEL.pulse_duration(result)
  return result.t_end - result.t_start
end

-- The temperature after an adiabatic change of the trap (cp.thermo.match_harmonic).
function MODEL.match_harmonic(s, w_to)
  local args = S.thermo_trap(s)
  args.temperature = s.temperature
  args.omega_x_to, args.omega_y_to, args.omega_z_to = w_to[1], w_to[2], w_to[3]
  return cp.thermo.match_harmonic(args).temperature
end

-- Number and temperature after a hold with two-body loss (rate beta at the sample's
-- temperature; p-wave scaling for identical fermions), one-body loss and heating
-- (cp.collisions.hold): {number, temperature}.
function MODEL.hold(s, beta, lifetime, heating, duration)
  local w = s.trap_frequencies
  return cp.collisions.hold { number = s.number, temperature = s.temperature, mass = s.mass,
    omega_x = w[1], omega_y = w[2], omega_z = w[3], rate = beta,
    wave = s.statistics == "fermion" and "p" or "s", lifetime = lifetime,
    heating_rate = heating, duration = duration, points = 2 }
end

-- The time the evaporation takes along its trajectory (N_k, T_k): particles leave at the
-- evaporation rate f Gamma_el (f = eta e^-eta / sqrt 2 of the elastic collisions, Ketterle
-- & van Druten 1996, as in cp.collisions.evaporation) plus the two-body loss rate, so
-- dt = -d ln N / (<n> (f sigma v_rel + beta(T))), <n> = N (m w^2 / (4 pi kB T))^(3/2),
-- v_rel = sqrt(16 kB T / (pi m)); beta scales as T for identical fermions (p-wave).
-- Returns the time (s) at each point of the trajectory, 0 at the first.
function MODEL.evaporation_times(s, r, eta, sigma, beta0)
  local m, kB = s.mass, cp.consts.kB
  local wbar = S.omega_bar(s.trap_frequencies)
  local f = eta * math.exp(-eta) / math.sqrt(2)
  local function rate(N, T)
    local n = N * (m * wbar * wbar / (4 * math.pi * kB * T)) ^ 1.5
    local beta = s.statistics == "fermion" and beta0 * T / s.temperature or beta0
    return n * (f * sigma * math.sqrt(16 * kB * T / (math.pi * m)) + beta)
  end
  local times = { 0 }
  for i = 2, #r.numbers do
    local n0, n1, t0, t1 = r.numbers[i - 1], r.numbers[i], r.temperatures[i - 1], r.temperatures[i]
    -- trapezoid in ln N of 1/rate
    times[i] = times[i - 1] + 0.5 * (1 / rate(n0, t0) + 1 / rate(n1, t1)) * math.log(n0 / n1)
  end
  return times
end

-- Evaporation at truncation eta in the fixed trap (cp.collisions.evaporation) down to
-- target.number, or to the number at which the trajectory reaches target.temperature or
-- lasts target.duration (interpolated in ln N over a fine trajectory; a duration needs
-- target.sigma and target.beta for the rates): {number, temperature, efficiency, numbers,
-- temperatures}.
function MODEL.evaporate(s, eta, kappa, ratio, target)
  local w = s.trap_frequencies
  local args = { number = s.number, temperature = s.temperature, mass = s.mass,
    omega_x = w[1], omega_y = w[2], omega_z = w[3], eta = eta, kappa = kappa, ratio = ratio,
    wave = s.statistics == "fermion" and "p" or "s" }
  if target.number then
    args.final_number, args.points = target.number, 64
    return cp.collisions.evaporation(args)
  end
  args.final_number, args.points = math.max(1, s.number * 1e-6), 400
  local tr = cp.collisions.evaporation(args)
  local n, t = tr.numbers, tr.temperatures
  -- the quantity that marks the end point along the trajectory, and its target value
  local along, goal
  if target.temperature then
    along, goal = function(i) return math.log(t[i]) end, math.log(target.temperature)
  else
    local times = MODEL.evaporation_times(s, tr, eta, target.sigma, target.beta)
    along, goal = function(i) return -times[i] end, -target.duration
  end
  for i = 2, #n do
    if along(i) <= goal then
      local f = (goal - along(i - 1)) / (along(i) - along(i - 1))
      args.final_number = n[i - 1] * (n[i] / n[i - 1]) ^ f
      args.points = 64
      return cp.collisions.evaporation(args)
    end
  end
  if target.temperature then
    error(string.format("the temperature never falls to %.3g nK (it ends at %.3g nK "
      .. "with %.3g particles left); losses outrun the cooling", target.temperature / cp.units.nK,
      t[#t] / cp.units.nK, n[#n]), 0)
  end
  error(string.format("argument 'duration' = %.3g s is longer than the evaporation can last: after "
    .. "%.3g s only %.3g of %.3g particles are left", target.duration,
    MODEL.evaporation_times(s, tr, eta, target.sigma, target.beta)[#n], n[#n], s.number), 0)
end

-- The cubic lattice of three equal retro-reflected beams (cp.lattice.depth3d), its
-- loading ramp (cp.lattice.loading: the fraction left in excited bands at q = 0), the
-- energy of that excitation (band 1 to band 3 at q = 0, the first band parity couples,
-- cp.lattice.bands) and the photon-scattering heating (cp.lattice.heating) at the
-- intensity the molecules sit in: three standing waves, each (1 + sqrt(R))^2 I0 at its
-- antinodes.
function MODEL.lattice(s, p)
  local beam = { power = p.power, waist = p.waist, wavelength = p.wavelength,
    polarizability_au = p.polarizability_au, reflectivity = p.reflectivity }
  local d3 = cp.lattice.depth3d { beams = { beam, beam, beam }, mass = s.mass }
  local ax = d3.axes[1]
  local load = cp.lattice.loading { shape = p.ramp_shape, start_er = 0, end_er = ax.depth_er,
    duration = p.ramp_time, mass = s.mass, wavelength = p.wavelength }
  local e = cp.lattice.bands { depth_er = ax.depth_er, bands = 3, quasimomenta = { 0 } }.energies_er[1]
  local out = { depth_er = ax.depth_er, depth = ax.depth, omega = d3.omega, spacing = ax.spacing,
    wavelength = p.wavelength, excited_fraction = load.excited_fraction,
    excitation_energy = (e[3] - e[1]) * ax.recoil, heating_rate = 0, scattering_rate = 0 }
  if p.imag_polarizability_au > 0 then
    local intensity = 3 * (1 + math.sqrt(p.reflectivity)) ^ 2 * ax.peak_intensity
    local h = cp.lattice.heating { polarizability_imag_au = p.imag_polarizability_au,
      intensity = intensity, mass = s.mass, wavelength = p.wavelength, depth_er = ax.depth_er }
    out.heating_rate, out.scattering_rate = h.temperature_rate, h.scattering_rate
  end
  return out
end

-- The gas after adiabatic loading into the lattice `lat` (cp.thermo.match_lattice).
function MODEL.match_lattice(s, lat)
  local args = S.thermo_trap(s)
  args.temperature, args.depth_er, args.wavelength = s.temperature, lat.depth_er, lat.wavelength
  args.envelope_omega_x, args.envelope_omega_y, args.envelope_omega_z = lat.omega[1], lat.omega[2], lat.omega[3]
  return cp.thermo.match_lattice(args)
end

local function new_stage(kind, args, fields)
  if args.label ~= nil and type(args.label) ~= "string" then
    A.fail("stages." .. kind, "argument 'label' must be a string")
  end
  local st = setmetatable(fields, Stage)
  st.kind = kind
  st.name = args.label or kind
  st.equipment = st.equipment or {}
  return st
end

local function pct(x) return string.format("%.3g %%", 100 * x) end

-- ---- custom ---------------------------------------------------------------------------

-- cp.stages.custom{name, fn [, accepts, produces, adiabatic, equipment]}
function M.custom(args)
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
    A.fail(fname, "argument 'equipment' must be a list of {kind = \"laser\"|\"coil\"|\"electric\", ...}")
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

-- ---- remove_atoms ---------------------------------------------------------------------

-- cp.stages.remove_atoms{[efficiency = 1, molecule_loss = 0, heating_per_atom = 0 J,
--   duration = 0 s, label]}
function M.remove_atoms(args)
  local fname = "stages.remove_atoms"
  A.table(fname, args, { "efficiency", "molecule_loss", "heating_per_atom", "duration", "label" })
  local p = {
    efficiency = A.number(fname, args, "efficiency", "fraction", { optional = true, default = 1, min = 0, max = 1 }),
    molecule_loss = A.number(fname, args, "molecule_loss", "fraction", { optional = true, default = 0, min = 0, max = 1 }),
    heating_per_atom = A.number(fname, args, "heating_per_atom", "J", { optional = true, default = 0, nonnegative = true, max = 1e-24 }),
    duration = A.number(fname, args, "duration", "s", { optional = true, default = 0, nonnegative = true, max = 1e4 }),
  }
  return new_stage("remove_atoms", args, {
    accepts = MOLECULES, params = p,
    hint = "atoms are removed after association (cp.stages.associate)",
    run = function(_, s)
      local notes, removed = {}, 0
      for _, a in ipairs(s.atoms) do
        local r = a.number * p.efficiency
        removed = removed + r
        a.number = a.number - r
      end
      -- molecules lost with the atoms are lost at random (the energy per molecule is kept)
      local out = S.after_uniform_loss(s, s.number * (1 - p.molecule_loss))
      if removed > 0 and p.heating_per_atom > 0 and not S.is_empty(out) then
        -- the energy the removed atoms leave behind is shared by the molecules
        out = S.with(out, { temperature = S.temperature_after_heating(out, p.heating_per_atom * removed / out.number) })
        notes[#notes + 1] = string.format("the energy left by the removed atoms raises T by %.3g nK",
          (out.temperature - s.temperature) / cp.units.nK)
      end
      local left = out.atoms[1].number + out.atoms[2].number
      if left >= 1 then
        notes[#notes + 1] = string.format("%.3g leftover atoms remain (%s %.3g, %s %.3g)", left,
          out.atoms[1].name, out.atoms[1].number, out.atoms[2].name, out.atoms[2].number)
      end
      return out, { duration = p.duration, notes = notes }
    end,
  })
end

-- ---- associate ------------------------------------------------------------------------

-- The resonance a stage names: nil (the first known for the molecule), an index into the
-- molecule's list, or a table {b0, width, abg, dmu} (T, T, m, J/T).
local RESONANCE_KEYS = { "b0", "width", "abg", "dmu", "c6_au", "molecule", "states", "source", "verified" }

-- A resonance table's fields checked where the stage is built (as cp.feshbach reads them).
local function check_resonance_table(spec)
  local where = "stages.associate: argument 'resonance'"
  A.table(where, spec, RESONANCE_KEYS)
  for _, k in ipairs { "b0", "width", "abg", "dmu" } do
    A.number(where, spec, k, ({ b0 = "T", width = "T", abg = "m", dmu = "J/T" })[k])
  end
  A.number(where, spec, "c6_au", "a.u.", { optional = true, positive = true })
end

local function resonance_of(spec, molecule)
  if spec == nil or math.type(spec) == "integer" then
    local ok, r = pcall(cp.species.resonance, molecule, spec or 1)
    if not ok then A.fail("argument 'resonance'", "%s", tostring(r)) end
    return r
  end
  return spec
end

-- The molecules' trap: a weakly bound molecule feels the sum of its atoms' optical
-- potentials, so its spring constants add: w_i^2 = (m_a wa_i^2 + m_b wb_i^2)/(m_a + m_b).
local function molecule_trap(a, b)
  local w = {}
  for i = 1, 3 do
    w[i] = math.sqrt((a.mass * a.trap_frequencies[i] ^ 2 + b.mass * b.trap_frequencies[i] ^ 2)
      / (a.mass + b.mass))
  end
  return w
end

-- cp.stages.associate{ramp_rate (T/s) [, resonance, span (T), max_efficiency, alpha (m^2/s),
--   samples, seed, label]}
function M.associate(args)
  local fname = "stages.associate"
  A.table(fname, args, { "resonance", "ramp_rate", "span", "max_efficiency", "alpha", "samples",
    "seed", "label" })
  local p = {
    ramp_rate = A.number(fname, args, "ramp_rate", "T/s", { positive = true, max = 1e9 }),
    span = A.number(fname, args, "span", "T", { optional = true, positive = true, max = 1 }),
    max_efficiency = A.number(fname, args, "max_efficiency", "fraction", { optional = true, positive = true, max = 1 }),
    alpha = A.number(fname, args, "alpha", "m^2/s", { optional = true, positive = true }),
    samples = A.number(fname, args, "samples", "", { optional = true, default = 20000, min = 100, max = 1e7 }),
    seed = A.number(fname, args, "seed", "", { optional = true, default = 1, nonnegative = true }),
  }
  if args.resonance ~= nil and type(args.resonance) ~= "table" and math.type(args.resonance) ~= "integer" then
    A.fail(fname, "argument 'resonance' must be an index or a table {b0, width, abg, dmu}, got %s",
      type(args.resonance))
  end
  if type(args.resonance) == "table" then check_resonance_table(args.resonance) end
  return new_stage("associate", args, {
    accepts = { ["atom-mixture"] = true }, produces = "feshbach-molecules", params = p,
    hint = "magnetoassociation acts on the atom mixture, so it comes first",
    run = function(self, s)
      local mol = s.molecule
      local r = resonance_of(args.resonance, mol.name)
      self.equipment = { { kind = "coil", what = "Feshbach field", field = r.b0 } }
      local ib = S.minority(s.atoms)
      local b, a = s.atoms[ib], s.atoms[3 - ib]
      local notes = {}
      if r.verified == false then
        notes[#notes + 1] = string.format("the %s resonance at %.4g G is built-in data marked "
          .. "unverified (see its source in cp.species.resonance): check b0, width and abg before "
          .. "trusting this stage", mol.name, r.b0 / cp.units.G)
      end
      for _, c in ipairs { a, b } do
        if c.statistics == "fermion" and c.degeneracy < 1 then
          notes[#notes + 1] = string.format("%s is degenerate (T/T_F = %.2g): the molecules take the "
            .. "pairs' temperature and leave out the Fermi motion of its atoms, so they start colder "
            .. "than they would", c.name, c.degeneracy)
        end
        if c.statistics == "boson" and c.degeneracy < 1 then
          -- overlap_density has no profile for a partly condensed cloud without the atoms'
          -- scattering length (not in the species data)
          notes[#notes + 1] = string.format("%s is below T_c (condensed fraction %.2g): the overlap "
            .. "density treats it as a thermal cloud; a condensate is denser and smaller", c.name,
            c.condensed_fraction or 0)
        end
      end
      local ov = MODEL.overlap(a, b)
      local pmax = p.max_efficiency
      if not pmax then
        pmax = MODEL.max_efficiency(a, b, p.samples, p.seed)
        notes[#notes + 1] = string.format("phase-space ceiling of the conversion P_max = %.3g "
          .. "(stochastic phase-space sampling)", pmax)
      end
      local res = cp.feshbach.associate { resonance = r, molecule = mol.name, ramp_rate = p.ramp_rate,
        density = ov.density, max_efficiency = pmax, alpha = p.alpha }
      local eff = res.efficiency
      notes[#notes + 1] = string.format("overlap density %.3g cm^-3 (differential sag %.3g um); "
        .. "Landau-Zener probability %.3g", ov.density / cp.units.per_cm3, ov.sag / cp.units.um,
        eff / pmax)
      local n = eff * b.number
      local out = S.copy(s)
      out.kind, out.name, out.mass, out.statistics = "feshbach-molecules", mol.name, mol.mass, mol.statistics
      out.number = n
      -- the centre-of-mass motion of uncorrelated thermal pairs: T = (m_a T_a + m_b T_b)/M
      out.temperature = (a.mass * a.temperature + b.mass * b.temperature) / (a.mass + b.mass)
      out.trap_frequencies = molecule_trap(a, b)
      for _, c in ipairs(out.atoms) do c.number = c.number - n end
      local span = p.span or math.abs(r.width)
      return out, { duration = span / p.ramp_rate, notes = notes }
    end,
  })
end

-- ---- transfer -------------------------------------------------------------------------

local PULSE_KEYS = { "rabi_pump", "rabi_stokes", "width", "delay", "gamma", "detuning",
  "two_photon_detuning", "pump_linewidth_hz", "stokes_linewidth_hz", "relative_linewidth_hz",
  "shape" }

-- cp.stages.transfer{rabi_pump, rabi_stokes, width, delay, gamma, ... (as cp.raman.transfer)
--   | efficiency | round_trip_efficiency [, pump_power, stokes_power, label]}
function M.transfer(args)
  local fname = "stages.transfer"
  local keys = { "efficiency", "round_trip_efficiency", "pump_power", "stokes_power", "label" }
  for _, k in ipairs(PULSE_KEYS) do keys[#keys + 1] = k end
  A.table(fname, args, keys)
  local given = {}
  for _, k in ipairs { "efficiency", "round_trip_efficiency" } do
    if args[k] ~= nil then given[#given + 1] = k end
  end
  local pulse = {}
  for _, k in ipairs(PULSE_KEYS) do pulse[k] = args[k] end
  if next(pulse) ~= nil then given[#given + 1] = "pulse parameters" end
  if #given ~= 1 then
    A.fail(fname, "give exactly one of: the pulse parameters (rabi_pump, rabi_stokes, width, delay, "
      .. "gamma, ...), 'efficiency' (one-way) or 'round_trip_efficiency'%s",
      #given > 1 and ("; got " .. table.concat(given, " and ")) or "")
  end
  local eff
  if args.efficiency then
    eff = A.number(fname, args, "efficiency", "fraction", { positive = true, max = 1 })
  elseif args.round_trip_efficiency then
    -- both directions equally efficient: one way = sqrt(round trip) (physics.md 5.2)
    eff = math.sqrt(A.number(fname, args, "round_trip_efficiency", "fraction", { positive = true, max = 1 }))
  else
    for _, k in ipairs { "rabi_pump", "rabi_stokes", "width", "delay", "gamma" } do
      A.number(fname, args, k, k == "delay" and "s" or (k == "width" and "s" or "rad/s"))
    end
  end
  local equipment = {}
  for _, k in ipairs { "pump_power", "stokes_power" } do
    local w = A.number(fname, args, k, "W", { optional = true, positive = true })
    equipment[#equipment + 1] = { kind = "laser", what = (k == "pump_power" and "pump" or "Stokes")
      .. " laser of the two-photon transfer", power = w }
  end
  -- the model result does not depend on the sample: compute it once, here, so that a bad
  -- pulse parameter is an error of this constructor rather than of a later plan run
  local result
  if not eff then
    local ok, r = pcall(cp.raman.transfer, pulse)
    if not ok then A.fail(fname, "%s", (tostring(r):gsub("^[^:\n]*coldprep/%w+%.lua:%d+: ", ""))) end
    result = r
  end
  local st = new_stage("transfer", args, {
    accepts = { ["feshbach-molecules"] = true }, produces = "ground-state-molecules",
    equipment = equipment, params = { efficiency = eff, pulse = pulse },
    hint = "the two-photon transfer starts from Feshbach molecules: place it after cp.stages.associate",
  })
  st.run = function(_, s)
    local notes = {}
    local e = eff or result.efficiency
    if result then
      notes[#notes + 1] = string.format("one-way efficiency %.4g from the Lambda-system model "
        .. "(round trip %.3g if both ways are alike, what imaging after a return pulse sees); "
        .. "%.3g lost through the excited state, %.3g left in the Feshbach state", e, e * e,
        result.lost, result.populations.initial)
    else
      notes[#notes + 1] = string.format("one-way efficiency %.4g as given", e)
    end
    -- the molecules that fail to transfer are lost at random (the energy per molecule is kept)
    local out = S.after_uniform_loss(S.with(s, { kind = "ground-state-molecules" }), s.number * e)
    return out, { duration = result and MODEL.pulse_duration(result) or 0, notes = notes }
  end
  return st
end

-- ---- change_trap ----------------------------------------------------------------------

-- Rule of thumb for a smooth trap ramp: |d omega/dt| / omega^2 well below 1 on every axis
-- (common practice, no source); above ADIABATIC_LIMIT the budget warns.
local ADIABATIC_LIMIT = 0.1

-- cp.stages.change_trap{trap_frequencies (rad/s), ramp_time (s) [, beam_power (W), label]}
function M.change_trap(args)
  local fname = "stages.change_trap"
  A.table(fname, args, { "trap_frequencies", "ramp_time", "beam_power", "label" })
  local w_to = A.frequencies(fname, args, "trap_frequencies")
  local ramp = A.number(fname, args, "ramp_time", "s", { positive = true, max = 1e3 })
  local power = A.number(fname, args, "beam_power", "W", { optional = true, positive = true })
  return new_stage("change_trap", args, {
    accepts = MOLECULES, adiabatic = true,
    params = { trap_frequencies = w_to, ramp_time = ramp, beam_power = power },
    equipment = { { kind = "laser", what = "new optical trap", power = power } },
    hint = "the trap change acts on molecules; associate first",
    run = function(_, s)
      local notes = {}
      local worst = 0
      for i = 1, 3 do
        local w0, w1 = s.trap_frequencies[i], w_to[i]
        worst = math.max(worst, math.abs(w1 - w0) / (ramp * math.min(w0, w1) ^ 2))
      end
      if worst > ADIABATIC_LIMIT then
        notes[#notes + 1] = string.format("trap ramp not adiabatic: |dw/dt|/w^2 = %.2g "
          .. "(want << 1); the temperature shown assumes an adiabatic change", worst)
      end
      local T = MODEL.match_harmonic(s, w_to)
      local out = S.with(s, { trap_frequencies = w_to, temperature = T })
      if s.lattice then
        -- the lattice sample is described by its envelope trap at the same entropy, so the
        -- change is the lattice ramped down adiabatically into the new trap
        out.lattice = nil
        notes[#notes + 1] = "leaves the lattice: its photon-scattering heating no longer applies"
      end
      return out, { duration = ramp, notes = notes, adiabatic = true }
    end,
  })
end

-- ---- hold -----------------------------------------------------------------------------

-- Above this fraction of the p-wave barrier height the universal rate gets a note
-- (common practice, no source: the threshold laws need kB T well below the barrier).
local BARRIER_FRACTION = 0.1

-- Two-body loss coefficient of the sample's molecules (m^3/s) at its temperature: the
-- given one, or the universal rate from the molecule's C6 (Idziaszek & Julienne 2010,
-- through cp.collisions.universal_rate); notes say which and what it assumes.
local function loss_rate(s, given, notes)
  if given then
    notes[#notes + 1] = string.format("two-body loss coefficient %.3g cm^3/s as given", given / cp.units.cm3)
    return given
  end
  local mol = s.molecule
  local beta = cp.collisions.universal_rate { c6_au = mol.c6_au, mass = mol.mass / 2,
    temperature = s.temperature, statistics = s.statistics }.rate
  local why = {}
  if s.kind == "feshbach-molecules" then
    why[#why + 1] = "Feshbach molecules relax faster than this ground-state estimate"
  end
  if not mol.reactive then
    why[#why + 1] = "non-reactive " .. mol.name .. ": sticky-complex loss taken at the universal rate"
  end
  -- the threshold laws behind the universal rate hold well below the p-wave barrier
  local barrier = cp.collisions.pwave_barrier { c6_au = mol.c6_au, mass = mol.mass / 2 }.temperature
  if s.temperature > BARRIER_FRACTION * barrier then
    why[#why + 1] = string.format("T is %.2g of the p-wave barrier (%.3g uK): beyond the threshold "
      .. "regime this rate is only an estimate", s.temperature / barrier, barrier / cp.units.uK)
  end
  notes[#notes + 1] = string.format("two-body loss: universal %s-wave rate %.3g cm^3/s at %.3g nK "
    .. "(C6 = %.4g a.u.)%s", s.statistics == "fermion" and "p" or "s", beta / cp.units.cm3,
    s.temperature / cp.units.nK, mol.c6_au, #why > 0 and ("; " .. table.concat(why, "; ")) or "")
  return beta
end

local function leftover_note(s, notes)
  local left = s.atoms[1].number + s.atoms[2].number
  if left >= 1 then
    notes[#notes + 1] = string.format("%.3g leftover atoms still present: atom-molecule collisions "
      .. "are not modelled (remove them first)", left)
  end
end

-- The hold and evaporation models assume a thermal (non-degenerate) cloud; say so when the
-- cloud `when` ("starts" or "ends") the stage degenerate.
local function thermal_note(s, notes, what, when)
  if s.degeneracy < 1 then
    notes[#notes + 1] = string.format("the %s model treats the cloud as thermal; it %s at %s = %.2g",
      what, when, s.degeneracy_name, s.degeneracy)
  end
end

-- Evaporation longer than this (s) gets a note that one-body loss is missing from it
-- (common practice, no source: molecule lifetimes in optical traps are of order seconds).
local LONG_EVAPORATION = 1

-- cp.stages.hold{duration (s) [, lifetime (s), heating_rate (K/s), loss_rate (m^3/s), label]}
function M.hold(args)
  local fname = "stages.hold"
  A.table(fname, args, { "duration", "lifetime", "heating_rate", "loss_rate", "label" })
  local p = {
    duration = A.number(fname, args, "duration", "s", { positive = true, max = 1e5 }),
    lifetime = A.number(fname, args, "lifetime", "s", { optional = true, positive = true, max = 1e9 }),
    heating_rate = A.number(fname, args, "heating_rate", "K/s", { optional = true, default = 0, nonnegative = true, max = 1 }),
    loss_rate = A.number(fname, args, "loss_rate", "m^3/s", { optional = true, nonnegative = true, max = 1e-8 }),
  }
  return new_stage("hold", args, {
    accepts = MOLECULES, params = p,
    hint = "the hold models molecule losses; associate first",
    run = function(_, s)
      local notes = {}
      local beta = loss_rate(s, p.loss_rate, notes)
      local heating = p.heating_rate
      if s.lattice then
        heating = heating + s.lattice.heating_rate
        notes[#notes + 1] = string.format("photon scattering in the lattice heats at %.3g nK/s",
          s.lattice.heating_rate / cp.units.nK)
        notes[#notes + 1] = "in the lattice: two-body loss at the mean density of the envelope trap; "
          .. "on-site loss and its suppression by the lattice (one fermion per site in the lowest "
          .. "band) are not modelled"
      end
      leftover_note(s, notes)
      thermal_note(s, notes, "hold", "starts")
      local r = MODEL.hold(s, beta, p.lifetime, heating, p.duration)
      return S.with(s, { number = r.number, temperature = r.temperature }),
        { duration = p.duration, notes = notes }
    end,
  })
end

-- ---- evaporate ------------------------------------------------------------------------

-- Induced lab-frame dipole of a J = 0 molecule in a weak electric field F:
-- d_ind = d^2 F / (3 B) (second-order Stark shift -d^2 F^2 / (6 B), B the rotational
-- constant in J; standard perturbation theory [M]), valid while d F << B; capped at d.
local function induced_dipole_debye(mol, field)
  local d = mol.dipole_debye * cp.consts.debye
  local B = cp.consts.h * mol.rot_const_hz
  return math.min(d * d * field / (3 * B), d) / cp.consts.debye, d * field / B
end

-- The largest elastic-to-loss ratio cp.collisions.evaporation accepts.
local NO_LOSS_RATIO = 1e12

-- cp.stages.evaporate{eta, final_number | keep | final_temperature (K) | final_depth (J) |
--   duration (s), electric_field (V/m) | cross_section (m^2) [, ratio, kappa, loss_rate, label]}
function M.evaporate(args)
  local fname = "stages.evaporate"
  A.table(fname, args, { "eta", "final_number", "keep", "final_temperature", "final_depth",
    "duration", "electric_field", "cross_section", "ratio", "kappa", "loss_rate", "label" })
  local p = {
    eta = A.number(fname, args, "eta", "U/kB T", { min = 5, max = 30 }),
    final_number = A.number(fname, args, "final_number", "particles", { optional = true, min = 1 }),
    keep = A.number(fname, args, "keep", "fraction", { optional = true, positive = true, max = 1 }),
    final_temperature = A.number(fname, args, "final_temperature", "K", { optional = true, positive = true }),
    final_depth = A.number(fname, args, "final_depth", "J", { optional = true, positive = true }),
    duration = A.number(fname, args, "duration", "s", { optional = true, positive = true, max = 1e5 }),
    electric_field = A.number(fname, args, "electric_field", "V/m", { optional = true, positive = true, max = 1e8 }),
    cross_section = A.number(fname, args, "cross_section", "m^2", { optional = true, positive = true }),
    ratio = A.number(fname, args, "ratio", "elastic/loss", { optional = true, positive = true }),
    kappa = A.number(fname, args, "kappa", "kB T", { optional = true, min = 0, max = 2 }),
    loss_rate = A.number(fname, args, "loss_rate", "m^3/s", { optional = true, nonnegative = true, max = 1e-8 }),
  }
  if p.keep == 1 then
    A.fail(fname, "argument 'keep' = 1 fraction is out of range; allowed (0, 1) fraction "
      .. "(an evaporation must lose particles)")
  end
  local ends = 0
  for _, k in ipairs { "final_number", "keep", "final_temperature", "final_depth", "duration" } do
    if p[k] then ends = ends + 1 end
  end
  if ends ~= 1 then
    A.fail(fname, "give exactly one end point: 'final_number', 'keep' (fraction kept), "
      .. "'final_temperature' (K), 'final_depth' (J) or 'duration' (s)")
  end
  if not (p.ratio or p.electric_field or p.cross_section) then
    A.fail(fname, "missing argument 'electric_field' (V/m, polarises the molecules for dipolar "
      .. "elastic collisions) or 'cross_section' (m^2) or 'ratio' (elastic to loss collisions)")
  end
  if p.duration and p.ratio then
    A.fail(fname, "argument 'duration' needs the collision rates: give 'electric_field' or "
      .. "'cross_section' instead of 'ratio'")
  end
  local equipment = {}
  if p.electric_field then
    equipment[1] = { kind = "electric", what = "electric field for dipolar collisions", field = p.electric_field }
  end
  return new_stage("evaporate", args, {
    accepts = { ["ground-state-molecules"] = true }, params = p, equipment = equipment,
    hint = "evaporation of molecules needs ground-state molecules: place it after cp.stages.transfer",
    run = function(_, s)
      local notes = {}
      local mol = s.molecule
      local beta = loss_rate(s, p.loss_rate, notes)
      local sigma = p.cross_section
      if not sigma and not p.ratio then
        local d, x = induced_dipole_debye(mol, p.electric_field)
        sigma = cp.collisions.dipolar_cross_section { dipole_debye = d, mass = mol.mass / 2,
          statistics = s.statistics }.cross_section
        notes[#notes + 1] = string.format("induced dipole %.3g D at %.3g kV/cm (d F / B = %.2g%s); "
          .. "dipolar elastic cross section %.3g cm^2", d, p.electric_field / 1e5, x,
          x > 0.3 and ", beyond the weak-field formula" or "", sigma / 1e-4)
      end
      local ratio = p.ratio
      if not ratio and beta == 0 then
        -- no two-body loss: the largest ratio the scaling model takes stands for "no loss"
        ratio = NO_LOSS_RATIO
        notes[#notes + 1] = string.format("no two-body loss: ratio of elastic to loss collisions "
          .. "taken as %.0e, the model's limit", ratio)
      else
        ratio = ratio or cp.collisions.collision_ratio { cross_section = sigma, rate = beta,
          mass = mol.mass, temperature = s.temperature }.ratio
        notes[#notes + 1] = string.format("ratio of elastic to loss collisions %.3g at the start", ratio)
      end
      leftover_note(s, notes)
      thermal_note(s, notes, "evaporation", "starts")
      local target = { number = p.final_number or (p.keep and p.keep * s.number),
        temperature = p.final_temperature or (p.final_depth and p.final_depth / (p.eta * cp.consts.kB)),
        duration = p.duration, sigma = sigma, beta = beta }
      if target.number and target.number >= s.number then
        error(string.format("argument 'final_number' = %.4g is not below the %.4g molecules the "
          .. "evaporation starts with", target.number, s.number), 0)
      end
      if target.temperature and target.temperature >= s.temperature then
        error(string.format("argument '%s' asks for %.4g nK, not below the %.4g nK the evaporation "
          .. "starts at%s", p.final_temperature and "final_temperature" or "final_depth",
          target.temperature / cp.units.nK, s.temperature / cp.units.nK,
          p.final_depth and string.format(" (final_depth / (eta kB) at eta = %g)", p.eta) or ""), 0)
      end
      if s.lattice then
        notes[#notes + 1] = "in the lattice: the evaporation model uses the envelope trap of the same "
          .. "entropy; evaporation out of a deep lattice is not what it describes"
      end
      local r = MODEL.evaporate(s, p.eta, p.kappa, ratio, target)
      if r.efficiency <= 0 then
        notes[#notes + 1] = string.format("evaporation does not gain phase-space density "
          .. "(efficiency %.2g): losses outrun thermalisation", r.efficiency)
      end
      local out = S.with(s, { number = r.number, temperature = r.temperature })
      if s.degeneracy >= 1 then thermal_note(out, notes, "evaporation", "ends") end
      local duration, unknown = 0, false
      if sigma then
        local times = MODEL.evaporation_times(s, r, p.eta, sigma, beta)
        duration = times[#times]
        if duration > LONG_EVAPORATION then
          notes[#notes + 1] = string.format("the evaporation takes %.3g s%s: one-body loss "
            .. "(background gas, light scattering) during it is not modelled, and molecule "
            .. "lifetimes in optical traps are typically seconds", duration,
            duration > 60 and " (minutes: not a realistic plan)" or "")
        end
      else
        unknown = true
        notes[#notes + 1] = "duration unknown (only the collision ratio was given); not counted in the elapsed time"
      end
      return out, { duration = duration, duration_unknown = unknown, notes = notes }
    end,
  })
end

-- ---- load_lattice ---------------------------------------------------------------------

-- Excited fraction above which the budget warns that loading was not adiabatic
-- (common practice, no source).
local EXCITED_WARNING = 0.01
-- A lattice shallower than this many kB T does not hold the molecules (common practice,
-- no source: optical traps are made ~10 kB T deep and deeper).
local SHALLOW_LATTICE = 10

-- cp.stages.load_lattice{wavelength (m), power (W per beam), waist (m), polarizability_au,
--   ramp_time (s) [, ramp_shape = "s-shaped", imag_polarizability_au, reflectivity = 1,
--   label]}: a cubic lattice of three retro-reflected beams, the molecules' new trap.
function M.load_lattice(args)
  local fname = "stages.load_lattice"
  A.table(fname, args, { "wavelength", "power", "waist", "polarizability_au", "ramp_time",
    "ramp_shape", "imag_polarizability_au", "reflectivity", "label" })
  local p = {
    wavelength = A.number(fname, args, "wavelength", "m", { positive = true }),
    power = A.number(fname, args, "power", "W", { positive = true }),
    waist = A.number(fname, args, "waist", "m", { positive = true }),
    polarizability_au = A.number(fname, args, "polarizability_au", "a.u.", { positive = true }),
    ramp_time = A.number(fname, args, "ramp_time", "s", { positive = true, max = 1e4 }),
    ramp_shape = A.option(fname, args, "ramp_shape", { "linear", "s-shaped" }, "s-shaped"),
    imag_polarizability_au = A.number(fname, args, "imag_polarizability_au", "a.u.",
      { optional = true, default = 0, nonnegative = true }),
    reflectivity = A.number(fname, args, "reflectivity", "fraction", { optional = true, default = 1, positive = true, max = 1 }),
  }
  return new_stage("load_lattice", args, {
    accepts = MOLECULES, adiabatic = true, params = p,
    equipment = { { kind = "laser", what = "lattice beams (each of three)", power = p.power,
      wavelength = p.wavelength } },
    hint = "the lattice holds molecules; associate first",
    run = function(_, s)
      local notes = {}
      local lat = MODEL.lattice(s, p)
      notes[#notes + 1] = string.format("depth %.3g E_r (%.3g uK) per axis; envelope %.3g x %.3g x "
        .. "%.3g Hz", lat.depth_er, lat.depth / cp.consts.kB / cp.units.uK, lat.omega[1] / (2 * math.pi),
        lat.omega[2] / (2 * math.pi), lat.omega[3] / (2 * math.pi))
      -- entropy is conserved by the adiabatic part of the loading (cp.thermo.match_lattice)
      local m = MODEL.match_lattice(s, lat)
      local depth_kt = lat.depth / (cp.consts.kB * m.temperature)
      if depth_kt < SHALLOW_LATTICE then
        notes[#notes + 1] = string.format("the lattice is only %.2g kB T deep: molecules are not held "
          .. "in it (the model takes it as infinitely deep and ignores gravity)", depth_kt)
      end
      -- molecules left in excited bands carry the interband energy; once it is shared it
      -- adds dS = dE / (kB T) per particle, to first order in the excited fraction
      local f = lat.excited_fraction
      local ds = f * lat.excitation_energy / (cp.consts.kB * m.temperature)
      if f > EXCITED_WARNING then
        notes[#notes + 1] = string.format("loading ramp not adiabatic: %.3g %% excited (adds %.2g kB "
          .. "per particle)", 100 * f, ds)
      end
      local out = S.copy(s)
      out.trap_frequencies = lat.omega
      out.temperature = S.temperature_for_entropy(out, s.entropy_per_particle + ds)
      out.lattice = { depth_er = lat.depth_er, depth = lat.depth, wavelength = p.wavelength,
        spacing = lat.spacing, temperature = m.temperature, peak_filling = m.peak_filling,
        heating_rate = lat.heating_rate }
      notes[#notes + 1] = string.format("adiabatic loading alone: T = %.3g nK in the lattice, %s; the "
        .. "degeneracy shown is that of the same entropy in the envelope trap (the lattice ramped "
        .. "down adiabatically)",
        m.temperature / cp.units.nK, m.peak_filling and string.format("peak filling %.2g per site",
          m.peak_filling) or string.format("condensed fraction %.2g", m.condensed_fraction or 0))
      if lat.heating_rate > 0 then
        notes[#notes + 1] = string.format("photon scattering: %.3g /s per molecule, heating %.3g nK/s "
          .. "in later holds", lat.scattering_rate, lat.heating_rate / cp.units.nK)
      end
      return out, { duration = p.ramp_time, notes = notes, adiabatic = true }
    end,
  })
end

-- ---- help texts -----------------------------------------------------------------------

local HELP = {
  custom = [[
stages.custom{name, fn [, accepts, produces, adiabatic, equipment]} -> stage
A stage of your own.  fn(sample) receives a copy of the sample (see docs/planning.md: kind,
species, molecule, number, temperature (K), trap_frequencies {wx, wy, wz} (rad/s), atoms,
elapsed ...) and returns the changed sample and optionally a record {duration (s), notes =
{...}}.  The plan recomputes degeneracy, density and entropy from the thermo model.  For an
atom mixture change s.atoms[1] and s.atoms[2].  accepts: a kind or list of kinds (default
any); produces: the kind it hands on; equipment: list of {kind = "laser", what, power (W)}
| {kind = "coil", what, field (T)} | {kind = "electric", what, field (V/m)} for the safety
cautions.  Example:
  cp.stages.custom{name = "imaging", fn = function(s) s.number = 0.95 * s.number; return s,
    {duration = 1e-3, notes = {"5 % lost to imaging light"}} end}]],
  associate = [[
stages.associate{ramp_rate (T/s) [, resonance, span (T), max_efficiency, alpha (m^2/s),
  samples = 20000, seed = 1, label]} -> stage
Magnetoassociation of the atom mixture into Feshbach molecules (cp.feshbach): the partner
density averaged over the minority cloud (overlap_density, with gravitational sag), the
phase-space ceiling P_max (max_efficiency, stochastic phase-space sampling; or give it),
and the ramp-rate law P = P_max (1 - exp(-alpha n |abg width / ramp_rate|)).  resonance: an
index into cp.species.resonance(molecule, i) (default 1) or a table {b0, width, abg, dmu}.
The ramp lasts span / ramp_rate (span default |width|).  Molecules: T = (m_a T_a + m_b T_b)/M,
trap m w^2 = m_a w_a^2 + m_b w_b^2 per axis.  Example: cp.stages.associate{ramp_rate =
0.5*cp.units.G/cp.units.ms}]],
  transfer = [[
stages.transfer{rabi_pump, rabi_stokes (rad/s), width, delay (s), gamma (rad/s)
  [, detuning, two_photon_detuning, pump_linewidth_hz, stokes_linewidth_hz,
  relative_linewidth_hz, shape] | efficiency | round_trip_efficiency
  [, pump_power, stokes_power (W), label]} -> stage
Two-photon (STIRAP) transfer of Feshbach molecules to the ground state.  With pulse
parameters the one-way efficiency comes from cp.raman.transfer (arguments as there); or
give a measured one-way efficiency, or a round trip (one way = sqrt(round trip)).  Number
times efficiency; the failed molecules are lost at random, so the energy per molecule is
kept (a degenerate Fermi gas heats).  Trap unchanged: the ground-state molecules are assumed to
have the Feshbach molecules' polarizability at the trap wavelength (if not, their trap
frequencies scale as sqrt(alpha_ground / alpha_Feshbach): add a cp.stages.change_trap).
Example: cp.stages.transfer{round_trip_efficiency = 0.8}]],
  remove_atoms = [[
stages.remove_atoms{[efficiency = 1, molecule_loss = 0, heating_per_atom = 0 (J),
  duration = 0 (s), label]} -> stage
Removes the fraction `efficiency` of the leftover atoms (resonant light, microwave
sweeps); a fraction molecule_loss of the molecules is lost with them (at random, energy
per molecule kept), and each removed atom
leaves heating_per_atom of energy in the molecules (the new temperature from the thermo
model's energy per particle).  Example: cp.stages.remove_atoms{heating_per_atom =
2*cp.units.nK*cp.consts.kB}]],
  change_trap = [[
stages.change_trap{trap_frequencies = {wx, wy, wz} (rad/s), ramp_time (s) [, beam_power (W),
  label]} -> stage
An adiabatic change of the harmonic trap: the temperature from entropy matching
(cp.thermo.match_harmonic).  After load_lattice it ramps the lattice down into the new
trap (the lattice's heating stops).  A note warns when |d omega/dt|/omega^2 > 0.1 on an axis (the
ramp is then too fast for the adiabatic result).  Example: cp.stages.change_trap{
trap_frequencies = {2*math.pi*60, 2*math.pi*70, 2*math.pi*200}, ramp_time = 0.05}]],
  load_lattice = [[
stages.load_lattice{wavelength (m), power (W per beam), waist (m), polarizability_au,
  ramp_time (s) [, ramp_shape = "s-shaped" | "linear", imag_polarizability_au,
  reflectivity = 1, label]} -> stage
Loading into a cubic lattice of three retro-reflected beams: depth and envelope from
cp.lattice.depth3d, adiabatic loading by entropy matching (cp.thermo.match_lattice), the
fraction left in excited bands by a finite ramp (cp.lattice.loading; it adds its interband
energy as entropy, dS = f dE / kB T), photon-scattering heating (cp.lattice.heating, used by
later holds).  The degeneracy shown afterwards is that of the same entropy in the envelope
trap.  Example: cp.stages.load_lattice{wavelength = 1064e-9, power = 2, waist = 150e-6,
polarizability_au = 700, ramp_time = 0.05}]],
  hold = [[
stages.hold{duration (s) [, lifetime (s), heating_rate (K/s), loss_rate (m^3/s), label]}
  -> stage
Molecules held in their trap: two-body loss (loss_rate, or the universal rate from the
molecule's C6 and statistics, cp.collisions.universal_rate) with its anti-evaporation
heating, one-body loss, technical heating, and the lattice's photon-scattering heating
(cp.collisions.hold, a thermal-cloud model).  Example: cp.stages.hold{duration = 0.1,
lifetime = 5}]],
  evaporate = [[
stages.evaporate{eta, final_number | keep | final_temperature (K) | final_depth (J) |
  duration (s), electric_field (V/m) | cross_section (m^2) | ratio [, kappa,
  loss_rate (m^3/s), label]}
  -> stage
Evaporation of ground-state molecules at truncation eta (5..30) in the fixed trap
(cp.collisions.evaporation, the scaling model).  Elastic collisions: the dipolar cross
section (cp.collisions.dipolar_cross_section) of the dipole induced by electric_field
(d^2 F/(3B), weak field), or a given cross_section, or a given ratio of elastic to loss
collisions.  Ends at a number, a kept fraction (0 < keep < 1), a temperature, or a trap
depth (T = depth/(eta kB)), which must lie below the sample's, or after a duration (needs
electric_field or cross_section).  Duration from the
trajectory (unknown, NaN, with only a ratio); one-body loss is not modelled (a note
flags evaporations longer than 1 s).  Example: cp.stages.evaporate{eta = 8, final_temperature = 60e-9,
electric_field = 0.6e5}]],
}
for name, text in pairs(HELP) do cp.set_help(M[name], text) end

return M
