-- Plans whose hold and evaporation take their collision rates from the protection of the
-- molecules (cp.collisions.shielded): the verdict where labs work.
--  PROT-1 40K87Rb evaporated at 12 kV/cm in free space, no loss_rate given: not degenerate,
--         and the budget says the molecules are unprotected (Ni et al., Nature 464, 1324
--         (2010): loss of KRb grows steeply with the induced dipole; such a plan fails);
--  PROT-2 the same molecules in pancakes (de Miranda et al., Nature Phys. 7, 502 (2011):
--         loss suppressed in a 1D lattice) lose less in a hold than in free space;
--  PROT-3 a hold under microwave shielding loses what cp.collisions.hold gives for the
--         predicted rate (a worked check computed here, not by calling the stage again);
--  PROT-4 a given loss_rate overrides the prediction, with a note;
--  PROT-5 bad protections fail when the plan is written;
--  PROT-6 molecules prepared in |1,0> just above the dc-shielding field (rotational_j = 1)
--         keep far more in a hold than |0,0> molecules in the same field (Li et al.,
--         Nature Phys. 17, 1144 (2021): dc-field shielding suppresses the loss of KRb).
local T = require "testlib"
local u = cp.units
local function Hz(f) return 2 * math.pi * f end

local function krb(stages)
  local all = {
    cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms },
    cp.stages.remove_atoms { heating_per_atom = 1 * u.nK * cp.consts.kB, duration = 0.5 * u.ms },
    cp.stages.transfer { rabi_pump = Hz(3e6), rabi_stokes = Hz(5e6), width = 8e-6, delay = 7e-6,
      gamma = Hz(6e6) },
  }
  for _, s in ipairs(stages) do all[#all + 1] = s end
  return cp.plan { name = "KRb", start = { molecule = "40K87Rb", temperature = 300 * u.nK,
    atoms = { { atom = "40K", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
              { atom = "87Rb", number = 3e5, trap_frequencies = { Hz(60), Hz(70), Hz(150) } } } },
    stages = all }:run { limiting = false }
end

local function notes(b, i) return table.concat(b.stages[i].notes, " ") end

-- PROT-1
local b = krb { cp.stages.evaporate { eta = 8, keep = 0.3, electric_field = 12e5 } }
T.check(not b.degenerate, "KRb at 12 kV/cm in 3D without protection is not degenerate")
T.check(notes(b, 4):find("no protection from loss", 1, true) ~= nil, "the budget says so")
T.check(notes(b, 4):find("dc field in free space", 1, true) ~= nil, "the regime is named")
T.check(notes(b, 4):find("shielding field", 1, true) ~= nil, "near the shielding field: flagged")

-- PROT-2
local free = krb { cp.stages.hold { duration = 50 * u.ms, electric_field = 4e5 } }
local pan = krb { cp.stages.hold { duration = 50 * u.ms, electric_field = 4e5,
  confinement = { axial_omega = Hz(23e3) } } }
T.check(pan.stages[4].number > free.stages[4].number, "pancakes keep more molecules")
T.check(notes(pan, 4):find("quasi-2D", 1, true) ~= nil, "quasi-2D regime named")

-- PROT-3: the hold starts from the sample in the new trap (stage 4) and loses as
-- cp.collisions.hold says for the rate cp.collisions.shielded predicts at its temperature
local mw = { rabi = Hz(40e6), detuning = Hz(8e6) }
local function nak(stage)
  return cp.plan { start = { molecule = "23Na40K", temperature = 180 * u.nK,
      atoms = { { atom = "23Na", number = 4e5, trap_frequencies = { Hz(90), Hz(110), Hz(220) } },
                { atom = "40K", number = 1.5e5, trap_frequencies = { Hz(110), Hz(135), Hz(270) } } } },
    stages = {
      cp.stages.associate { ramp_rate = 0.5 * u.G / u.ms },
      cp.stages.remove_atoms { heating_per_atom = 2 * u.nK * cp.consts.kB, duration = 0.5 * u.ms },
      cp.stages.transfer { rabi_pump = Hz(3e6), rabi_stokes = Hz(5e6), width = 8e-6, delay = 7e-6,
        gamma = Hz(6e6) },
      cp.stages.change_trap { trap_frequencies = { Hz(60), Hz(70), Hz(200) }, ramp_time = 50 * u.ms },
      stage } }:run { limiting = false }
end
local h = nak(cp.stages.hold { duration = 0.1, microwave = mw })
local s3 = h.stages[4]
local beta = cp.collisions.shielded { molecule = "23Na40K", temperature = s3.temperature,
  microwave = mw }.loss_rate_coefficient
local want = cp.collisions.hold { number = s3.number, temperature = s3.temperature,
  mass = cp.species.molecule("23Na40K").mass, omega_x = Hz(60), omega_y = Hz(70),
  omega_z = Hz(200), rate = beta, wave = "p", duration = 0.1, points = 2 }
T.near(h.stages[5].number, want.number, 1e-9, "PROT-3 hold under microwave shielding")
T.check(notes(h, 5):find("microwave shielding", 1, true) ~= nil, "microwave regime named")

-- PROT-4
local o = nak(cp.stages.hold { duration = 0.1, microwave = mw, loss_rate = 1e-12 * u.cm3 })
T.check(notes(o, 5):find("overrides", 1, true) ~= nil, "a given loss_rate overrides, with a note")
local e = nak(cp.stages.evaporate { eta = 8, keep = 0.5, microwave = mw, loss_rate = 1e-12 * u.cm3 })
T.check(notes(e, 5):find("overrides", 1, true) ~= nil, "evaporate: loss_rate overrides, with a note")

-- PROT-5
T.raises(function() cp.stages.evaporate { eta = 8, keep = 0.5, microwave = mw, electric_field = 1e4 } end,
  { "stages.evaporate", "microwave" }, "microwave with a dc field")
T.raises(function() cp.stages.hold { duration = 1, microwave = { rabi = Hz(40e6), detuning = -1 } } end,
  { "stages.hold", "detuning", "red" }, "red detuning")
T.raises(function() cp.stages.hold { duration = 1, confinement = 5 } end,
  { "stages.hold", "confinement" }, "confinement not a table")
T.raises(function() cp.stages.hold { duration = 1, confinement = { axial_omega = 1 } } end,
  { "stages.hold", "axial_omega" }, "axial frequency too low")
T.raises(function() cp.stages.evaporate { eta = 8, keep = 0.5, microwave = { rabi = Hz(40e6) } } end,
  { "microwave", "detuning" }, "microwave without detuning")

-- PROT-6
local ground = krb { cp.stages.hold { duration = 50 * u.ms, electric_field = 12.72e5 } }
local shielded = krb { cp.stages.hold { duration = 50 * u.ms, electric_field = 12.72e5,
  rotational_j = 1 } }
T.check(shielded.stages[4].efficiency > 0.9 and ground.stages[4].efficiency < 0.5,
  string.format("|1,0> shielded keeps %.3g, |0,0> keeps %.3g", shielded.stages[4].efficiency,
    ground.stages[4].efficiency))
T.check(notes(shielded, 4):find("dc-field shielding of |1,0>", 1, true) ~= nil, "dc-shield regime named")
T.raises(function() cp.stages.hold { duration = 0.1, rotational_j = 1 } end,
  { "stages.hold", "rotational_j", "electric_field" }, "|1,0> without a field")
T.raises(function() cp.stages.hold { duration = 0.1, electric_field = 1e5, rotational_j = 2 } end,
  { "stages.hold", "rotational_j 2" }, "only J = 0 or 1")
T.done()
