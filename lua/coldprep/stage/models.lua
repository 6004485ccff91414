-- coldprep.stage.models: the bridges from a sample to the model bindings (cp.feshbach,
-- cp.raman, cp.collisions, cp.thermo): the few places where a stage turns a sample into
-- a model call's arguments.  Used by the stage files in this folder.
local cp = require "coldprep"
local S = require "coldprep.sample"
local common = require "coldprep.stage.common"

local MODEL = {}

-- A cloud of the sample in the form cp.feshbach takes: a boson as a Bose gas (its condensate
-- below T_c a Thomas-Fermi cloud of the cloud's scattering length), a fermion as a Fermi gas.
local function fb_cloud(c)
  local a = c.scattering_length
  return { atom = c.name, number = c.number, omega_x = c.trap_frequencies[1],
    omega_y = c.trap_frequencies[2], omega_z = c.trap_frequencies[3],
    profile = c.statistics == "boson" and "bose" or "fermi",
    scattering_length = (a and a > 0) and a or nil }
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

-- The time the two-photon pulse sequence takes: the model's transfer duration |delay| +
-- 2 width (over which its slow losses act), not the longer integration window.
function MODEL.pulse_duration(result)
  return result.transfer_duration
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

-- Evaporation at truncation eta in the fixed trap (cp.collisions.evaporation) down to
-- target.number, or to the number at which the trajectory reaches target.temperature or
-- lasts target.duration (interpolated in ln N over a fine trajectory; a duration needs
-- target.sigma and target.beta for the rates): {number, temperature, efficiency, numbers,
-- temperatures [, duration (s), times: the trajectory's clock when target.sigma is known]}.
function MODEL.evaporate(s, eta, kappa, ratio, target)
  local w = s.trap_frequencies
  local args = { number = s.number, temperature = s.temperature, mass = s.mass,
    omega_x = w[1], omega_y = w[2], omega_z = w[3], eta = eta, kappa = kappa, ratio = ratio,
    wave = s.statistics == "fermion" and "p" or "s",
    cross_section = target.sigma, loss_rate = target.sigma and target.beta or nil }
  if target.number then
    args.final_number, args.points = target.number, 64
    return cp.collisions.evaporation(args)
  end
  -- (towards a temperature the trajectory need not be integrated past it: the points up to
  -- there are the same)
  args.final_number, args.points = math.max(1, s.number * 1e-6), 400
  args.stop_temperature = target.temperature
  local tr = cp.collisions.evaporation(args)
  args.stop_temperature = nil
  local n, t = tr.numbers, tr.temperatures
  -- the quantity that marks the end point along the trajectory, and its target value
  local along, goal
  if target.temperature then
    along, goal = function(i) return math.log(t[i]) end, math.log(target.temperature)
  else
    along, goal = function(i) return -tr.times[i] end, -target.duration
  end
  for i = 2, #n do
    if along(i) <= goal then
      local f = (goal - along(i - 1)) / (along(i) - along(i - 1))
      args.final_number = n[i - 1] * (n[i] / n[i - 1]) ^ f
      args.points = 64
      return cp.collisions.evaporation(args)
    end
  end
  -- physics, not input: the stage is marked failed and the plan still returns its budget
  if target.temperature then
    common.fail(string.format("the temperature never falls to %.3g nK (it ends at %.3g nK "
      .. "with %.3g particles left); losses outrun the cooling", target.temperature / cp.units.nK,
      t[#t] / cp.units.nK, n[#n]))
  end
  common.fail(string.format("the requested duration %.3g s is longer than the evaporation can "
    .. "last: after %.3g s only %.3g of %.3g particles are left", target.duration,
    tr.times[#n], n[#n], s.number))
end

-- Evaporation with collision rates that follow the temperature (rates(T) -> {ratio,
-- elastic, loss}, the elastic <sigma v> and loss beta in m^3/s): the trajectory is run in
-- segments of 0.2 in ln N by cp.collisions.evaporation, each with the ratio predicted at
-- its starting temperature (inside a segment the model scales it as T^(+-1/2)); time
-- from dt = -d ln N / (<n> (f <sigma v> + beta)) as in cp.collisions.evaporation's clock (f
-- and <n> of the truncated gas, cp.collisions.evaporation_rate).  Ends at
-- target.number, target.temperature or target.duration (interpolated in the last segment,
-- then run exactly to that number): {number, temperature, efficiency, duration, start,
-- finish (the rates at both ends)}.
local SEGMENT = 0.2
function MODEL.evaporate_predicted(s, eta, kappa, rates, target)
  local w, m, kB = s.trap_frequencies, s.mass, cp.consts.kB
  local wbar = S.omega_bar(w)
  local ev = cp.collisions.evaporation_rate { eta = eta } -- Gamma_ev/Gamma_el, mean-density <n>
  local wave = s.statistics == "fermion" and "p" or "s"
  local function run(N, T, r, final)
    return cp.collisions.evaporation { number = N, temperature = T, mass = m, omega_x = w[1],
      omega_y = w[2], omega_z = w[3], eta = eta, kappa = kappa, ratio = math.min(r.ratio, 1e12),
      wave = wave, final_number = final, points = 2 }
  end
  local function rate(N, T, r)
    local n = N * (m * wbar * wbar / (4 * math.pi * kB * T)) ^ 1.5 / ev.truncated_fraction
    return n * (ev.ratio * r.elastic + r.loss)
  end
  local N, T, t = s.number, s.temperature, 0
  local r = rates(T)
  local start = r
  local nmin = math.max(1, s.number * 1e-6)
  local function finish(Nf, Tf, tf, rf)
    local psd0 = s.number / s.temperature ^ 3
    return { number = Nf, temperature = Tf, duration = tf, start = start, finish = rf,
      efficiency = -math.log((Nf / Tf ^ 3) / psd0) / math.log(Nf / s.number) }
  end
  while N > nmin do
    local Nn = math.max(nmin, N * math.exp(-SEGMENT))
    local Tn = run(N, T, r, Nn).temperature
    local rn = rates(Tn)
    local dt = 0.5 * (1 / rate(N, T, r) + 1 / rate(Nn, Tn, rn)) * math.log(N / Nn)
    local frac
    if target.number and Nn <= target.number then
      frac = math.log(N / target.number) / math.log(N / Nn)
    elseif target.temperature and Tn <= target.temperature then
      frac = math.log(T / target.temperature) / math.log(T / Tn)
    elseif target.duration and t + dt >= target.duration then
      frac = (target.duration - t) / dt
    end
    if frac then
      local Nf = target.number or N * (Nn / N) ^ frac
      if Nf >= N then return finish(N, T, t, r) end
      local Tf = run(N, T, r, Nf).temperature
      return finish(Nf, Tf, t + frac * dt, rates(Tf))
    end
    N, T, t, r = Nn, Tn, t + dt, rn
  end
  -- physics, not input: the stage is marked failed and the plan still returns its budget
  if target.temperature then
    common.fail(string.format("the temperature never falls to %.3g nK (it ends at %.3g nK "
      .. "with %.3g particles left); losses outrun the cooling", target.temperature / cp.units.nK,
      T / cp.units.nK, N))
  end
  common.fail(string.format("the requested duration %.3g s is longer than the evaporation can "
    .. "last: after %.3g s only %.3g of %.3g particles are left", target.duration, t, N, s.number))
end

-- The cubic lattice of three equal retro-reflected beams (cp.lattice.depth3d, gravity along
-- z), its loading ramp (cp.lattice.loading: the fraction left in excited bands at q = 0),
-- the energy of that excitation (band 1 to band 3 at q = 0, the first band parity couples,
-- cp.lattice.bands), the tunnelling J of the lowest band (cp.lattice.tunnelling), the
-- photon-scattering heating (cp.lattice.heating) at the intensity the molecules sit in
-- (three standing waves, each (1 + sqrt(R))^2 I0 at its antinodes), and the envelope
-- against gravity: its frequency along z at the sagged minimum replaces the harmonic one.
function MODEL.lattice(s, p)
  local beam = { power = p.power, waist = p.waist, wavelength = p.wavelength,
    polarizability_au = p.polarizability_au, reflectivity = p.reflectivity }
  local d3 = cp.lattice.depth3d { beams = { beam, beam, beam }, mass = s.mass }
  local ax = d3.axes[1]
  local load = cp.lattice.loading { shape = p.ramp_shape, start_er = 0, end_er = ax.depth_er,
    duration = p.ramp_time, mass = s.mass, wavelength = p.wavelength }
  local e = cp.lattice.bands { depth_er = ax.depth_er, bands = 3, quasimomenta = { 0 } }.energies_er[1]
  local g = d3.gravity
  local omega = { d3.omega[1], d3.omega[2], g.held and g.omega or d3.omega[3] }
  local out = { depth_er = ax.depth_er, depth = ax.depth, omega = omega, spacing = ax.spacing,
    wavelength = p.wavelength, recoil = ax.recoil, omega_site = ax.omega_site,
    tunnelling = cp.lattice.tunnelling { depth_er = ax.depth_er }.tunnelling_er * ax.recoil,
    excited_fraction = load.excited_fraction, excitation_energy = (e[3] - e[1]) * ax.recoil,
    heating_rate = 0, scattering_rate = 0, gravity = g, loading_flags = load.flags,
    heating_flags = {} }
  if p.imag_polarizability_au > 0 then
    local intensity = 3 * (1 + math.sqrt(p.reflectivity)) ^ 2 * ax.peak_intensity
    local h = cp.lattice.heating { polarizability_imag_au = p.imag_polarizability_au,
      intensity = intensity, mass = s.mass, wavelength = p.wavelength, depth_er = ax.depth_er }
    out.heating_rate, out.scattering_rate = h.temperature_rate, h.scattering_rate
    out.heating_flags = h.flags
  end
  return out
end

-- The lattice arguments of cp.thermo for the lattice `lat` (bands chosen automatically).
local function lattice_args(s, lat)
  local args = S.thermo_trap(s)
  args.depth_er, args.wavelength = lat.depth_er, lat.wavelength
  args.envelope_omega_x, args.envelope_omega_y, args.envelope_omega_z = lat.omega[1], lat.omega[2], lat.omega[3]
  return args
end

-- The gas after adiabatic loading into the lattice `lat` (cp.thermo.match_lattice, as many
-- bands as k_B T needs).
function MODEL.match_lattice(s, lat)
  local args = lattice_args(s, lat)
  args.temperature = s.temperature
  return cp.thermo.match_lattice(args)
end

-- Site occupation statistics at temperature T with `bands` bands (cp.thermo.lattice_filling;
-- onsite_u (J) for bosons, nil = hard-core).
function MODEL.lattice_filling(s, lat, temperature, bands, onsite_u)
  local args = lattice_args(s, lat)
  args.omega_x, args.omega_y, args.omega_z = nil, nil, nil
  args.temperature, args.bands, args.onsite_u = temperature, bands, onsite_u
  return cp.thermo.lattice_filling(args)
end

return MODEL
