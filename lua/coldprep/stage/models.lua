-- coldprep.stage.models: the bridges from a sample to the model bindings (cp.feshbach,
-- cp.raman, cp.collisions, cp.thermo): the few places where a stage turns a sample into
-- a model call's arguments.  Used by the stage files in this folder.
local cp = require "coldprep"
local S = require "coldprep.sample"

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

return MODEL
