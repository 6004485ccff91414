-- Sweep files read and written strictly: a row cut off at any byte is refused by
-- cp.sweep.read in both formats (never read as a shorter, plausible row), the grammar of
-- RFC 4180 section 2 (CSV) and RFC 8259 (JSON) is enforced, a UTF-8 byte order mark is
-- skipped, JSON Lines reads name their columns; cp.sweep{out = PATH} respects the lock
-- PATH.lock that `coldprep sweep` holds, follows no symbolic link and removes a stale
-- completion marker; plot.waterfall refuses values that are not numbers.
local T = require "testlib"
local files = require "coldprep.files"

local dir = os.tmpname()
os.remove(dir)
assert(os.execute("mkdir " .. dir))
local function path(name) return dir .. "/" .. name end
local function write(name, text)
  local f = assert(io.open(path(name), "wb"))
  f:write(text)
  f:close()
  return path(name)
end
local function slurp(p)
  local f = assert(io.open(p, "rb"))
  local t = f:read("a")
  f:close()
  return t
end
local function read(name, text, format)
  return pcall(cp.sweep.read, { path = write(name, text), format = format })
end

-- The two cut-off rows the outside fuzz found: "2,1.23" (read as x = 1.23) and the row
-- a refused write left, "21,5,p,10,-1" (read back as -1 where the value was -0.1047).
local ok, err = read("cut.csv", "point,x\r\n1,0.5\r\n2,1.23")
T.check(not ok and err:find("no line end", 1, true), "a CSV row without its line end is refused: " .. tostring(err))
ok, err = read("cut2.csv", "point,k,s,n,v,error\r\n20,5,p,10,-0.25,\r\n21,5,p,10,-1")
T.check(not ok and err:find("cut off", 1, true), "the torn row of a refused write is refused")
ok, err = read("cut.jsonl", '{"point":1,"x":0.5}\n{"point":2,"x":1.23}')
T.check(not ok and err:find("no line end", 1, true), "JSON Lines says the same of a torn row")

