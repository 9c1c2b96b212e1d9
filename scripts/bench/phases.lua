-- The benchmark's load phases, for wrk (Debian's HTTP load generator, written in C like pgbench,
-- so the load itself takes little of the CPU the server and PostgreSQL share). scripts/bench/wrk.ts
-- runs it with one wrk thread and N connections, each sending its next request as soon as the
-- last one is answered.
--
-- Arguments after "--": phase, bearer tokens, a file of codes (one per line), station ids, open
-- batch ids (the lists comma separated, of one length), a nonce for this run, the expected
-- status, a random seed. Request n goes down lane n mod lanes: the lane's token (an assembler
-- signed in), station and batch — as many lanes as connections, so the requests in flight at
-- one time are of different assemblers at different stations, as on a floor.
-- Phases:
--   load     POST /api/stations/<station>/load of each code in the file in turn (fresh sealed
--            containers) onto the lane's batch, each with its own Idempotency-Key
--   lookup   POST /api/scans/resolve of a random code from the file
--   reading  POST /api/readings in four areas
--   echo     POST /echo (the bare Express app)
--   ceiling-load, ceiling-lookup, ceiling-reading: the bare Express app's own routes with the
--            same bodies (its "tokens" are the lanes' user ids)
-- Every answer whose status is not the expected one is counted; the first is kept.

local threads = {}

function setup(thread)
  table.insert(threads, thread)
end

function init(args)
  phase = args[1]
  auths = {}
  for t in string.gmatch(args[2], '[^,]+') do
    auths[#auths + 1] = 'Bearer ' .. t
  end
  codes = {}
  ncodes = 0
  for line in io.lines(args[3]) do
    if line ~= '' then
      ncodes = ncodes + 1
      codes[ncodes] = line
    end
  end
  stations = {}
  for st in string.gmatch(args[4], '[^,]+') do
    stations[#stations + 1] = st
  end
  batches = {}
  for b in string.gmatch(args[5], '[^,]+') do
    batches[#batches + 1] = b
  end
  nonce = args[6]
  expected = tonumber(args[7])
  math.randomseed(tonumber(args[8]))
  issued = 0
  bad = 0
  firstBad = ''
end

local function lane(list)
  return list[(issued % #list) + 1]
end

local function post(path, body, extra)
  local headers = { ['Content-Type'] = 'application/json', ['Authorization'] = lane(auths) }
  if extra then
    for k, v in pairs(extra) do
      headers[k] = v
    end
  end
  return wrk.format('POST', path, headers, body)
end

local function readingBody()
  return string.format('{"area":"bench hall %d","at":"%s","tempC":21.5,"rhPct":45}', issued % 4, os.date('!%Y-%m-%dT%H:%M:%SZ'))
end

function request()
  issued = issued + 1
  if phase == 'load' or phase == 'ceiling-load' then
    -- wrk.ts writes more codes than the phase can use; past the end the server refuses (counted).
    local code = codes[issued] or 'TLC-OUT-OF-CODES'
    local prefix = phase == 'load' and '/api' or '/ceiling'
    return post(prefix .. '/stations/' .. lane(stations) .. '/load', string.format('{"batchId":"%s","containerCode":"%s"}', lane(batches), code),
      { ['Idempotency-Key'] = string.format('%s-%d', nonce, issued) })
  elseif phase == 'lookup' then
    return post('/api/scans/resolve', string.format('{"code":"%s"}', codes[math.random(ncodes)]))
  elseif phase == 'ceiling-lookup' then
    return post('/ceiling/lookup', string.format('{"code":"%s"}', codes[math.random(ncodes)]))
  elseif phase == 'reading' then
    return post('/api/readings', readingBody())
  elseif phase == 'ceiling-reading' then
    return post('/ceiling/reading', readingBody())
  else
    return post('/echo', '{"code":"TLC-00000000"}')
  end
end

function response(status, headers, body)
  if status ~= expected then
    bad = bad + 1
    if firstBad == '' then
      firstBad = status .. ' ' .. string.sub(body or '', 1, 300)
    end
  end
end

function done(summary, latency, requests)
  local allIssued, allBad, first = 0, 0, ''
  for _, t in ipairs(threads) do
    allIssued = allIssued + t:get('issued')
    allBad = allBad + t:get('bad')
    if first == '' then
      first = t:get('firstBad')
    end
  end
  local e = summary.errors
  io.write(string.format('wrk-result %d %d %d %.0f %.0f %d %d\n', summary.requests, summary.duration, allIssued,
    latency:percentile(50), latency:percentile(99), allBad, e.connect + e.read + e.write + e.timeout))
  io.write('wrk-first-bad ' .. string.gsub(first, '[\r\n]', ' ') .. '\n')
end
