-- Example: how much dipole a dc field induces, for the weakly polar 40K87Rb and the
-- strongly polar 23Na40K.  Prints the exact induced dipole -dE/dF of the rotational ground
-- state beside the weak-field formula d^2 F/(3B) (capped at d), and each molecule's
-- dc-shielding field; with an output file name it also draws KRb's Stark map (the M = 0
-- levels J = 0..3) above the induced dipoles.
-- Run: coldprep scripts/examples/stark_map.lua [stark_map.png]
local cp = require "coldprep"
local u = cp.units
local out = arg and arg[1]

local fields = {}
for i = 1, 121 do fields[i] = (i - 1) * 0.25 * u.kV_per_cm end -- 0 .. 30 kV/cm

local result = {}
for _, name in ipairs { "KRb", "NaK" } do
  local mol = cp.species.molecule(name)
  local map = cp.fields.stark { molecule = mol, field = fields, levels = 4 }
  local dipole = {}
  for i = 1, #fields do dipole[i] = map.induced_dipole_debye[i][1] end
  local shield = cp.fields.shielding_field { molecule = mol }
  result[name] = { map = map, dipole = dipole, shielding_field = shield.field }
  print(string.format("%s: d = %.3g D, B/h = %.4g GHz, shielding field %.2f kV/cm", mol.name,
    mol.dipole_debye, mol.rot_const_hz / u.GHz, shield.field / u.kV_per_cm))
  print(string.format("  %10s %8s %14s %14s", "F (kV/cm)", "dF/B", "exact (D)", "d^2F/3B (D)"))
  local B = cp.consts.h * mol.rot_const_hz
  for _, i in ipairs { 5, 21, 41, 81, 121 } do
    local d = mol.dipole_debye * u.debye
    local weak = math.min(d * d * fields[i] / (3 * B), d) / u.debye
    print(string.format("  %10.2f %8.3g %14.4g %14.4g", fields[i] / u.kV_per_cm,
      map.reduced_field[i], dipole[i], weak))
  end
end

if out then
  local krb = result.KRb
  local kv, lines = {}, {}
  for i, f in ipairs(fields) do kv[i] = f / u.kV_per_cm end
  for level = 1, 4 do
    local e = {}
    for i = 1, #fields do e[i] = krb.map.energy_hz[i][level] / u.GHz end
    lines[level] = { x = kv, y = e, label = string.format("J = %d, M = 0", level - 1) }
  end
  cp.plot.render { out = out, title = "Stark effect of 40K87Rb and 23Na40K",
    panels = {
      { xlabel = "field (kV/cm)", ylabel = "40K87Rb E/h (GHz)", lines = lines, ymin = -16,
        legend = "bottom left" },
      { xlabel = "field (kV/cm)", ylabel = "induced dipole (D)", legend = "bottom right",
        lines = { { x = kv, y = krb.dipole, label = "40K87Rb" },
                  { x = kv, y = result.NaK.dipole, label = "23Na40K" } } },
    } }
  print("wrote " .. out)
end

return result
