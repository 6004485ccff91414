-- Benchmarks of `coldprep sweep` (issue: sweeps), run by scripts/bench through the coldprep
-- binary:
--   1. throughput of a 10 000-point sweep with --jobs 2 against --jobs 1 (target >= 1.8x);
--      the workload is the demo plan when scripts/demo.lua provides one
--      (BENCH_SWEEP_FILE overrides), else a plan-like function of similar cost;
--   2. peak memory (RSS) of a 10^6-point sweep of a cheap function (target < 50 MB);
--   3. kill -9 mid-sweep, --resume, compare with an uninterrupted run (must be identical).
-- Timings come from the summary line the sweep prints; each run is repeated and the best
-- is kept, because the machine is shared.
local bin = arg and arg[-1] or "coldprep"
do -- an absolute path, since part 3 changes directory
  local p = io.popen("realpath '" .. bin .. "' 2>/dev/null")
  local abs = p:read("l")
  p:close()
  if abs and abs ~= "" then bin = abs end
end
local dir = os.tmpname()
os.remove(dir)
assert(os.execute("mkdir -p " .. dir))
local function write(path, text)
  local f = assert(io.open(path, "w"))
  f:write(text)
  f:close()
end

-- Run a sweep; returns points/s from its summary line.
local function sweep(args)
  local p = io.popen(string.format("%s sweep %s 2>&1", bin, args))
  local text = p:read("a")
  p:close()
  local rate = text:match("([%d.]+) points/s")
  if not rate then error("sweep failed: " .. text) end
  return tonumber(rate), text
end

-- 1. Throughput.
local file = os.getenv("BENCH_SWEEP_FILE")
local what
if file then
  what = file
else
  file = dir .. "/planlike.lua"
  what = "a plan-like function (about 0.5 ms of Lua per point)"
  write(file, [[
-- A stand-in for one plan evaluation: a few thousand floating-point operations and
-- table allocations per point, like chaining five stage models.
return {
  parameters = {{name = "ramp_rate", from = 1e3, to = 1e6, points = 100, scale = "log"},
                {name = "hold", from = 0, to = 1, points = 100}},
  evaluate = function(p)
    local n, t = 1e6, 1.0
    for stage = 1, 5 do
      local s = {}
      for i = 1, 300 do s[i] = math.exp(-i / (p.ramp_rate * stage)) * math.cos(i * p.hold) end
      local acc = 0
      for i = 1, #s do acc = acc + s[i] end
      n = n * (0.5 + 0.4 * math.abs(acc) / 300)
      t = t * (0.8 + 0.1 * p.hold)
    end
    return {final = {number = n, t_over_tf = t}}
  end,
  outputs = {"final.number", "final.t_over_tf"},
}
]])
end
local best = {}
for _, jobs in ipairs { 1, 2 } do
  for rep = 1, 3 do
    local rate = sweep(string.format("%s --jobs %d --out %s/tp%d.csv --force", file, jobs, dir, jobs))
    best[jobs] = math.max(best[jobs] or 0, rate)
  end
end
print(string.format("throughput, 10 000 points of %s:", what))
print(string.format("  --jobs 1: %.1f points/s   --jobs 2: %.1f points/s   speed-up %.2fx (target >= 1.8x; best of 3, shared machine)",
  best[1], best[2], best[2] / best[1]))
local same = os.execute(string.format("cmp -s %s/tp1.csv %s/tp2.csv", dir, dir))
print("  files identical under --jobs 1 and 2: " .. tostring(same == true))

-- 2. Memory of a 10^6-point sweep.
write(dir .. "/cheap.lua", [[
return {
  parameters = {{name = "x", from = 0, to = 1, points = 1000},
                {name = "y", from = 1, to = 1000, points = 1000, scale = "log"}},
  evaluate = function(p) return {z = p.x * math.log(p.y)} end,
  outputs = {"z"},
}
]])
local has_time = os.execute("test -x /usr/bin/time")
if has_time then
  local p = io.popen(string.format("/usr/bin/time -f 'RSS %%M' %s sweep %s/cheap.lua --jobs 2 --out %s/cheap.csv 2>&1",
    bin, dir, dir))
  local text = p:read("a")
  p:close()
  local rss = tonumber(text:match("RSS (%d+)"))
  print(string.format("memory, 10^6 points of a cheap function: peak RSS %.1f MB (target < 50 MB); %s",
    (rss or 0) / 1024, (text:match("coldprep sweep: ([^\n]*)") or "")))
else
  print("memory: /usr/bin/time is not installed; skipped")
end

-- 3. kill -9 mid-sweep, then --resume.
local ok = os.execute(string.format([[
  cd %s && (%s sweep %s --jobs 2 --out killed.csv 2>/dev/null & pid=$!;
  for i in $(seq 1 500); do [ -f killed.csv ] && [ $(wc -l < killed.csv) -ge 2000 ] && break; sleep 0.02; done;
  kill -9 $pid; wait $pid 2>/dev/null; echo "  killed after $(($(wc -l < killed.csv) - 1)) rows";
  %s sweep %s --jobs 2 --out killed.csv --resume 2>/dev/null; cmp -s killed.csv tp1.csv)]],
  dir, bin, file, bin, file))
print("kill -9 then --resume equals the uninterrupted run: " .. tostring(ok == true))
os.execute("rm -rf " .. dir)
