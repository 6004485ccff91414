-- coldprep.species: species lookup over the built-in C tables plus the atoms, molecules
-- and resonances a user adds in this Lua state (cp.species.add_atom{...} and friends).
-- User entries shadow built-in ones of the same name.
local cp = require "coldprep"
local builtin = cp.species -- the C binding (lua/bind/bind_species.c)
local A = require "coldprep.argcheck"

local M = {}
-- the registry tables the bindings read too (a binding given a species name finds the
-- user's entries there without calling back into this library)
local user_atoms, user_molecules, user_resonances = builtin.builtin_user_tables()

-- the key user entries are filed under, the same the bindings read them by
local key = builtin.builtin_user_key

local function copy(t)
  local c = {}
  for k, v in pairs(t) do c[k] = type(v) == "table" and copy(v) or v end
  return c
end

local function user_names()
  local names = {}
  for _, a in pairs(user_atoms) do names[a.name] = true end
  for _, m in pairs(user_molecules) do names[m.name] = true end
  local list = {}
  for n in pairs(names) do list[#list + 1] = n end
  table.sort(list)
  return list
end

-- Errors: the functions below raise their messages without a position (level 0), and
-- every public function is wrapped by at_caller, which re-raises at level 2: the position
-- is then the user's line that called cp.species.*, also when one function of this file
-- calls another (species.resonance looks up the molecule through species.molecule).
local function at_caller(fn)
  return function(...)
    local out = table.pack(pcall(fn, ...))
    if not out[1] then error(out[2], 2) end
    return table.unpack(out, 2, out.n)
  end
end

local impl = {} -- the public functions, unwrapped (they call each other through it)

local function not_found(kind, name, err)
  local extra = user_names()
  if #extra > 0 then
    err = err .. "; user-added: " .. table.concat(extra, ", ")
  end
  error(err, 0)
end

local function check_name(fname, name)
  if type(name) ~= "string" then
    error(string.format("%s: expects a species name (string), got %s", fname, type(name)), 0)
  end
end

function impl.atom(name)
  check_name("species.atom", name)
  local a = user_atoms[key(name)]
  if a then return copy(a) end
  local ok, r = pcall(builtin.builtin_atom, name)
  if ok then return r end
  not_found("atom", name, r)
end

function impl.molecule(name)
  check_name("species.molecule", name)
  local m = user_molecules[key(name)]
  if m then return copy(m) end
  local ok, r = pcall(builtin.builtin_molecule, name)
  if ok then return r end
  not_found("molecule", name, r)
end

-- Resonances of a molecule: the built-in ones first, then the user's, 1-based.
function impl.resonance(name, index)
  check_name("species.resonance", name)
  index = index or 1
  if math.type(index) ~= "integer" or index < 1 then
    error(string.format("species.resonance: index %s must be an integer >= 1", tostring(index)), 0)
  end
  local m = impl.molecule(name)
  local list = {}
  local ok, n = true, 1
  while ok do
    local r
    ok, r = pcall(builtin.builtin_resonance, m.name, n)
    if ok then list[#list + 1] = r; n = n + 1 end
  end
  for _, r in ipairs(user_resonances[m.name] or {}) do list[#list + 1] = copy(r) end
  if #list == 0 then
    error(string.format("species.resonance: no Feshbach resonance is known for %s; add one "
      .. "with cp.species.add_resonance{molecule = %q, b0 = ..., width = ..., abg = ..., dmu = ...}",
      m.name, m.name), 0)
  end
  if index > #list then
    error(string.format("species.resonance: index %d for %s is out of range; allowed 1 to %d",
      index, m.name, #list), 0)
  end
  return list[index]
end

-- The polarizability (a.u.) of a named species at a trap wavelength (m): a user-added
-- species' own value, else the built-in one (the binding's lookup, the one the lattice
-- functions use); the error asks for polarizability_au where there is none.
function impl.polarizability(name, wavelength)
  check_name("species.polarizability", name)
  if math.type(wavelength) == nil then
    error(string.format("species.polarizability: wavelength must be a number (m), got %s",
      type(wavelength)), 0)
  end
  local ok, r = pcall(builtin.builtin_polarizability, name, wavelength)
  if ok then return r end
  error(r, 0)
end

local function citation(ref)
  if not ref then return "no publication identified" end
  local ids = {}
  if ref.doi then ids[#ids + 1] = "doi:" .. ref.doi end
  if ref.arxiv then ids[#ids + 1] = "arXiv:" .. ref.arxiv end
  return string.format("%s, %s %s, %s (%d)%s", ref.authors, ref.journal, ref.volume, ref.page,
    ref.year, #ids > 0 and ", " .. table.concat(ids, ", ") or "")
end

-- A value in the unit a lab uses (G, a0, muB, MHz) for printing.
local function shown(d)
  if d.field == "reactive" then return d.value ~= 0 and "yes" or "no" end
  local scale = { T = { cp.units.G, "G" }, m = { cp.units.a0, "a0" }, ["J/T"] = { cp.consts.muB, "muB" },
    Hz = { cp.units.MHz, "MHz" }, ["1"] = { 1, "" } }
  local sc = scale[d.unit] or { 1, d.unit }
  local unc = d.uncertainty and string.format(" +- %.3g", d.uncertainty / sc[1]) or ""
  return string.format("%.6g%s%s", d.value / sc[1], sc[2] ~= "" and " " .. sc[2] or "", unc)
end

-- Every built-in value with its publication, status and whether it was checked against
-- the paper; `name` (optional) keeps one species (its resonances included).  Prints one
-- block per value unless quiet is true; returns the entries.
function impl.sources(name, quiet)
  local list = builtin.builtin_sources()
  if name ~= nil then
    check_name("species.sources", name)
    local ok, rec = pcall(builtin.builtin_atom, name)
    if not ok then ok, rec = pcall(builtin.builtin_molecule, name) end
    if not ok then error(rec, 0) end
    local keep = {}
    for _, d in ipairs(list) do
      if d.record == rec.name or d.record:match("^(.-)#") == rec.name then keep[#keep + 1] = d end
    end
    list = keep
  end
  if not quiet then
    for _, d in ipairs(list) do
      print(string.format("%s %s = %s  [%s, %s]", d.record, d.field, shown(d), d.status,
        d.verified and "checked against the paper" or "NOT checked"))
      print("    " .. citation(d.reference))
      if d.note then print("    " .. d.note) end
    end
  end
  return list
end

function impl.list()
  local names = builtin.builtin_list()
  for _, n in ipairs(user_names()) do names[#names + 1] = n end
  return names
end

-- The add_* functions check their arguments with the shared Lua-side readers.
local function number(fname, args, k, unit, positive, optional)
  return A.number(fname, args, k, unit, { positive = positive, optional = optional })
end

function impl.add_atom(args)
  local fname = "species.add_atom"
  A.table(fname, args, { "name", "mass_u", "statistics", "nuclear_spin", "pol_1064_au",
    "pol_1550_au", "source", "a_bb", "a_bb_source" })
  check_name(fname, args.name)
  local mass_u = number(fname, args, "mass_u", "u", true)
  A.option(fname, args, "statistics", { "boson", "fermion" })
  local a = {
    kind = "atom", name = args.name, mass_u = mass_u, mass = mass_u * cp.consts.amu,
    statistics = args.statistics, nuclear_spin = args.nuclear_spin,
    pol_1064_au = number(fname, args, "pol_1064_au", "a.u.", true, true),
    pol_1550_au = number(fname, args, "pol_1550_au", "a.u.", true, true),
    source = args.source or "user-supplied",
    a_bb = A.number(fname, args, "a_bb", "m", { optional = true, min = -1e-6, max = 1e-6 }),
    a_bb_source = args.a_bb_source,
  }
  if a.a_bb and not a.a_bb_source then a.a_bb_source = "user-supplied" end
  user_atoms[key(args.name)] = a
  local num, sym = args.name:match("^(%d+)(%a+)$")
  if num then user_atoms[key(sym .. num)] = a end
  return copy(a)
end

function impl.add_molecule(args)
  local fname = "species.add_molecule"
  A.table(fname, args, { "name", "atoms", "dipole_debye", "rot_const_hz", "c6_au",
    "reactive", "pol_1064_au", "pol_1064_par_au", "pol_1064_perp_au", "pol_1550_au",
    "loss_rate", "loss_temperature", "source" })
  check_name(fname, args.name)
  if type(args.atoms) ~= "table" or #args.atoms ~= 2 then
    error(fname .. ": argument 'atoms' must be a list of two atom names", 0)
  end
  for i = 1, 2 do
    if type(args.atoms[i]) ~= "string" then
      A.fail(fname, "argument 'atoms[%d]' must be an atom name (string), got %s", i, type(args.atoms[i]))
    end
  end
  local a, b = impl.atom(args.atoms[1]), impl.atom(args.atoms[2])
  local m = {
    kind = "molecule", name = args.name, atoms = { a.name, b.name },
    mass = a.mass + b.mass, mass_u = (a.mass + b.mass) / cp.consts.amu,
    reduced_mass = a.mass * b.mass / (a.mass + b.mass),
    statistics = (a.statistics == b.statistics) and "boson" or "fermion",
    dipole_debye = number(fname, args, "dipole_debye", "D", false),
    rot_const_hz = number(fname, args, "rot_const_hz", "Hz", true),
    c6_au = number(fname, args, "c6_au", "a.u.", true),
    reactive = args.reactive and true or false,
    pol_1064_par_au = number(fname, args, "pol_1064_par_au", "a.u.", true, true),
    pol_1064_perp_au = number(fname, args, "pol_1064_perp_au", "a.u.", true, true),
    pol_1550_au = number(fname, args, "pol_1550_au", "a.u.", true, true),
    loss_rate = number(fname, args, "loss_rate", "m^3/s", true, true),
    loss_temperature = number(fname, args, "loss_temperature", "K", true, true),
    source = args.source or "user-supplied",
  }
  -- the isotropic part: given, or (alpha_par + 2 alpha_perp) / 3 from the two components
  m.pol_1064_au = number(fname, args, "pol_1064_au", "a.u.", true, true)
  if (m.pol_1064_par_au == nil) ~= (m.pol_1064_perp_au == nil) then
    error(fname .. ": give both 'pol_1064_par_au' and 'pol_1064_perp_au', or neither", 0)
  end
  if m.pol_1064_par_au and not m.pol_1064_au then
    m.pol_1064_au = (m.pol_1064_par_au + 2 * m.pol_1064_perp_au) / 3
  end
  if (m.loss_rate == nil) ~= (m.loss_temperature == nil) then
    error(fname .. ": give 'loss_rate' with the 'loss_temperature' it was measured at", 0)
  end
  user_molecules[key(args.name)] = m
  return copy(m)
end

function impl.add_resonance(args)
  local fname = "species.add_resonance"
  A.table(fname, args, { "molecule", "b0", "width", "abg", "dmu", "c6_au", "states",
    "source" })
  if type(args.molecule) ~= "string" then
    A.fail(fname, "argument 'molecule' must be a molecule name (string), got %s", type(args.molecule))
  end
  local m = impl.molecule(args.molecule)
  local r = {
    molecule = m.name, states = args.states or "user-supplied",
    b0 = number(fname, args, "b0", "T", true),
    width = number(fname, args, "width", "T", false),
    abg = number(fname, args, "abg", "m", false),
    dmu = number(fname, args, "dmu", "J/T", true),
    c6_au = A.number(fname, args, "c6_au", "a.u.", { optional = true, positive = true }),
    verified = true, source = args.source or "user-supplied",
  }
  if r.width == 0 or r.abg == 0 then
    error(fname .. ": arguments 'width' and 'abg' must be non-zero", 0)
  end
  user_resonances[m.name] = user_resonances[m.name] or {}
  table.insert(user_resonances[m.name], r)
  return copy(r)
end

local H = {
  atom = [[
species.atom(name) -> {kind, name, symbol, protons, mass_number, mass (kg), mass_u (u),
  nuclear_spin, statistics = "boson"|"fermion", pol_1064_au, pol_1550_au, source, a_bb (m),
  a_bb_source}
(a polarizability is nil where none is built in)
Names as "87Rb" or "Rb87" (case-insensitive).  An unknown name is an error listing the
closest known names.  a_bb: the atoms' own s-wave scattering length (sets the size of a
condensate), for the hyperfine state named in a_bb_source with its paper.
Example: cp.species.atom("40K").statistics  --> "fermion"
Example: cp.species.atom("87Rb").a_bb / cp.units.a0  --> 100.4]],
  molecule = [[
species.molecule(name) -> {kind, name, atoms = {a, b}, mass (kg), mass_u,
  reduced_mass (kg, of the two atoms), statistics,
  dipole_debye (D), rot_const_hz (Hz), c6_au (a.u.), reactive, pol_1064_au,
  pol_1064_par_au, pol_1064_perp_au, pol_1550_au (a.u.), loss_rate (m^3/s, no shielding)
  and loss_temperature (K), source}   (nil where the table has no value)
Names as "40K87Rb", "K40Rb87" or "KRb".  Example: cp.species.molecule("NaK").dipole_debye]],
  resonance = [[
species.resonance(molecule [, index = 1]) -> {molecule, states, b0 (T), width (T),
  abg (m), dmu (J/T), c6_au (atom-atom C6, a.u.), verified, source}
The index-th interspecies Feshbach resonance known for the pair (built-in first, then
user-added).  Built-in values are not yet checked against their papers (verified =
false): see cp.species.sources(molecule) and calibrate them.
Example: r = cp.species.resonance("KRb"); print(r.b0 / cp.units.G)]],
  list = "species.list() -> names of every known atom and molecule (built-in and user-added).",
  polarizability = [[
species.polarizability(name, wavelength (m)) -> ground-state dynamic polarizability, a.u.
Built in at 1064 nm (and 1550 nm where published) for a named atom or molecule (the
isotropic part); elsewhere an error asks for polarizability_au.
Example: cp.species.polarizability("87Rb", 1064 * cp.units.nm)]],
  sources = [[
species.sources([name] [, quiet]) -> list of {record, field, value, unit, uncertainty,
  status = "measured"|"calculated"|"estimated", verified, reference = {key, authors,
  journal, volume, page, year, doi, arxiv}, note}
Every built-in number with its publication; prints them unless quiet.  "NOT checked"
marks values to calibrate.  Example: cp.species.sources("KRb")]],
  add_atom = [[
species.add_atom{name, mass_u (u), statistics = "boson"|"fermion" [, nuclear_spin,
  pol_1064_au, pol_1550_au (a.u.), source, a_bb (m, |a_bb| <= 1e-6), a_bb_source]}
Adds an atom to this session (a_bb: its own s-wave scattering length, needed for a condensed
cloud of it in a plan).  Example: cp.species.add_atom{name = "162Dy", mass_u = 161.9268,
statistics = "boson"}]],
  add_molecule = [[
species.add_molecule{name, atoms = {a, b}, dipole_debye (D), rot_const_hz (Hz), c6_au (a.u.)
  [, reactive = false, pol_1064_au | pol_1064_par_au + pol_1064_perp_au, pol_1550_au (a.u.),
  loss_rate (m^3/s) + loss_temperature (K), source]}
Adds a molecule; its mass and statistics follow from its atoms; a lattice for it given as
power and waist then uses its polarizability (cp.species.polarizability).]],
  add_resonance = [[
species.add_resonance{molecule, b0 (T), width (T), abg (m), dmu (J/T)
  [, c6_au (atom-atom C6, a.u.), states, source]}
Adds a Feshbach resonance.  Example: cp.species.add_resonance{molecule = "KRb",
b0 = 546.62*cp.units.G, width = -3.1*cp.units.G, abg = -189*cp.units.a0, dmu = 2.3*cp.consts.muB}]],
}
for name in pairs(H) do M[name] = at_caller(impl[name]) end
for name, text in pairs(H) do cp.set_help(M[name], text) end

-- keep the raw built-in lookups reachable for tests and tools
for k, v in pairs(builtin) do M[k] = v end

return M
