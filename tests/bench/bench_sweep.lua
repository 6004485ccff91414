-- Benchmarks of `coldprep sweep`, run by scripts/bench through the coldprep binary:
--   1. throughput of a 10 000-point sweep with --jobs 2 against --jobs 1 (targets: >= 1.9x,
--      and >= 250 points/s on 2 jobs);
--      the workload is the demo plan when scripts/demo.lua provides one
--      (BENCH_SWEEP_FILE overrides), else a plan-like function of similar cost;
--   2. peak memory (RSS) of a 10^6-point sweep of a cheap function (target < 50 MB);
--   3. kill -9 mid-sweep, --resume, compare with an uninterrupted run (must be identical).
-- Timings come from the summary line the sweep prints; each run is repeated and the best
-- is kept, because the machine is shared.
local bin = "coldprep"
if arg then -- the interpreter is the lowest-numbered entry of arg
  local i = 0
  while arg[i - 1] do i = i - 1 end
  if i < 0 then bin = arg[i] end
end
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

-- Run a sweep under /usr/bin/time when there is one; returns points/s (from the sweep's
-- summary line) and the CPU seconds it used (user + system, or nil).
local has_time = os.execute("test -x /usr/bin/time")
local function sweep(args)
  local timer = has_time and "/usr/bin/time -f 'CPU %U %S RSS %M' " or ""
  local p = io.popen(string.format("%s%s sweep %s 2>&1", timer, bin, args))
  local text = p:read("a")
  p:close()
  local rate = text:match("([%d.]+) points/s")
  if not rate then error("sweep failed: " .. text) end
  local user, sys = text:match("CPU ([%d.]+) ([%d.]+)")
  return tonumber(rate), user and (tonumber(user) + tonumber(sys)), tonumber(text:match("RSS (%d+)")), text
end

-- 1. Throughput: the demo plan's sweep (scripts/examples/sweep_tidewater.lua, 10 000
-- points at about 0.1-0.3 s each) when cp.plan exists, on the slice BENCH_SWEEP_SHARD
-- (default 5/20: 500 of its points; the whole sweep takes about 20 min of CPU);
-- otherwise a plan-like function over all 10 000 points.
local top = bin:match("^(.*)/build[^/]*/[^/]+$") or "."
local function env(name)
  local v = os.getenv(name)
  return v ~= "" and v or nil
end
local file = env("BENCH_SWEEP_FILE")
local shard = env("BENCH_SWEEP_SHARD")
local what
if not file and cp.plan and cp.stages then
  file = top .. "/scripts/examples/sweep_tidewater.lua"
  shard = shard or "5/20"
  what = "the demo plan (scripts/examples/sweep_tidewater.lua)"
elseif file then
  what = file
else
  file = dir .. "/planlike.lua"
  what = "a plan-like function (about 0.3 ms of Lua per point; cp.plan is not available)"
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
local shard_opt = shard and (" --shard " .. shard) or ""
local suffix = shard and ("." .. shard:gsub("/", "-of-")) or ""
local best, cpu = {}, {}
-- 1 and 2 jobs alternate, so that a slow spell of the shared machine hits both alike
local reps = tonumber(env("BENCH_SWEEP_REPEATS") or (shard and "5" or "3"))
for _ = 1, reps do
  for _, jobs in ipairs { 1, 2 } do
    local rate, c = sweep(string.format("%s --jobs %d --out %s/tp%d.csv --force%s", file, jobs, dir, jobs, shard_opt))
    if rate > (best[jobs] or 0) then best[jobs], cpu[jobs] = rate, c end
  end
end
print(string.format("throughput, %s%s:", what, shard and (", slice " .. shard) or ", 10 000 points"))
print(string.format("  --jobs 1: %.2f points/s   --jobs 2: %.2f points/s   speed-up %.2fx (target >= 1.9x; best of %d)",
  best[1], best[2], best[2] / best[1], reps))
if cpu[1] and cpu[2] then
  -- the work is the same; if the 2-job run needs no more CPU than the 1-job run, a
  -- speed-up below 2 comes from cores taken by other processes, not from the sweep
  print(string.format("  CPU time: %.1f s with 1 job, %.1f s with 2 jobs (ratio %.2f); load average now %s",
    cpu[1], cpu[2], cpu[2] / cpu[1], (io.open("/proc/loadavg") and io.open("/proc/loadavg"):read("l") or "?")))
end
local same = os.execute(string.format("cmp -s %s/tp1%s.csv %s/tp2%s.csv", dir, suffix, dir, suffix))
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
if has_time then
  local rate, _, rss, text = sweep(string.format("%s/cheap.lua --jobs 2 --out %s/cheap.csv", dir, dir))
  print(string.format("memory, 10^6 points of a cheap function: peak RSS %.1f MB (target < 50 MB); %.0f points/s",
    (rss or 0) / 1024, rate))
else
  print("memory: /usr/bin/time is not installed; skipped")
end

-- 3. kill -9 mid-sweep, then --resume (on the slice / file of part 1).
local ok = os.execute(string.format([[
  cd %s && (%s sweep %s%s --jobs 2 --out killed.csv 2>/dev/null & pid=$!;
  for i in $(seq 1 3000); do [ -f killed%s.csv ] && [ $(wc -l < killed%s.csv) -ge %d ] && break; sleep 0.02; done;
  kill -9 $pid; wait $pid 2>/dev/null; echo "  killed after $(($(wc -l < killed%s.csv) - 1)) rows";
  %s sweep %s%s --jobs 2 --out killed.csv --resume 2>/dev/null; cmp -s killed%s.csv tp1%s.csv)]],
  dir, bin, file, shard_opt, suffix, suffix, shard and 30 or 2000, suffix, bin, file, shard_opt, suffix, suffix))
print("kill -9 then --resume equals the uninterrupted run: " .. tostring(ok == true))
os.execute("rm -rf " .. dir)
