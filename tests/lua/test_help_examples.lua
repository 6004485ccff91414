-- The example at the end of every model function's help text runs as written in a fresh
-- environment that knows only `cp` and the standard library (what a user pastes into the
-- REPL), and returns without error.  Catches examples that rely on undefined variables
-- (r, m, W, nm, ...) or on argument names that no longer exist.
local T = require "testlib"
local cp = require "coldprep"

local function run(example)
  local env = setmetatable({ cp = cp }, { __index = _G })
  local chunk = load(example, "example", "t", env)
  if not chunk then
    -- an expression on its own, possibly after some statements on earlier lines
    local head, last = example:match("^(.*)\n%s*(cp%..-)$")
    if head then chunk = load(head .. "\nreturn " .. last, "example", "t", env) end
    chunk = chunk or load("return " .. example, "example", "t", env)
  end
  if not chunk then return false, "does not compile" end
  return pcall(chunk)
end

for _, module in ipairs { "feshbach", "raman", "lattice", "thermo", "collisions", "fields", "reals" } do
  local names = {}
  for name, fn in pairs(cp[module]) do
    if type(fn) == "function" then names[#names + 1] = name end
  end
  table.sort(names)
  for _, name in ipairs(names) do
    local text = cp.get_help(cp[module][name]) or ""
    local example = text:match("Example:%s*(.*)$")
    if not example then
      T.check(false, module .. "." .. name .. ": help text has no example")
    else
      local ok, err = run(example)
      T.check(ok, module .. "." .. name .. " example runs" .. (ok and "" or (": " .. tostring(err))))
    end
  end
end

-- help(): every line of the listing fits 100 columns, each function's signature is complete
-- (its brackets balance) and the library's plumbing (set_help, builtin_*) is not listed.
local printed = {}
local real_print = print
print = function(s) printed[#printed + 1] = s end -- luacheck: ignore
help()
print = real_print -- luacheck: ignore
local listing = table.concat(printed, "\n")
local widest = 0
for line in listing:gmatch("[^\n]+") do widest = math.max(widest, #line) end
T.check(widest <= 100, "help() fits 100 columns (widest line " .. widest .. ")")
T.check(not listing:find("set_help", 1, true) and not listing:find("builtin_", 1, true),
  "help() hides the library's plumbing")
local entry = listing:match("\n  (cp%.collisions%.hold.-)\n  cp%.")
local _, opened = entry:gsub("[{(%[]", "")
local _, closed = entry:gsub("[})%]]", "")
T.check(entry:find("points = 101}", 1, true) and opened == closed,
  "help() gives collisions.hold's whole signature: " .. tostring(entry))
T.done()
