-- cp.sweep from Lua: the grid order and values (worked out by hand below), zipped
-- axes, logarithmic ranges, CSV quoting per RFC 4180 section 2 and the JSON Lines
-- escapes (RFC 8259 section 7), reading files back, errors of evaluate recorded per row,
-- and bad descriptions rejected with clear messages.
local T = require "testlib"
local check, raises = T.expect, T.raises_named

-- Grid: first axis slowest.  By hand: x in {0, 0.5, 1} (3 points from 0 to 1) and the
-- zipped pair (a, s) in {(1, "u"), (2, "v")}: 6 points, x = 0, 0, 0.5, 0.5, 1, 1.
local r = cp.sweep{
  parameters = { {name = "x", from = 0, to = 1, points = 3},
                 {zip = {{name = "a", values = {1, 2}}, {name = "s", values = {"u", "v"}}}} },
  evaluate = function(p) return {y = p.x * p.a, t = {name = p.s}} end,
  outputs = {"y", "t.name"},
}
check("grid size 3 x 2", r.count == 6 and #r.rows == 6)
local xs, as, ys = {}, {}, {}
for i, row in ipairs(r.rows) do xs[i], as[i], ys[i] = row.x, row.a, row.y end
check("first axis slowest", table.concat(xs, " ") == "0.0 0.0 0.5 0.5 1 1", table.concat(xs, " "))
check("zipped axis advances together", table.concat(as, " ") == "1 2 1 2 1 2"
  and r.rows[4].s == "v" and r.rows[3]["t.name"] == "u")
check("outputs picked by path", ys[6] == 2 and ys[3] == 0.5)
check("columns", table.concat(r.columns, ",") == "point,x,a,s,y,t.name,error")

-- Logarithmic range: 1, 10, 100, 1000 (4 points, a factor 10 apart, exact endpoints).
local s = cp.sweep.prepare{sweep = {parameters = {{name = "f", from = 1, to = 1000, points = 4, scale = "log"}},
  evaluate = function(p) return p.f end}}
local lv = {}
for i = 1, 4 do lv[i] = s.point(i).f end
check("log range endpoints exact", lv[1] == 1 and lv[4] == 1000)
check("log range ratio 10 (to 1e-14)", math.abs(lv[2] / 10 - 1) < 1e-14 and math.abs(lv[3] / 100 - 1) < 1e-14,
  table.concat(lv, " "))

-- combine = "zip": all parameters paired, 3 points.
local z = cp.sweep{parameters = {{name = "p", values = {1, 2, 3}}, {name = "q", from = 10, to = 30, points = 3}},
  combine = "zip", evaluate = function(p) return p.p + p.q end}
check("combine zip pairs", z.count == 3 and z.rows[2].value == 22 and z.rows[3].value == 33)

-- CSV per RFC 4180 section 2: fields with comma or quote are quoted, quotes doubled,
-- records end with CRLF; an evaluate error goes to the error column.
local path = os.tmpname()
cp.sweep{parameters = {{name = "k", values = {1, 2}}},
  evaluate = function(p)
    if p.k == 2 then error("no good", 0) end
    return {label = 'a,"b"', flag = true}
  end,
  outputs = {"label", "flag"}, out = path}
local f = io.open(path, "rb")
local text = f:read("a")
f:close()
check("CSV text", text == 'point,k,label,flag,error\r\n1,1,"a,""b""",true,\r\n2,2,,,no good\r\n', text)
local back = cp.sweep.read{path = path}
check("CSV read back", back.rows[1].label == 'a,"b"' and back.rows[1].flag == true
  and back.rows[2].error == "no good" and back.rows[2].label == nil)
os.remove(path)
-- inf, -inf and nan, as written, read back as numbers.
cp.sweep{parameters = {{name = "k", values = {1}}}, outputs = {"a", "b", "c"}, out = path,
  evaluate = function() return {a = math.huge, b = -math.huge, c = 0 / 0} end}
local inf = cp.sweep.read{path = path}.rows[1]
check("inf, -inf, nan read back", inf.a == math.huge and inf.b == -math.huge and inf.c ~= inf.c,
  tostring(inf.a) .. " " .. tostring(inf.b))
os.remove(path)

-- JSON Lines: strings escaped, NaN has no JSON form so it is written as null.
local jpath = path .. ".jsonl"
cp.sweep{parameters = {{name = "k", values = {1}}},
  evaluate = function() return {s = "line\nnext \"q\"", v = 0 / 0, w = 0.1} end,
  outputs = {"s", "v", "w"}, out = jpath}
f = io.open(jpath, "rb")
text = f:read("a")
f:close()
check("JSON Lines text", text == '{"point":1,"k":1,"s":"line\\nnext \\"q\\"","v":null,"w":0.1,"error":null}\n', text)
-- JSON text must be UTF-8 (RFC 8259 section 8.1): a Latin-1 byte becomes U+FFFD (EF BF BD).
cp.sweep{parameters = {{name = "k", values = {1}}}, evaluate = function() return {s = "caf\xe9 \u{b5}K"} end,
  outputs = {"s"}, out = jpath .. "2", format = "jsonl"}
f = io.open(jpath .. "2", "rb")
local latin = f:read("a")
f:close()
os.remove(jpath .. "2")
check("JSON strings are valid UTF-8", latin:find('"s":"caf\xef\xbf\xbd \xc2\xb5K"', 1, true) ~= nil
  and utf8.len(latin) ~= nil, latin)
local jb = cp.sweep.read{path = jpath}
check("JSON Lines read back", jb.rows[1].s == 'line\nnext "q"' and jb.rows[1].w == 0.1 and jb.rows[1].v == nil)
os.remove(jpath)

-- Shortest round-trip number text: 0.1 as "0.1" (15 digits suffice), 1/3 with 16, and
-- integers without a decimal point.
local nums = cp.sweep.prepare{sweep = {parameters = {{name = "k", values = {1}}},
  evaluate = function() return {a = 0.1, b = 1 / 3, c = 7} end, outputs = {"a", "b", "c"}}}
local row = nums.row(1)
check("numbers written shortest", row == "1,1,0.1,0.3333333333333333,7,\r\n", row)
check("1/3 round-trips", tonumber(row:match("^1,1,0.1,([^,]+)")) == 1 / 3)

-- A plan-like result: a table with a run method is run.
local planlike = { run = function(self) return {final = {number = 7}} end }
local pr = cp.sweep{parameters = {{name = "k", values = {1}}}, evaluate = function() return planlike end,
  outputs = {"final.number"}}
check("a returned plan is run", pr.rows[1]["final.number"] == 7)

-- A declared output missing from a result stops the sweep rather than give a column of
-- empty cells: the error names the output, the point, the keys at the level where the
-- path breaks and the closest of them (cp.names.closest).  Checked for both formats.
local plan_result = function() return {final = {number = 7, t_over_tf = 0.3}} end
for _, fmt in ipairs {"csv", "jsonl"} do
  local mpath = os.tmpname()
  raises("misspelt output path stops the sweep (" .. fmt .. ")",
    "sweep: output 'final.t_over_tff' is missing from evaluate's result at point 1 ('final' has "
      .. "the keys number, t_over_tf); did you mean 'final.t_over_tf'?",
    cp.sweep, {parameters = {{name = "k", values = {1, 2}}}, evaluate = plan_result,
      outputs = {"final.number", "final.t_over_tff"}, out = mpath, format = fmt})
  local mf = io.open(mpath, "rb")
  local mtext = mf:read("a")
  mf:close()
  check("no row written for the misspelt output (" .. fmt .. ")",
    mtext == (fmt == "csv" and "point,k,final.number,final.t_over_tff,error\r\n" or ""), mtext)
  os.remove(mpath)
end
raises("misspelt top-level output", "output 'fnal.number' is missing from evaluate's result at point 1 "
  .. "(the result has the keys final); did you mean 'final.number'?",
  cp.sweep, {parameters = {{name = "k", values = {1}}}, evaluate = plan_result, outputs = {"fnal.number"}})
raises("a path through a number", "output 'final.number.x' is missing at point 1: 'final.number' is a "
  .. "number, not a table with 'x'",
  cp.sweep, {parameters = {{name = "k", values = {1}}}, evaluate = plan_result, outputs = {"final.number.x"}})
-- The first point that lacks it stops the sweep (point 2 here), after point 1's row.
raises("the first point lacking an output", "output 'y' is missing from evaluate's result at point 2",
  cp.sweep, {parameters = {{name = "k", values = {1, 2}}},
    evaluate = function(p) return p.k == 1 and {y = 1} or {z = 2} end, outputs = {"y"}})
-- "name?" declares an output that may be absent: an empty cell (CSV) or null (JSON) there.
local opt = cp.sweep{parameters = {{name = "k", values = {1, 2}}},
  evaluate = function(p) return {y = p.k == 1 and 5 or nil} end, outputs = {"y?"}}
check("optional output: column without '?', empty where absent",
  table.concat(opt.columns, ",") == "point,k,y,error" and opt.rows[1].y == 5 and opt.rows[2].y == nil
  and opt.rows[2].error == nil and opt.failed == 0)
local jo = cp.sweep.prepare{format = "jsonl", sweep = {parameters = {{name = "k", values = {1}}},
  evaluate = function() return {} end, outputs = {"a.b?"}}}
check("optional output absent in JSON Lines is null", jo.row(1) == '{"point":1,"k":1,"a.b":null,"error":null}\n',
  jo.row(1))
-- A result whose metatable declares its keys (__fields; a plan's budget does) may lack any
-- of them, at any depth; a key it does not declare is still an error.
local declared = function()
  return setmetatable({final = {number = 1}}, {__fields = {limiting_stage = true, final = {t_over_tc = true}}})
end
local dr = cp.sweep{parameters = {{name = "k", values = {1}}}, evaluate = declared,
  outputs = {"limiting_stage", "final.t_over_tc", "final.number"}}
check("declared keys may be absent", dr.rows[1].limiting_stage == nil and dr.rows[1]["final.t_over_tc"] == nil
  and dr.rows[1]["final.number"] == 1 and dr.failed == 0)
raises("an undeclared key is still an error", "output 'final.t_over_tcc' is missing from evaluate's result "
  .. "at point 1 ('final' has the keys number); did you mean 'final.t_over_tc'?",
  cp.sweep, {parameters = {{name = "k", values = {1}}}, evaluate = declared, outputs = {"final.t_over_tcc"}})
-- A point whose evaluate raises keeps its outputs empty and its error text (not a stop).
local er = cp.sweep{parameters = {{name = "k", values = {1}}}, evaluate = function() error("no bound state", 0) end,
  outputs = {"y"}}
check("an error row is not a missing output", er.rows[1].error == "no bound state" and er.failed == 1)

-- Bad descriptions.
local ok_eval = function(p) return 1 end
raises("unknown key suggests", "did you mean 'evaluate'", cp.sweep, {parameters = {{name = "x", values = {1}}}, evalute = ok_eval})
raises("unknown parameter key", "did you mean 'points'", cp.sweep, {parameters = {{name = "x", from = 0, to = 1, point = 3}}, evaluate = ok_eval})
raises("NaN bound", "to NaN SI units is not a number", cp.sweep, {parameters = {{name = "x", from = 0, to = 0 / 0, points = 3}}, evaluate = ok_eval})
raises("log range through zero", "logarithmic range needs from > 0", cp.sweep, {parameters = {{name = "x", from = 0, to = 1, points = 3, scale = "log"}}, evaluate = ok_eval})
raises("zero points", "points 0 is out of range; allowed [1,", cp.sweep, {parameters = {{name = "x", from = 0, to = 1, points = 0}}, evaluate = ok_eval})
raises("points beyond the integers", "points 1e+300 is out of range; allowed [1,", cp.sweep, {parameters = {{name = "x", from = 0, to = 1, points = 1e300}}, evaluate = ok_eval})
raises("zip lengths", "need equal lengths", cp.sweep, {parameters = {{zip = {{name = "a", values = {1}}, {name = "b", values = {1, 2}}}}}, evaluate = ok_eval})
raises("duplicate names", "used twice", cp.sweep, {parameters = {{name = "a", values = {1}}, {name = "a", values = {2}}}, evaluate = ok_eval})
raises("missing evaluate", "missing argument 'evaluate'", cp.sweep, {parameters = {{name = "a", values = {1}}}})
raises("'?' alone is no output", "outputs[1] must be a result name", cp.sweep, {parameters = {{name = "a", values = {1}}}, evaluate = ok_eval, outputs = {"?"}})
raises("table without outputs", "list the results to keep", cp.sweep, {parameters = {{name = "a", values = {1}}}, evaluate = function() return {} end})
raises("not a table", "expects one table", cp.sweep, 3)
-- A full disk (Linux's /dev/full refuses every write with ENOSPC) fails the sweep.
if io.open("/dev/full", "wb") then
  raises("a refused write fails the sweep", "cannot write /dev/full", cp.sweep,
    {parameters = {{name = "x", values = {1, 2}}}, evaluate = ok_eval, out = "/dev/full"})
end
check("help text", cp.get_help(cp.sweep.run) ~= nil and cp.get_help(cp.sweep.prepare) ~= nil)

T.done()
