-- The rules of the sandbox (coldprep.sandbox) from inside: after lock_down nothing
-- reachable from the environment it returns — through tables, their keys and values, and
-- metatables as getmetatable shows them — is one of the functions that run commands, open
-- files unchecked, load native code or bytecode, or inspect other functions (a walk of the
-- whole reachable graph, compared with the originals captured before); the checked io.open
-- reads only inside the directory and writes only the declared outputs (and their lock
-- and marker), never through a symbolic link.
local T = require "testlib"
local files = require "coldprep.files"
local sandbox = require "coldprep.sandbox"
local exit, execute, tmpname, remove = os.exit, os.execute, os.tmpname, os.remove

local dangerous = {}
local function mark(name, f) if f then dangerous[f] = name end end
for _, k in ipairs { "execute", "exit", "getenv", "remove", "rename", "tmpname", "setlocale" } do
  mark("os." .. k, os[k])
end
for _, k in ipairs { "open", "popen", "lines", "input", "output", "tmpfile" } do mark("io." .. k, io[k]) end
for k, f in pairs(debug) do mark("debug." .. k, f) end
mark("package.loadlib", package.loadlib)
mark("load", load); mark("loadfile", loadfile); mark("dofile", dofile); mark("require", require)
mark("string.dump", string.dump)
mark("files.open", files.open); mark("files.lock", files.lock)

local dir = tmpname()
remove(dir)
assert(execute("mkdir " .. dir .. " " .. dir .. "/sub && echo x > " .. dir .. "/sub/in.txt"))
local outside = tmpname()

local env = sandbox.lock_down { dir = dir .. "/sub", writable = { dir .. "/sub/out.csv" } }

-- Walk everything reachable from env.
local seen, found, count = {}, {}, 0
local function walk(v, path)
  local t = type(v)
  if t == "function" and dangerous[v] then found[#found + 1] = path .. " = " .. dangerous[v] end
  if (t ~= "table" and t ~= "userdata" and t ~= "string") or seen[v] then return end
  seen[v] = true
  count = count + 1
  local mt = env.getmetatable(v)
  if mt ~= nil then walk(mt, "getmetatable(" .. path .. ")") end
  if t == "table" then
    for k, x in next, v do
      walk(k, path .. "[key]")
      walk(x, path .. "." .. tostring(k))
    end
  end
end
walk(env, "_ENV")
walk("", "a string")
walk(env.io.stdout, "io.stdout")
T.check(#found == 0, "no dangerous function reachable (" .. count .. " tables walked): "
  .. table.concat(found, ", "))
T.check(count > 50, "the walk reached the library (" .. count .. " tables)")

-- The checked io.open.
local function opens(path, mode) local f = env.io.open(path, mode); if f then f:close() end; return f ~= nil end
T.check(opens(dir .. "/sub/in.txt"), "reads inside its directory")
T.check(not opens(dir .. "/sub/../sub/../../" .. outside:match("[^/]+$")), "no reading through ..")
T.check(not opens(outside), "no reading outside")
T.check(opens(dir .. "/sub/out.csv", "w"), "writes a declared output")
T.check(files.lock(dir .. "/sub/out.csv") ~= nil, "and may take its lock")
T.check(not opens(dir .. "/sub/other.csv", "w"), "no writing an undeclared file")
T.check(not opens(dir .. "/sub/in.txt", "a"), "no appending to a readable file")
assert(execute("ln -s " .. outside .. " " .. dir .. "/sub/link.txt"))
T.check(not opens(dir .. "/sub/link.txt"), "a link inside pointing outside is not read")
assert(execute("rm " .. dir .. "/sub/out.csv && ln -s " .. outside .. " " .. dir .. "/sub/out.csv"))
T.check(not opens(dir .. "/sub/out.csv", "w"), "a declared output that became a link is not written")
T.check(select(2, env.load("return 1", "x", "b")):find("only text chunks", 1, true) ~= nil, "no bytecode mode")
T.check(env.load("return _ENV")() == env, "loaded chunks get the sandbox environment")
T.check(not pcall(env.require, "os"), "require gives coldprep modules only")
T.check(env.require("coldprep") == cp, "and the library")

execute("rm -rf " .. dir .. " " .. outside)
os.exit = exit
T.done()
