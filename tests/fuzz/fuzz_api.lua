-- A seeded fuzzer of the public Lua API: every function reachable from `cp` (and every
-- callable table) is called with arguments grown from the ones its help example passes,
-- mutated: keys dropped, unknown keys added, values replaced by nil, NaN, +-inf, 0, -0,
-- negative, denormal, huge and tiny numbers, scaled copies of the example's value, wrong
-- types, nested garbage and huge arrays; or the whole argument replaced.  It checks that no
-- call crashes (the driver sees the process die), that every failure is a Lua error in the
-- house form "<context>: <message>" (not a Lua runtime error such as "attempt to index",
-- not a raw "bad argument #1", not an error positioned inside the library's own files) and
-- that every success returns only finite numbers, those named as probabilities, fractions
-- or populations inside [0, 1].  Call i's arguments depend only on the
-- seed and i, so a finding is reproduced by its seed and index.
--
-- coldprep fuzz_api.lua SEED FIRST COUNT PROGRESS_FILE [SECONDS]
--   calls FIRST .. FIRST + COUNT - 1 (or until SECONDS have passed), writing
--   the index and function of the call in progress to PROGRESS_FILE (so a driver that
--   kills a hung run knows which call hung) and one line per finding to stdout:
--   "FINDING <index> <function> <kind>: <detail> | args: <arguments>".  The last line is
--   "DONE <next index> <calls> <findings>".
local seed = math.tointeger(tonumber(arg[1] or "1")) or 1
local first = math.tointeger(tonumber(arg[2] or "1")) or 1
local count = math.tointeger(tonumber(arg[3] or "1000")) or 1000
local progress_path = arg[4]
local seconds = tonumber(arg[5] or "1e9")
local real_print, stdout = print, io.stdout
print = function() end -- examples and help print; the findings are what counts here

-- ---- the public functions ---------------------------------------------------------------
local functions = {} -- {name, fn, parent, key}
do
  local seen = {}
  local function walk(t, path)
    if seen[t] then return end
    seen[t] = true
    local keys = {}
    for k in pairs(t) do if type(k) == "string" then keys[#keys + 1] = k end end
    table.sort(keys)
    local mt = getmetatable(t)
    if type(mt) == "table" and type(mt.__call) == "function" then
      functions[#functions + 1] = { name = path, fn = t, callable = true }
    end
    for _, k in ipairs(keys) do
      local v = t[k]
      if type(v) == "function" then
        functions[#functions + 1] = { name = path .. "." .. k, fn = v, parent = t, key = k }
      elseif type(v) == "table" then
        walk(v, path .. "." .. k)
      end
    end
  end
  walk(cp, "cp")
end

-- ---- seeds: the first argument each function receives while the help examples run -------
local function deep_copy(v, seen)
  if type(v) ~= "table" or getmetatable(v) ~= nil then return v end
  seen = seen or {}
  if seen[v] then return seen[v] end
  local c = {}
  seen[v] = c
  for k, x in pairs(v) do c[deep_copy(k, seen)] = deep_copy(x, seen) end
  return c
end

local seeds = {}
do
  for _, f in ipairs(functions) do
    seeds[f.name] = {}
    if f.parent then
      f.parent[f.key] = function(...)
        local a = ...
        if #seeds[f.name] < 8 then seeds[f.name][#seeds[f.name] + 1] = table.pack(deep_copy(a), select(2, ...)) end
        return f.fn(...)
      end
    end
  end
  local examples = {}
  for _, f in ipairs(functions) do
    local text = cp.get_help(f.fn)
    local ex = type(text) == "string" and text:match("Example:%s*(.*)$")
    if ex then examples[#examples + 1] = ex end
  end
  for _, ex in ipairs(examples) do
    local env = setmetatable({ cp = cp, coldprep = cp, print = function() end }, { __index = _G })
    local chunk = load(ex, "example", "t", env) or load("return " .. ex, "example", "t", env)
    if chunk then pcall(chunk) end
  end
  for _, f in ipairs(functions) do
    if f.parent then f.parent[f.key] = f.fn end
  end
end

-- ---- values -------------------------------------------------------------------------------
local huge_array = {}
for i = 1, 100000 do huge_array[i] = i * 1e-3 end
local function nested(depth)
  if depth == 0 then return 0 / 0 end
  return { a = nested(depth - 1), [1] = nested(depth - 1) }
end
local garbage = {
  function() return nil end, function() return 0 / 0 end, function() return 1 / 0 end,
  function() return -1 / 0 end, function() return 0 end, function() return -0.0 end,
  function() return -1 end, function() return 1 end, function() return 0.5 end,
  function() return 4.9e-324 end, function() return 2.2e-308 end, function() return 1e-300 end,
  function() return 1e300 end, function() return -1e300 end, function() return 1.7976931348623157e308 end,
  function() return math.maxinteger end, function() return math.mininteger end,
  function() return 2 ^ 53 end, function() return 1e6 end, function() return 1e-9 end,
  function() return "" end, function() return "x" end, function() return "1e3" end,
  function() return string.rep("y", 10000) end, function() return "fuzz.png" end,
  function() return "fuzz.csv" end, function() return "\0\255" end,
  function() return true end, function() return false end,
  function() return {} end, function() return { 1, 2, 3 } end, function() return { {} } end,
  function() return { 0 / 0, 1 / 0 } end, function() return { -1, 0, 1 } end,
  function() return huge_array end, function() return nested(6) end,
  function() return function() return 0 / 0 end end, function() return function() error("no") end end,
  function() return function() return {} end end,
  function() return coroutine.create(function() end) end, function() return io.stdout end,
}

-- a scaled or sign-flipped copy of a numeric value (stays "near" the valid domain)
local function scaled(v)
  local r = math.random(6)
  if r == 1 then return -v end
  if r == 2 then return v * 10 ^ math.random(-320, 320) end
  if r == 3 then return v * (1 + 1e-15) end
  if r == 4 then return v + 1 end
  if r == 5 then return math.floor(v) end
  return v * 1e-300
end

-- the keys of t in a fixed order (pairs' order changes from run to run with Lua's hash seed)
local function sorted_keys(t)
  local keys = {}
  for k in pairs(t) do keys[#keys + 1] = k end
  table.sort(keys, function(a, b)
    local ta, tb = type(a), type(b)
    if ta ~= tb then return ta < tb end
    if ta == "number" or ta == "string" then return a < b end
    return false
  end)
  return keys
end

-- every (table, key) slot of an argument tree, not entering objects (tables with metatables)
local function slots(t, out, depth)
  out = out or {}
  depth = depth or 0
  if depth > 4 then return out end
  for _, k in ipairs(sorted_keys(t)) do
    local v = t[k]
    out[#out + 1] = { t, k }
    if type(v) == "table" and getmetatable(v) == nil and v ~= huge_array then
      slots(v, out, depth + 1)
    end
  end
  return out
end

local function mutate(args)
  local a = args[1]
  local r = math.random(20)
  if r == 1 or type(a) ~= "table" then -- replace the whole argument
    args[1] = garbage[math.random(#garbage)]()
    return args
  end
  if r == 2 then -- a second argument
    args[2], args.n = garbage[math.random(#garbage)](), math.max(args.n or 1, 2)
    return args
  end
  for _ = 1, math.random(3) do
    local s = slots(a)
    local m = math.random(10)
    if #s == 0 or m == 1 then
      a[({ "zzz", "Temperature", "n", "", 1 })[math.random(5)]] = garbage[math.random(#garbage)]()
    else
      local slot = s[math.random(#s)]
      local t, k = slot[1], slot[2]
      if m == 2 then
        t[k] = nil
      elseif m <= 5 and type(t[k]) == "number" then
        t[k] = scaled(t[k])
      else
        t[k] = garbage[math.random(#garbage)]()
      end
    end
  end
  return args
end

-- ---- checks -------------------------------------------------------------------------------
local function describe(v, depth)
  depth = depth or 0
  local t = type(v)
  if t == "string" then return #v > 40 and string.format("%q..(%d bytes)", v:sub(1, 20), #v) or string.format("%q", v) end
  if t == "number" then return math.type(v) == "integer" and tostring(v) or string.format("%.17g", v) end
  if t ~= "table" then return tostring(v):gsub(": 0x%x+", "") end
  if v == huge_array then return "{1e-3, 2e-3, ... 100000 values}" end
  if getmetatable(v) then return "<object>" end
  if depth > 3 then return "{...}" end
  local parts, n = {}, 0
  for k, x in pairs(v) do
    n = n + 1
    if n > 12 then parts[#parts + 1] = "..."; break end
    parts[#parts + 1] = tostring(k) .. " = " .. describe(x, depth + 1)
  end
  table.sort(parts)
  return "{" .. table.concat(parts, ", ") .. "}"
end

-- the contexts an error may name: every module of the library (so a new one is covered
-- without an edit here) and the few names its Lua layers use besides
local CONTEXTS = {}
for k, v in pairs(cp) do
  if type(k) == "string" and type(v) == "table" then CONTEXTS[k] = true end
end
for w in ([[stage stages budget report help coldprep cp]]):gmatch("%a+") do
  CONTEXTS[w] = true
end

-- does the argument tree hold a function (a callback whose own errors pass through)?
local function has_function(v, depth)
  if type(v) == "function" then return true end
  if type(v) ~= "table" or getmetatable(v) ~= nil or v == huge_array or (depth or 0) > 4 then return false end
  for _, x in pairs(v) do
    if has_function(x, (depth or 0) + 1) then return true end
  end
  return false
end

local function error_problem(msg, args)
  local callback = has_function(args[1])
  if type(msg) ~= "string" then
    if callback then return nil end -- a callback's error object, passed on
    return "the error is a " .. type(msg) .. ", not a message"
  end
  if callback and not msg:find("lua/coldprep/[%w_/]+%.lua:%d+:") and not msg:find("stack overflow", 1, true) then
    return nil -- a callback's own error (the fuzzer's or an example's), passed on
  end
  if msg:find("attempt to ", 1, true) then return "a Lua runtime error" end
  if msg:find("bad argument #", 1, true) then return "a raw argument error" end
  if msg:find("stack overflow", 1, true) then return "a stack overflow" end
  if msg:find("lua/coldprep/[%w_/]+%.lua:%d+:") then return "an error positioned inside the library" end
  -- the context names the function: "thermo.fermi: ...", "species.molecule: ...",
  -- "stage 2 (evaporate): ...", "budget:write_csv: ..." (after "FILE:LINE: " when raised
  -- by an example's own code)
  local body = msg:gsub("^[%w_]+:%d+: ", "", 1)
  local word, rest = body:match("^(%a+)([^\n]-): ")
  if not word or #rest > 60 or not CONTEXTS[word] then return "no \"<context>: \" prefix" end
end

-- Results that are probabilities or fractions by their documented meaning (efficiency,
-- survival, populations, ...): their names, and the range [0, 1] they must lie in.
local UNIT_INTERVAL = { "efficiency", "fraction", "probability", "survival", "initial",
  "excited", "target", "lost", "transferred" }
-- (cp.collisions.evaporation's efficiency is the log-derivative -d ln(PSD) / d ln N, not
-- a probability)
local NOT_FRACTIONS = { ["cp.collisions.evaporation"] = true }
-- (a budget's efficiency and cumulative_efficiency are the ratios N_out/N_in and N/N_start:
-- at least 0, above 1 for a stage that adds particles, which the row's first note says)
local BUDGETS = { ["cp.report.budget"] = true, ["cp.plan.Plan.run"] = true }
local RATIOS = { efficiency = true, cumulative_efficiency = true }

local function unit_interval(key)
  if type(key) ~= "string" then return false end
  for _, w in ipairs(UNIT_INTERVAL) do
    if key:find(w, 1, true) then return true end
  end
  return false
end

local function nonfinite(v, path, seen, budget, key, list_key, ratios)
  local t = type(v)
  if t == "number" then
    if v ~= v or v == math.huge or v == -math.huge then return path .. " = " .. tostring(v) end
    if ratios and RATIOS[key] then
      if v < 0 then return path .. " = " .. string.format("%.17g", v) .. ", outside [0, 1]" end
    elseif (unit_interval(key) or unit_interval(list_key)) and (v < 0 or v > 1) then
      return path .. " = " .. string.format("%.17g", v) .. ", outside [0, 1]"
    end
    return nil
  end
  if t ~= "table" or seen[v] or budget[1] <= 0 then return nil end
  seen[v] = true
  for k, x in pairs(v) do
    budget[1] = budget[1] - 1
    if budget[1] <= 0 then return nil end
    local p = nonfinite(x, path .. "." .. tostring(k), seen, budget,
      key == "" and "" or k, key == "" and "" or (math.type(k) == "integer" and key or nil), ratios)
    if p then return p end
  end
end

-- ---- the run ------------------------------------------------------------------------------
local progress = progress_path and assert(io.open(progress_path, "w"))
if progress then progress:setvbuf("no") end
local findings, calls, i = 0, 0, first
local start = os.time()
while i < first + count and os.time() - start < seconds do
  math.randomseed(seed, i)
  local f = functions[math.random(#functions)]
  local pool = seeds[f.name]
  local args = #pool > 0 and deep_copy(pool[math.random(#pool)]) or table.pack({})
  if math.random(10) > 1 then args = mutate(args) end
  local shown = describe(args[1]) .. ((args.n or 1) > 1 and (", " .. describe(args[2])) or "")
  if progress then
    progress:seek("set")
    progress:write(string.format("%d %s %s\n", i, f.name, shown:sub(1, 2000)))
  end
  local t0 = os.clock()
  local ok, res = pcall(f.fn, table.unpack(args, 1, args.n or 1))
  local dt = os.clock() - t0
  local problem
  if not ok then
    problem = error_problem(res, args)
    if problem then problem = problem .. ": " .. tostring(res):sub(1, 300) end
  else
    local where = nonfinite(res, "result", {}, { 20000 }, NOT_FRACTIONS[f.name] and "" or nil, nil,
      BUDGETS[f.name])
    if where then
      problem = where:find("outside %[0, 1%]") and ("a value outside its range: " .. where)
        or ("a non-finite number without an error: " .. where)
    end
  end
  if not problem and dt > 2 then problem = string.format("slow: %.1f s of CPU", dt) end
  if problem then
    findings = findings + 1
    stdout:write(string.format("FINDING %d %s %s | args: %s\n", i, f.name, problem, shown:sub(1, 600)))
  end
  calls = calls + 1
  i = i + 1
end
stdout:write(string.format("DONE %d %d %d\n", i, calls, findings))
if progress then progress:close() end
real_print = nil
