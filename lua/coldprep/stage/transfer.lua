-- coldprep.stage.transfer: the transfer stage (constructor cp.stages.transfer).
local cp = require "coldprep"
local A = require "coldprep.argcheck"
local S = require "coldprep.sample"
local MODEL = require "coldprep.stage.models"
local common = require "coldprep.stage.common"
local new_stage = common.new_stage

local PULSE_KEYS = { "rabi_pump", "rabi_stokes", "width", "delay", "gamma", "detuning",
  "two_photon_detuning", "pump_linewidth_hz", "stokes_linewidth_hz", "relative_linewidth_hz",
  "shape" }

-- The Raman results already computed in this Lua state, by their pulse parameters (each
-- number written exactly, as a hexadecimal float): a sweep builds a plan per point, and
-- the pulse is usually the same at every point.  A result is only read (the stage's notes,
-- efficiency and duration), never handed out, so sharing it changes nothing; kept while
-- the memo is enabled (cp.feshbach.memo), at most MEMO_MAX.
local memo, memo_size, MEMO_MAX = {}, 0, 64

local function memo_key(pulse)
  local parts = {}
  for i, k in ipairs(PULSE_KEYS) do
    local v = pulse[k]
    parts[i] = type(v) .. ":" .. (math.type(v) == "float" and string.format("%a", v) or tostring(v))
  end
  return table.concat(parts, ",")
end

local function raman_result(pulse)
  if not cp.feshbach.memo().enabled then
    memo, memo_size = {}, 0
    return cp.raman.transfer(pulse)
  end
  local key = memo_key(pulse)
  local r = memo[key]
  if not r then
    r = cp.raman.transfer(pulse)
    if memo_size >= MEMO_MAX then memo, memo_size = {}, 0 end
    memo[key], memo_size = r, memo_size + 1
  end
  return r
end

-- cp.stages.transfer{rabi_pump, rabi_stokes, width, delay, gamma, ... (as cp.raman.transfer)
--   | efficiency | round_trip_efficiency [, pump_power, stokes_power, label]}
local function transfer(args)
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
    -- both directions equally efficient: one way = sqrt(round trip) (docs/models/raman.md)
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
    local ok, r = pcall(raman_result, pulse)
    if not ok then A.fail(fname, "%s", (tostring(r):gsub("^[^:\n]*coldprep/[%w_/]+%.lua:%d+: ", ""))) end
    result = r
  end
  local st = new_stage("transfer", args, {
    accepts = { ["feshbach-molecules"] = true }, produces = "ground-state-molecules",
    equipment = equipment, params = { efficiency = eff, pulse = pulse },
    hint = "the two-photon transfer starts from Feshbach molecules: place it after cp.stages.associate",
  })
  st.run = function(_, s)
    local notes, flags = {}, {}
    local e = eff or result.efficiency
    if result then
      notes[#notes + 1] = string.format("one-way efficiency %.4g from the Lambda-system model "
        .. "(round trip %.3g if both ways are alike, what imaging after a return pulse sees); "
        .. "%.3g lost through the excited state, %.3g left in the Feshbach state", e, e * e,
        result.lost, result.populations.initial)
      for _, f in ipairs(result.flags) do
        common.flag(flags, notes, "raman", f, string.format("the closed-form decay (%.3g) and "
          .. "dephasing (%.3g) loss estimates assume resonant pulses; the propagated numbers above "
          .. "do not", result.estimates.decay_loss, result.estimates.dephasing_loss))
      end
    else
      notes[#notes + 1] = string.format("one-way efficiency %.4g as given", e)
    end
    -- the molecules that fail to transfer are lost at random (the energy per molecule is kept)
    local out = S.after_uniform_loss(S.with(s, { kind = "ground-state-molecules" }), s.number * e)
    return out, { duration = result and MODEL.pulse_duration(result) or 0, notes = notes, flags = flags }
  end
  return st
end

return { constructor = transfer, help = [[
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
Example: cp.stages.transfer{round_trip_efficiency = 0.8}]] }
