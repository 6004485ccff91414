-- testlib: a tiny assertion library for the Lua-level tests (run by the coldprep binary
-- from tests/lua).  Each check counts; `done()` prints "N passed, M failed" and exits
-- non-zero on any failure.
local T = { passed = 0, failed = 0 }

local function report(ok, what, detail)
  if ok then
    T.passed = T.passed + 1
  else
    T.failed = T.failed + 1
    io.stderr:write("FAIL: ", what, detail and (": " .. detail) or "", "\n")
  end
end

-- cond must be true
function T.check(cond, what)
  report(cond and true or false, what)
end

-- |got - want| <= rel * |want|
function T.near(got, want, rel, what)
  local ok = type(got) == "number" and math.abs(got - want) <= rel * math.abs(want)
  report(ok, what, string.format("got %.17g, want %.17g (rel %.1e)", tonumber(got) or 0 / 0, want, rel))
end

-- fn must raise an error whose message contains every plain-text fragment given
function T.raises(fn, fragments, what)
  local ok, err = pcall(fn)
  if ok then return report(false, what, "no error raised") end
  err = tostring(err)
  for _, f in ipairs(type(fragments) == "table" and fragments or { fragments }) do
    if not err:find(f, 1, true) then
      return report(false, what, "message lacks '" .. f .. "': " .. err)
    end
  end
  report(true, what)
end

-- The named form the study-layer tests read best in: name first, then the condition, and
-- what was seen (printed on failure only).
function T.expect(name, ok, detail)
  if not ok and detail ~= nil then io.stderr:write("  seen: ", tostring(detail), "\n") end
  T.check(ok, name)
end

-- name first: f(...) must raise an error containing the plain-text fragment `fragment`.
function T.raises_named(name, fragment, f, ...)
  local args = table.pack(...)
  T.raises(function() return f(table.unpack(args, 1, args.n)) end, { fragment }, name)
end

function T.done()
  print(string.format("%d passed, %d failed", T.passed, T.failed))
  os.exit(T.failed == 0 and 0 or 1)
end

return T
