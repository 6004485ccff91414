-- coldprep.sandbox: the limits of `coldprep --sandbox FILE` and `coldprep sweep --sandbox`,
-- for plan and sweep files one does not trust (docs/cli.md, "Files you do not trust").  A
-- sandbox is built, not patched: the file runs in a fresh environment holding only the
-- base functions that compute, copies of math, string (without dump), table, utf8 and
-- coroutine, the coldprep library, a reduced os (time, clock, date, difftime) and an io
-- whose open reads only inside the file's own directory and writes only the outputs
-- declared on the command line.  load, loadfile and dofile take text chunks only (never
-- bytecode) into that environment; require gives only the coldprep modules.  The state is
-- the sandbox's alone, so the real globals the library itself uses are narrowed the same
-- way (its io.open, cp.plot.render and the sweep writer check the same rules), and the
-- debug library, package.loadlib, os.execute, io.popen and string.dump are removed.  The
-- memory and time caps are C's (lua/cli/cli_sandbox.c).
local files = require "coldprep.files"

local M = {}

local function dirname(p) return p:match("^(.*)/[^/]*$") or "." end
local function basename(p) return p:match("([^/]*)$") end

-- The absolute form of a path whose last component may not exist yet (its directory
-- must), without following a link as the last component; nil when the directory is not
-- there.
local function resolve(path)
  local d = files.realpath(dirname(path) == "" and "/" or dirname(path))
  local b = basename(path)
  if not d or b == "" or b == "." or b == ".." then return nil end
  return (d == "/" and "" or d) .. "/" .. b
end

-- Build the sandbox: `dir` is the directory reads are confined to, `writable` a list of
-- the paths that may be written (PATH.lock and PATH.done beside each, for the sweep
-- writer's lock and marker, too).  Narrows this state's globals and returns the fresh
-- environment for the untrusted chunk.
function M.lock_down(opts)
  local root = assert(files.realpath(opts.dir), "the sandbox directory must exist")
  local allowed = {}
  for _, p in ipairs(opts.writable or {}) do
    local r = resolve(p)
    if r then allowed[r], allowed[r .. ".lock"], allowed[r .. ".done"] = true, true, true end
  end

  local function readable(path)
    if type(path) ~= "string" then return false end
    local r = files.realpath(path)
    return r ~= nil and (r == root or r:sub(1, #root + 1) == root .. "/")
  end
  local function writable(path)
    if type(path) ~= "string" then return false end
    local r = resolve(path)
    return r ~= nil and allowed[r] == true and files.kind(path) ~= "link"
  end
  local function refuse(what, path)
    return nil, string.format("sandbox: %s %s is not allowed (reads only inside %s; writes " ..
      "only to the outputs given with --allow-write)", what, tostring(path), root)
  end
  M.readable, M.writable = readable, writable

  -- io: open and lines checked; no popen, tmpfile, input or output switching
  local real_open, real_lines = io.open, io.lines
  local function open(path, mode)
    mode = mode or "r"
    if type(mode) ~= "string" then return real_open(path, mode) end -- its own error
    if mode:find("[wa+]") then
      if not writable(path) then return refuse("writing", path) end
    elseif not readable(path) then
      return refuse("reading", path)
    end
    return real_open(path, mode)
  end
  local function lines(path, ...)
    if path ~= nil and not readable(path) then error(select(2, refuse("reading", path)), 2) end
    if path == nil then return real_lines() end
    return real_lines(path, ...)
  end
  io.open, io.lines = open, lines
  io.popen, io.tmpfile, io.input, io.output = nil, nil, nil, nil

  -- os: the clock only; removing a file only where writing it is allowed
  local real_remove = os.remove
  for _, k in ipairs { "execute", "exit", "getenv", "rename", "tmpname", "setlocale" } do os[k] = nil end
  os.remove = function(path)
    if not writable(path) then return refuse("removing", path) end
    return real_remove(path)
  end

  -- the sweep writer and the plots write through C: the same rules
  local real_fopen, real_lock = files.open, files.lock
  files.open = function(path, mode)
    if mode == "r" and not readable(path) then return refuse("reading", path) end
    if mode ~= "r" and not writable(path) then return refuse("writing", path) end
    return real_fopen(path, mode)
  end
  files.lock = function(path)
    if not writable(path) then return refuse("writing", path) end
    return real_lock(path)
  end
  local cp = require "coldprep"
  local render = cp.plot.render
  cp.plot.render = function(figure)
    if type(figure) == "table" and type(figure.out) == "string" and not writable(figure.out) then
      error("plot.render: " .. select(2, refuse("writing", figure.out)), 2)
    end
    return render(figure)
  end

  -- no native code, no introspection, no bytecode
  package.loadlib, package.cpath, package.path = nil, "", ""
  package.searchers = { package.searchers[1] } -- package.preload only
  package.loaded.debug, debug = nil, nil
  string.dump = nil
  getmetatable("").__metatable = "string" -- the real string table stays out of reach

  local env = {}
  local real_load, real_loadfile = load, loadfile
  local function load_text(chunk, name, mode, e)
    if mode ~= nil and mode ~= "t" then return nil, "sandbox: only text chunks may be loaded" end
    return real_load(chunk, name, "t", e == nil and env or e)
  end
  local function loadfile_text(path, mode, e)
    if mode ~= nil and mode ~= "t" then return nil, "sandbox: only text chunks may be loaded" end
    if path == nil or not readable(path) then return refuse("reading", path) end
    return real_loadfile(path, "t", e == nil and env or e)
  end
  _G.load, _G.loadfile, _G.dofile = load_text, loadfile_text, nil -- the library's, too

  local function copy(t, drop)
    local c = {}
    for k, v in pairs(t) do
      if not (drop and drop[k]) then c[k] = v end
    end
    return c
  end
  for _, k in ipairs { "assert", "error", "ipairs", "next", "pairs", "pcall", "xpcall", "print",
    "select", "tonumber", "tostring", "type", "rawequal", "rawget", "rawlen", "rawset",
    "setmetatable", "getmetatable", "_VERSION", "help" } do
    env[k] = _G[k]
  end
  env.collectgarbage = function(opt, ...)
    if opt == nil or opt == "collect" or opt == "count" or opt == "step" then
      return collectgarbage(opt, ...)
    end
    error("sandbox: collectgarbage(\"" .. tostring(opt) .. "\") is not allowed", 2)
  end
  env.math, env.string, env.table = copy(math), copy(string), copy(table)
  env.utf8, env.coroutine = copy(utf8), copy(coroutine)
  env.os = copy(os, { remove = true })
  env.io = { open = open, lines = lines, write = io.write, read = io.read, type = io.type,
    stdout = io.stdout, stderr = io.stderr, stdin = io.stdin }
  env.load, env.loadfile = load_text, loadfile_text
  env.dofile = function(path)
    local f, err = loadfile_text(path)
    if not f then error(err, 2) end
    return f()
  end
  local private = { ["coldprep.files"] = true, ["coldprep.sandbox"] = true }
  env.require = function(name)
    if type(name) ~= "string" or private[name]
      or not (name == "coldprep" or name:match("^coldprep%.")) then
      error("sandbox: require(" .. tostring(name) .. ") is not allowed; only coldprep modules", 2)
    end
    return require(name)
  end
  env.cp, env.coldprep, env.arg = cp, cp, _G.arg
  env._G = env
  return env
end

return M
