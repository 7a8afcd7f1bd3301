-- One sample per request, each under a new id, so that every request screens and commits a new screening
-- (a repeated id would measure the cheaper duplicate path). Values: the first 2026 sample of the invented well-11.
local counter = 0
local prefix = os.getenv("PARTWISE_LOAD_PREFIX") or tostring(os.time())

-- Each wrk thread has its own Lua state and counter: setup gives each thread its own number for the ids.
local threads = 0
function setup(thread)
    threads = threads + 1
    thread:set("tid", threads)
end

wrk.method = "POST"
wrk.headers["Content-Type"] = "application/json"

request = function()
    counter = counter + 1
    local body = '{"sample": {"id": "load-' .. prefix .. '-' .. tostring(tid or 0) .. '-' .. counter .. '", "values": {"Ca": 38.76, "Mg": 9.83, ' ..
        '"Na": 20.16, "K": 2.12, "HCO3": 151.04, "Cl": 27.26, "SO4": 24.45, "NO3": 2.69}, "source": "load-test"}}'
    return wrk.format(nil, wrk.path, nil, body)
end

response = function(status, headers, body)
    if status ~= 200 then
        io.stderr:write("unexpected status " .. status .. ": " .. body .. "\n")
    end
end
