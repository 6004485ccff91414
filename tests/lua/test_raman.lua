-- Lua-level tests of cp.raman through the real coldprep binary: the API of docs/api/raman.md, the
-- area theorem as an outside check, sampled shapes, line shapes and error messages.
local T = require "testlib"
local cp = require "coldprep"
local pi, MHz, us = math.pi, cp.units.MHz, cp.units.us

local ref = { rabi_pump = 2 * pi * 5 * MHz, rabi_stokes = 2 * pi * 5 * MHz, width = 2 * us,
  delay = 2.4 * us, gamma = 2 * pi * 6 * MHz, pump_linewidth_hz = 1e3, stokes_linewidth_hz = 1e3 }
local function with(extra)
  local t = {}
  for k, v in pairs(ref) do t[k] = v end
  for k, v in pairs(extra) do t[k] = v end
  return t
end

-- RAMAN-L1: the result table of docs/api/raman.md; trace + lost = 1 (sink integrated separately).
local r = cp.raman.transfer(with { round_trip = true, trace = 11 })
T.check(r.efficiency == r.populations.target, "efficiency is the target population")
T.near(r.populations.initial + r.populations.excited + r.populations.target + r.lost, 1, 1e-10,
  "trace + lost = 1")
T.check(r.efficiency > 0.85 and r.efficiency < 0.95, "reference case transfers ~90%")
-- docs/models/raman.md: round trip ~ one-way^2 for symmetric sequences (here within 2e-3 with
-- the 1 kHz linewidths)
T.near(r.round_trip_efficiency, r.efficiency ^ 2, 2e-3, "round trip ~ one-way^2")
T.check(#r.trace.time == 11 and r.trace.initial[1] == 1, "trace starts in |1>")
T.check(r.trace.target[11] == r.efficiency, "trace ends at the result")
T.check(r.trace.lost[11] == r.lost and #r.trace.coherence_23_im == 11, "trace columns")
T.near(r.lost, r.estimates.decay_loss, 0.05, "loss vs adiabatic elimination (docs/models/raman.md)")
T.check(r.adiabaticity > 10, "Omega T > 10 (Bergmann et al. 1998 [M])")
T.check(cp.raman.transfer(ref).round_trip_efficiency == nil, "no round trip unless asked")
T.check(r.integrator == "dopri5" and cp.raman.transfer(with { detuning = 2 * pi * 200 * MHz }).integrator == "gauss-legendre",
  "explicit near resonance, collocation far off it")

-- RAMAN-L1b: the Dykhne-Davis-Pechukas estimate (Davis & Pechukas, J. Chem. Phys. 64, 3129
-- (1976) [M]; docs/models/raman.md): lossless, resonant, delay = 2 widths, Omega0 T = 50,
-- where the propagation gives 1 - P3 within 10% of 4p(1 - p), p = exp(-exponent).
local na = cp.raman.transfer { rabi_pump = 50 / us, rabi_stokes = 50 / us, width = us,
  delay = 2 * us, gamma = 0 }
local pna = math.exp(-na.estimates.nonadiabatic_exponent)
T.near(na.estimates.nonadiabatic_loss, 4 * pna * (1 - pna), 1e-15, "loss from the exponent")
T.near(math.log(1 - na.efficiency), math.log(na.estimates.nonadiabatic_loss), 0.1,
  "non-adiabatic loss vs DDP")
T.check(cp.raman.transfer(with { shape = "sin2" }).estimates.nonadiabatic_loss == nil and
  cp.raman.transfer(with { detuning = 1e6 }).estimates.nonadiabatic_exponent == nil,
  "DDP estimate only for resonant Gaussian pulses")

-- RAMAN-L2: two-level limit, P2 = sin^2(A/2) with A = sqrt(pi) rabi width (area theorem [M]).
local A = 2.3
local two = cp.raman.transfer { rabi_pump = A / (math.sqrt(pi) * us), rabi_stokes = 0,
  width = us, delay = 0, gamma = 0 }
T.near(two.populations.excited, math.sin(A / 2) ^ 2, 1e-8, "area theorem, Gaussian")
two = cp.raman.transfer { rabi_pump = A / us, rabi_stokes = 0, width = us, delay = 0, gamma = 0,
  shape = "sin2" }
T.near(two.populations.excited, math.sin(A / 2) ^ 2, 1e-8, "area theorem, sin2")

-- RAMAN-L3: a sampled sin2 pair equals the analytic sin2 shape (interpolation error only).
local times, pump, stokes = {}, {}, {}
local a = cp.raman.transfer(with { shape = "sin2" })
for i = 0, 800 do
  local t = a.t_start + (a.t_end - a.t_start) * i / 800
  local function s2(tc)
    local x = (t - tc) / ref.width
    return math.abs(x) < 1 and ref.rabi_pump * math.cos(pi * x / 2) ^ 2 or 0
  end
  times[#times + 1], pump[#pump + 1], stokes[#stokes + 1] = t, s2(ref.delay / 2), s2(-ref.delay / 2)
end
local s = cp.raman.transfer { shape = "sampled", times = times, pump = pump, stokes = stokes,
  gamma = ref.gamma, pump_linewidth_hz = 1e3, stokes_linewidth_hz = 1e3 }
T.near(s.efficiency, a.efficiency, 1e-5, "sampled sin2 = analytic sin2")

-- RAMAN-L4: line shape over delta, symmetric about two-photon resonance (H is symmetric
-- under delta -> -delta together with Delta -> -Delta; Delta = 0 here).
local ls = cp.raman.lineshape(with { from = -2 * pi * 0.3 * MHz, to = 2 * pi * 0.3 * MHz,
  points = 7, threads = 2 })
T.check(#ls.efficiency == 7 and ls.scan == "two_photon_detuning", "seven points")
T.near(ls.efficiency[1], ls.efficiency[7], 1e-7, "symmetric line shape")
-- the same propagation as a transfer without trace (a trace moves the step boundaries, which
-- changes the result within the accuracy asked for, 1e-8)
T.near(ls.efficiency[4], cp.raman.transfer(ref).efficiency, 1e-15, "centre = resonant transfer")
T.near(ls.efficiency[4], r.efficiency, 1e-8, "centre = resonant transfer with a trace")
T.check(ls.efficiency[4] > ls.efficiency[3], "peak at resonance")

-- RAMAN-L4: accuracy and estimates are options: a looser accuracy takes fewer steps and
-- stays within it of the default (1e-8) result; estimates = false leaves them out.
local loose = cp.raman.transfer(with { accuracy = 1e-5, estimates = false })
T.check(loose.steps < r.steps and loose.estimates == nil and loose.adiabaticity == nil,
  "looser accuracy, fewer steps, no estimates")
T.near(loose.efficiency, r.efficiency, 1e-5 + 1e-8, "within the accuracy asked for")

-- RAMAN-L5: bad input is a clear error.
T.raises(function() cp.raman.transfer(with { accuracy = 0.5 }) end, { "accuracy", "out of range" }, "accuracy")
T.raises(function() cp.raman.transfer(with { width = 0 / 0 }) end, { "width", "finite" }, "NaN width")
T.raises(function() cp.raman.transfer(with { width = -1e-6 }) end, { "width", "out of range" }, "negative width")
T.raises(function() cp.raman.transfer(with { gamma = math.huge }) end, { "gamma" }, "infinite gamma")
T.raises(function() cp.raman.transfer(with { pump_linewidth_hz = -5 }) end, { "pump_linewidth_hz" }, "negative linewidth")
T.raises(function() cp.raman.transfer(with { widht = 1 }) end, { "did you mean 'width'" }, "typo")
T.raises(function() cp.raman.transfer(with { shape = "square" }) end, { "shape", "gaussian" }, "unknown shape")
T.raises(function() cp.raman.transfer { shape = "sampled", times = { 0, 2e-6, 1e-6 },
  pump = { 1, 1, 1 }, stokes = { 1, 1, 1 }, gamma = 0 } end, { "increase strictly" }, "unsorted times")
T.raises(function() cp.raman.transfer { shape = "sampled", times = { 0, 1e-6 },
  pump = { 1, 1 }, stokes = { 1, 1 }, gamma = 0 } end, { "times", "at least 3" }, "too few samples")
T.raises(function() cp.raman.transfer(with { relative_linewidth_hz = 10 }) end,
  { "stokes_linewidth_hz", "relative_linewidth_hz" }, "ambiguous linewidths")
T.raises(function() cp.raman.transfer(with { trace = 1 }) end, { "trace" }, "one trace sample")
T.raises(function() cp.raman.transfer("x") end, { "one table" }, "wrong type")
T.raises(function() cp.raman.lineshape(with { threads = 0, from = 0, to = 1 }) end, { "threads" }, "threads")
T.raises(function() cp.raman.lineshape(with { two_photon_detuning = 1, from = 0, to = 1 }) end,
  { "scanned variable" }, "scanned key given")

-- RAMAN-L-FLAG: the validity flag of the closed-form estimates reaches Lua: clear on
-- resonance, "estimates_detuned" at delta = 2 pi 200 kHz (|delta| T_overlap = 3.1, beyond
-- the stated 0.5), where the propagation (the independent method) loses nearly twice what the
-- estimate says; the slow losses act over |delay| + 2 width.
local on = cp.raman.transfer(with {})
T.check(#on.flags == 0, "resonant: no flag")
local off = cp.raman.transfer(with { two_photon_detuning = 2 * math.pi * 200e3 })
T.check(off.flags[1] == "estimates_detuned" and #off.flags == 1, "two-photon detuned: flagged")
T.check(off.lost > 1.5 * off.estimates.decay_loss, "and the estimate is indeed far off")
T.near(on.transfer_duration, 2.4e-6 + 2 * 2e-6, 1e-12, "transfer duration |delay| + 2 width")

-- HELP-L: help texts.
T.check(type(cp.get_help(cp.raman.transfer)) == "string", "help for raman.transfer")
T.check(type(cp.get_help(cp.raman.lineshape)) == "string", "help for raman.lineshape")
-- RAMAN-L9: populations are never negative nor above one, in the final state and along the
-- trace (the integration left them up to ~2e-9 outside [0, 1] in these cases: a lossless
-- and a lossy Lambda system, on resonance and far detuned).
local worst = 0
for _, g in ipairs { 0, 1e3, 2 * math.pi * 6e6 } do
  for _, d in ipairs { 0, 2 * math.pi * 1e6, 2 * math.pi * 100e6 } do
    local rr = cp.raman.transfer { rabi_pump = 2 * math.pi * 5e6, rabi_stokes = 2 * math.pi * 5e6,
      width = 2e-6, delay = 2.4e-6, gamma = g, detuning = d, trace = 200 }
    for _, k in ipairs { "initial", "excited", "target", "lost" } do
      for _, v in ipairs(rr.trace[k]) do worst = math.min(worst, v, 1 - v) end
    end
    for _, v in ipairs { rr.efficiency, rr.lost } do worst = math.min(worst, v, 1 - v) end
  end
end
T.check(worst == 0, "populations stay in [0, 1] (worst excursion " .. worst .. ")")

T.done()
