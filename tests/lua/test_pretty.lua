-- Lua-level tests of coldprep.pretty, the formatter behind the REPL's printed values.
-- Expected renderings are written by hand from the rules stated in docs/cli.md
-- ("How values are shown"); numbers follow C's %.6g (ISO C 7.21.6.1).
local T = require "testlib"
local pretty = require "coldprep.pretty"
local fmt = pretty.format

-- PRETTY-1: scalars.  Floats to 6 significant digits, integers exactly, specials named.
T.check(fmt(1 / 3) == "0.333333", "1/3 to 6 digits")
T.check(fmt(6.62607015e-34) == "6.62607e-34", "CODATA h to 6 digits")
T.check(fmt(123456789) == "123456789", "integers are exact")
T.check(fmt(2 ^ 53) == "9.0072e+15", "a large float in %g form")
T.check(fmt(0 / 0) == "nan" and fmt(1 / 0) == "inf" and fmt(-1 / 0) == "-inf", "nan, inf")
T.check(fmt("a\nb\"c") == '"a\\nb\\"c"', "strings quoted, newline escaped")
T.check(fmt(true) == "true" and fmt(nil) == "nil", "booleans and nil")
T.check(fmt(print) == "<function print>", "functions show their global name")
T.check(fmt(string.format) == "<function string.format>", "library functions too")
T.check(fmt(function() end):match("^<function: 0x%x+>$") ~= nil, "anonymous functions")

-- PRETTY-2: key order: the sequence 1..n first, then numbers, strings, booleans.
T.check(fmt({}) == "{}", "empty table")
T.check(fmt({ 3, 2, 1 }) == "{3, 2, 1}", "sequence in order")
T.check(fmt({ b = 1, a = 2, [2] = "y", [1] = "x", [5] = 5, [0.5] = 0, ["a b"] = 3, [false] = 0 })
  == '{"x", "y", [0.5] = 0, [5] = 5, a = 2, ["a b"] = 3, b = 1, [false] = 0}', "key order")
T.check(fmt({ ["end"] = 1 }) == '{["end"] = 1}', "keywords are not bare keys")

-- PRETTY-3: nesting: short tables on one line; longer ones one entry per line, indented
-- by two spaces per level, each entry followed by a comma.
local nested = { name = "a name that is fairly long", inner = { x = 1.5, y = { 1, 2 } },
  more = "another string to pass the width" }
T.check(fmt(nested) == [[
{
  inner = {x = 1.5, y = {1, 2}},
  more = "another string to pass the width",
  name = "a name that is fairly long",
}]], "nested layout")
T.check(fmt({ a = { b = { c = "deep" } } }, { width = 20 }) == [[
{
  a = {
    b = {
      c = "deep",
    },
  },
}]], "width option forces lines")

-- PRETTY-4: short sequence values share lines up to the width.
local seq = {}
for i = 1, 30 do seq[i] = i * 100 end
local s = fmt(seq)
T.check(s:match("^{\n  100, 200, 300, ") ~= nil, "sequence packed on lines")
for line in s:gmatch("[^\n]+") do
  T.check(#line <= 78, "line within 78 columns: " .. line)
end

-- PRETTY-5: cycles are marked with the path of the table they lead back to.
local t = { name = "t", child = {} }
t.child.parent = t
t.child.self = t.child
T.check(fmt(t) == '{child = {parent = <cycle: root>, self = <cycle: root.child>}, name = "t"}',
  "cycles")
local shared = { 1 }
T.check(fmt({ shared, shared }) == "{{1}, {1}}", "a table seen twice but not in a cycle")

-- PRETTY-6: limits: long sequences keep the first max_items - 5 entries, a count of the
-- rest and the last 5 by index; many keys are cut with a count; deep nesting is cut.
local long = {}
for i = 1, 100 do long[i] = i end
local cut = fmt(long, { max_items = 20 })
T.check(cut:find("13, 14, 15, <80 more>, [96] = 96,", 1, true) ~= nil, "sequence cut")
T.check(cut:find("[100] = 100,", 1, true) ~= nil, "last entry kept")
T.check(cut:find(" 16,", 1, true) == nil, "entries in the gap left out")
local many = {}
for i = 1, 50 do many[string.format("k%02d", i)] = i end
local cutk = fmt(many, { max_items = 10 })
T.check(cutk:find("k10 = 10,", 1, true) ~= nil and cutk:find("k11", 1, true) == nil,
  "first keys kept in order")
T.check(cutk:find("<40 more keys>", 1, true) ~= nil, "count of the keys left out")
local deep = { { { { "bottom" } } } }
T.check(fmt(deep, { max_depth = 2 }) == "{{{<1 entry not shown>}}}", "depth cut")

-- PRETTY-7: __tostring is used, and a failing one is reported, not raised.
local obj = setmetatable({}, { __tostring = function() return "OBJ" end })
T.check(fmt(obj) == "OBJ" and fmt({ o = obj }) == "{o = OBJ}", "__tostring")
local bad = setmetatable({}, { __tostring = function() error("nope", 0) end })
T.check(fmt(bad) == "<table: __tostring failed: nope>", "failing __tostring")
-- raw access only: __index and __pairs are not consulted
local proxy = setmetatable({ own = 1 }, { __index = { inherited = 2 }, __pairs = error })
T.check(fmt(proxy) == "{own = 1}", "raw fields only")

-- PRETTY-8: the digits option, and bad options rejected with the name of the option.
T.check(fmt(math.pi, { digits = 10 }) == "3.141592654", "digits option")
T.raises(function() fmt(1, { colour = 1 }) end, { "unknown option 'colour'" }, "unknown option")
T.raises(function() fmt(1, { digits = 0 }) end, { "digits = 0", "integer from 1 to 17" }, "range")
T.raises(function() fmt(1, { max_items = 5 }) end, { "max_items", "from 10 to 100000" }, "range")
T.raises(function() fmt(1, { width = 2.5 }) end, { "width" }, "integer options")
T.raises(function() fmt(1, "wide") end, { "options must be a table" }, "options type")

-- PRETTY-9: the formatter has a help text.
T.check((cp.get_help(pretty.format) or ""):find("pretty.format(value", 1, true) ~= nil,
  "help text registered")

T.done()