-- Truncation at every offset of a real sweep file: either the rows before the cut, exactly,
-- or an error naming the file (no other outcome; a cut right after a line end is a whole
-- file).  The sweep below writes strings that need quoting and escapes.
for _, ext in ipairs { "csv", "jsonl" } do
  local full = path("full." .. ext)
  cp.sweep { parameters = { { name = "x", values = { 0.1, -1e-300, 2 } } }, out = full,
    evaluate = function(p)
      if p.x == 2 then error("bad, \"x\"\nline", 0) end
      return { v = -p.x / 3, s = 'a,"b"\r\n\\' }
    end, outputs = { "v", "s" } }
  local text = slurp(full)
  local whole = cp.sweep.read { path = full }
  T.check(#whole.rows == 3 and whole.rows[1].v == -0.1 / 3 and whole.rows[3].error == 'bad, "x"\nline'
    and whole.rows[2].s == 'a,"b"\r\n\\', ext .. ": rows read back exactly")
  T.check(table.concat(whole.columns, " ") == "point x v s error", ext .. ": columns named")
  -- row ends: a LF outside quotes (CSV strings may hold line breaks; JSON escapes them)
  local ends, quoted = { [0] = true }, false
  for i = 1, #text do
    local c = text:sub(i, i)
    if c == '"' and ext == "csv" then quoted = not quoted end
    if c == "\n" and not quoted then ends[i] = true end
  end
  local bad = 0
  for cut = 0, #text - 1 do
    local ok2, r = read("trunc." .. ext, text:sub(1, cut))
    local boundary = ends[cut] or false
    if ok2 then
      local n = #r.rows
      -- accepted only at a row boundary, with exactly the rows before it
      if not boundary or (n > 0 and r.rows[n].point ~= n) then bad = bad + 1 end
    elseif boundary or not r:find("sweep.read: " .. path("trunc." .. ext), 1, true) then
      bad = bad + 1
    end
  end
  T.check(bad == 0, string.format("%s: every truncation (%d offsets) refused or exact (%d bad)", ext, #text, bad))
end

-- CSV grammar (RFC 4180 section 2).
ok, err = read("q.csv", 'point,s\r\n1,"a""b"c\r\n')
T.check(not ok and err:find("quoted field is followed by", 1, true), "text after a closing quote is refused")
ok, err = read("q2.csv", 'point,s\r\n1,a"b\r\n')
T.check(not ok and err:find("double quote inside a field", 1, true), "a quote inside an unquoted field is refused")
ok, err = read("n.csv", "point,a,b\r\n1,2\r\n")
T.check(not ok and err:find("2 fields, the header 3", 1, true), "a row with too few fields is refused")
local r = cp.sweep.read { path = write("hex.csv", "point,h,e,w\r\n1,0x10,1e3, 7\r\n") }
T.check(r.rows[1].h == "0x10" and r.rows[1].e == 1000 and r.rows[1].w == " 7",
  "only decimal numbers convert (0x10 and ' 7' stay text)")
r = cp.sweep.read { path = write("bom.csv", "\xEF\xBB\xBFpoint,x\r\n1,2\r\n") }
T.check(r.columns[1] == "point" and r.rows[1].point == 1, "a UTF-8 byte order mark is skipped")

-- JSON grammar (RFC 8259).
local function jbad(name, text, fragment)
  local ok3, e = read(name, text, "jsonl")
  T.check(not ok3 and e:find(fragment, 1, true), name .. " refused: " .. tostring(e))
end
jbad("trailing", '{"point":1} x\n', "text after the object")
jbad("escape", '{"point":1,"s":"a\\qb"}\n', "unknown escape \\q")
jbad("hexnum", '{"point":0x10}\n', "not a JSON value")
jbad("leading0", '{"point":01}\n', "not a JSON value")
jbad("nested", '{"point":1,"t":{"a":1}}\n', "a value")
jbad("dup", '{"point":1,"point":2}\n', "appears twice")
jbad("ctrl", '{"point":1,"s":"a\tb"}\n', "control character")
jbad("surrogate", '{"point":1,"s":"\\ud800"}\n', "surrogate")
jbad("keys", '{"point":1,"x":1}\n{"point":2,"y":1}\n', "other keys")
jbad("huge", '{"point":1,"x":1e999}\n', "out of range")
r = cp.sweep.read { path = write("ok.jsonl", '{"point":1,"s":"\\u00e9\\ud83d\\ude00","n":null,"x":-0.5e-3}\n'), format = "jsonl" }
T.check(r.rows[1].s == "\u{e9}\u{1F600}" and r.rows[1].n == nil and r.rows[1].x == -0.5e-3
  and table.concat(r.columns, " ") == "point s n x", "escapes, surrogate pairs, null and columns")

-- The lock: while `coldprep sweep` (or anyone through the same protocol) holds PATH.lock,
-- cp.sweep{out = PATH} refuses and leaves the file alone.
local busy = write("busy.csv", "point,x,value,error\r\n1,1,1,\r\n")
local lock = assert(files.lock(busy))
ok, err = pcall(cp.sweep, { parameters = { { name = "x", values = { 5 } } }, out = busy,
  evaluate = function(p) return p.x end })
T.check(not ok and err:find("another coldprep sweep is writing", 1, true), "a locked output is refused: " .. tostring(err))
T.check(slurp(busy) == "point,x,value,error\r\n1,1,1,\r\n", "and left untouched")
lock:release()
cp.sweep { parameters = { { name = "x", values = { 5 } } }, out = busy, evaluate = function(p) return p.x end }
T.check(slurp(busy) == "point,x,value,error\r\n1,5,5,\r\n", "once released the sweep writes it")
T.check(files.kind(busy .. ".lock") == nil, "and its lock is gone afterwards")

-- A stale completion marker goes with the rows it described.
write("busy.csv.done", '{"format":"csv","points":1}\n')
cp.sweep { parameters = { { name = "x", values = { 6 } } }, out = busy, evaluate = function(p) return p.x end }
T.check(files.kind(busy .. ".done") == nil, "a new sweep removes the old PATH.done")

-- No symbolic links: the output is not written through one.
local target = write("target.txt", "precious\n")
assert(os.execute("ln -s " .. target .. " " .. path("link.csv")))
ok, err = pcall(cp.sweep, { parameters = { { name = "x", values = { 1 } } }, out = path("link.csv"),
  evaluate = function(p) return p.x end })
T.check(not ok and err:find("symbolic link", 1, true), "an output that is a symbolic link is refused")
T.check(slurp(target) == "precious\n", "and the file it points to is untouched")
assert(os.execute("ln -s " .. target .. " " .. path("link2.csv.lock")))
ok, err = pcall(cp.sweep, { parameters = { { name = "x", values = { 1 } } }, out = path("link2.csv"),
  evaluate = function(p) return p.x end })
T.check(not ok and err:find("symbolic link", 1, true) and slurp(target) == "precious\n",
  "a lock file that is a symbolic link is refused")

-- plot.waterfall: values must be numbers.
local function wbad(what, stages, fragment)
  local ok4, e = pcall(cp.plot.waterfall, { budget = { stages = stages }, out = path("w.png") })
  T.check(not ok4 and tostring(e):find(fragment, 1, true), what .. ": " .. tostring(e))
end
wbad("NaN T/T_F", { { name = "a", number = 1e5, t_over_tf = 0 / 0 } }, "t_over_tf must be a positive finite number")
wbad("text T/T_F", { { name = "a", number = 1e5, t_over_tf = "0.3" } }, "t_over_tf must be a positive finite number")
wbad("text T/T_c", { { name = "a", number = 1e5, t_over_tc = {} } }, "t_over_tc must be a positive finite number")
wbad("text number", { { name = "a", number = "1e5" } }, "number must be a positive finite number")
wbad("table name", { { name = {}, number = 1e5 } }, "name must be a string")

os.execute("rm -rf " .. dir)
T.done()
