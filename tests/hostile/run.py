"""Hostile input against a running Partwise service: seeded mutated requests over every route of its OpenAPI
document (read from the service, so a new route is covered), then raw HTTP with bogus Content-Length and other
malformed framing. Every answer must be below 500; every 4xx the application writes must be an RFC 9457 problem
document (application/problem+json with type, title and status); afterwards /healthz and each route's valid request
must still answer 2xx. Prints "N passed, N failed" (one check per request, plus the checks afterwards).

Usage: run.py [URL] (default $PARTWISE_URL or http://127.0.0.1:5080); PARTWISE_HOSTILE_SEED changes the seed.
Needs Debian's python3-requests.
"""
import json
import os
import random
import socket
import sys
import urllib.parse

import requests

SEED = int(os.environ.get("PARTWISE_HOSTILE_SEED", "20261202"))
LITERALS = ["1e308", "-1e308", "1.8e308", "-0", "-0.0", "1e-320", "4.9e-324", "1e-400", "1e99999", "-1e99999",
            "123456789012345678901234567890", "9223372036854775808", "NaN", "Infinity", "\"NaN\"", "null", "true", "\"\"",
            "\"x\"", "[]", "{}", "[[]]", "[null]", "\"\\ud800\"", "\"" + "w" * 5000 + "\"", "01", ".5", "+1", "0x10", "1e",
            "[" * 64 + "1" + "]" * 64, "{\"a\": " * 64 + "1" + "}" * 64]
BODIES = ["", "null", "[]", "{}", "\"text\"", "{", "{\"a\":", "{\"a\": 1,}", "{'a': 1}", "\u0000", "NaN",
          "[" * 10000 + "]" * 10000, "{\"a\": " * 10000 + "1" + "}" * 10000]
CONTENT_TYPES = ["text/plain", "application/xml", "application/x-www-form-urlencoded", "application/octet-stream",
                 "application/json; charset=utf-16", "application/json; charset=nonsense", "a/b", "text/csv; charset=utf-32", None]
ACCEPTS = ["application/xml", "image/png", "text/csv", "image/svg+xml", "*/*;q=0", "text/csv;q=2", "application/json;q=abc",
           ";;;", "a/b/c", "application/" + "x" * 4000]
IF_NONE_MATCH = ["\"", "W/", "*", "abc", "\"\"", "\"unterminated", "W/\"x\", ,", "\"" + "e" * 3000 + "\""]
# %00 is among the framing cases below: Kestrel refuses a null character in the path before the application runs.
PATH_IDS = ["x", "-1", "%20", "%2F", "..", "%2E%2E%2Fetc", "%E2%98%83", "%FF%FE", "%ZZ", "i" * 5000, "a;b", "a%0Ab"]
QUERY_VALUES = ["", "-1", "1e308", "1e-320", "NaN", "abc", "%ZZ", "%00", "%FF", "1,,2", "2147483648", "q" * 5000]
NAMED_QUERY = {"waitSeconds": ["-1", "31", "1e9", "0.5", "abc", "", "0"], "limit": ["0", "-1", "501", "abc", "1.5", "99999999999999999999"],
               "after": ["", "x", "====", "AAAA", "%FF%FE", "A" * 4000], "status": ["", "OPEN", "deleted", "%00", "any"]}
CSV_NUMBERS = ["1e308", "1.8e308", "-0", "1e-320", "1e99999", "NaN", "Infinity", "", "abc", "\"1,5\"", "0x10"]
METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"]


def nodes(value, path=()):
    """Every (path, value) below the root in document order."""
    children = value.items() if isinstance(value, dict) else enumerate(value) if isinstance(value, list) else []
    for key, child in children:
        yield path + (key,), child
        yield from nodes(child, path + (key,))


def replace(doc, path, raw):
    """The document as JSON text with the node at path replaced by raw JSON text."""
    copy = json.loads(json.dumps(doc))
    target = copy
    for key in path[:-1]:
        target = target[key]
    target[path[-1]] = "__hostile__"
    return json.dumps(copy).replace("\"__hostile__\"", raw, 1)


def edit(text, rng, alphabet):
    s = list(text)
    for _ in range(1 + rng.randrange(4)):
        if not s:
            break
        at = rng.randrange(len(s))
        op = rng.randrange(3)
        if op == 0:
            del s[at]
        elif op == 1:
            s.insert(at, rng.choice(alphabet))
        else:
            s[at] = rng.choice(alphabet)
    return "".join(s)


def routes_of(spec):
    for template, item in spec["paths"].items():
        for method, op in item.items():
            if method.upper() not in METHODS:
                continue
            content = op.get("requestBody", {}).get("content", {})
            example = content.get("application/json", {}).get("example")
            yield {"method": method.upper(), "template": template,
                   "query": [p["name"] for p in op.get("parameters", []) if p.get("in") == "query"],
                   "json": None if example is None else json.dumps(example),
                   "csv": content.get("text/csv", {}).get("example")}


def cases(route, path, mapped, rng):
    """(family, method, target, body bytes or None, content type or None, headers) for one route."""
    valid_body = route["json"].encode() if route["json"] else None
    valid_type = "application/json" if route["json"] else None
    def case(family, method=route["method"], target=path, body=valid_body, ctype=valid_type, headers=None):
        return (family, method, target, body, ctype, headers or {})
    for method in METHODS:
        if method not in mapped:
            yield case("method", method=method)
    if "{" in route["template"]:
        for pid in PATH_IDS:
            yield case("path-id", target=route["template"].split("{")[0] + pid + route["template"].split("}", 1)[1])
    for name in route["query"] + ["unknownParameter"]:
        for value in NAMED_QUERY.get(name) or rng.sample(QUERY_VALUES, 5):
            yield case("query", target=f"{path}?{name}={value}")
    for accept in ACCEPTS:
        yield case("accept", headers={"Accept": accept})
    if route["method"] == "GET":
        for tag in IF_NONE_MATCH:
            yield case("if-none-match", headers={"If-None-Match": tag})
    if route["json"]:
        doc = json.loads(route["json"])
        all_nodes = list(nodes(doc))
        for _ in range(25):
            yield case("json-edit", body=edit(route["json"], rng, "{}[],:\"0123456789.-+eE nulltrue").encode())
        for i in range(max(len(all_nodes), 30)):
            node_path = all_nodes[i % len(all_nodes)][0]
            yield case("json-value", body=replace(doc, node_path, rng.choice(LITERALS)).encode())
        for body in BODIES + ["\ufeff" + route["json"], route["json"] + "{}", route["json"][: len(route["json"]) // 2]]:
            yield case("json-whole", body=body.encode())
        yield case("json-bytes", body=bytes(rng.randrange(256) for _ in range(300)))
        arrays = [(p, v) for p, v in all_nodes if isinstance(v, list) and v]
        if arrays:
            p, v = max(arrays, key=lambda x: len(x[1]))
            yield case("json-large", body=replace(doc, p, json.dumps([v[0]] * 5000)).encode())
        if "parts" in doc and "rows" in doc:
            wide = dict(doc, parts=[f"p{i}" for i in range(1001)], rows=[[1.0 + i for i in range(1001)]])
            wide.pop("ids", None)
            yield case("json-large", body=json.dumps(wide).encode())
        if "sample" in doc:
            batch = {k: v for k, v in doc.items() if k != "sample"}
            batch["samples"] = [dict(doc["sample"], id=f"hostile-live-{i}") for i in range(1001)]
            yield case("json-large", body=json.dumps(batch).encode())
        for ctype in CONTENT_TYPES:
            yield case("content-type", ctype=ctype)
    if route["csv"]:
        csv = route["csv"]
        lines = csv.rstrip("\n").split("\n")
        last = lines[-1]
        shapes = ["\n".join(lines + [last.rsplit(",", 1)[0]]), "\n".join(lines + [last + ",9"]), "\n".join(lines + ["\"" + last]),
                  "\n".join(lines + ["\"a\nb\"," + last.split(",", 1)[1]]), "\ufeff" + csv, csv.replace(",", ";"), csv.replace(",", "\t"),
                  "", "\n", lines[0], ",", "\"", csv.replace("\n", "\r\n"), csv.replace("\n", "\r"), csv + "\u0000",
                  "\n".join(lines + [last + "9" * 100000])]
        for _ in range(15):
            shapes.append(edit(csv, rng, ",;\t\"\n\r0123456789.-eE abc\ufeff"))
        for number in CSV_NUMBERS:
            cells = last.split(",")
            cells[rng.randrange(1, len(cells))] = number
            shapes.append("\n".join(lines[:-1] + [",".join(cells)]))
        for body in shapes:
            yield case("csv", body=body.encode(), ctype="text/csv")
    if not route["json"] and not route["csv"]:
        for body in rng.sample(BODIES, 4):
            yield case("unexpected-body", body=body.encode(), ctype="application/json")


def problem_defect(status, ctype, text):
    if (ctype or "").split(";")[0].strip() != "application/problem+json":
        return f"{status} with Content-Type {ctype}: {text[:200]}"
    try:
        doc = json.loads(text)
    except ValueError:
        return f"{status} problem document that is not JSON: {text[:200]}"
    ok = isinstance(doc, dict) and isinstance(doc.get("type"), str) and doc["type"] and isinstance(doc.get("title"), str) \
        and doc["title"] and doc.get("status") == status
    return None if ok else f"{status} problem document without type, title or matching status: {text[:200]}"


def raw(host, port, data, half_close=True, timeout=10):
    """Sends raw bytes, returns the status of the first answer (0 for none) and the rest of it."""
    with socket.create_connection((host, port), timeout=timeout) as s:
        s.sendall(data)
        if half_close:
            s.shutdown(socket.SHUT_WR)
        answer = b""
        try:
            while chunk := s.recv(65536):
                answer += chunk
        except socket.timeout:
            pass
    head = answer.split(b"\r\n", 1)[0].decode("latin-1")
    parts = head.split(" ")
    return (int(parts[1]) if len(parts) > 1 and parts[1].isdigit() else 0), answer


def main():
    url = (sys.argv[1] if len(sys.argv) > 1 else os.environ.get("PARTWISE_URL", "http://127.0.0.1:5080")).rstrip("/")
    parsed = urllib.parse.urlsplit(url)
    session = requests.Session()
    spec = session.get(url + "/openapi/v1.json", timeout=30).json()
    # Operations routes the OpenAPI document does not describe get the cases that need no body example.
    routes = list(routes_of(spec)) + [{"method": "GET", "template": t, "query": [], "json": None, "csv": None}
                                      for t in ("/metrics", "/openapi/v1.json", "/docs/index.html") if t not in spec["paths"]]
    by_key = {(r["method"], r["template"]): r for r in routes}
    created = session.post(url + "/v1/baselines", data=by_key[("POST", "/v1/baselines")]["json"], headers={"Content-Type": "application/json"}, timeout=30)
    created.raise_for_status()
    baseline = created.json()["id"]
    far = {"sample": {"id": f"hostile-far-{SEED}", "values": {"Ca": 38.2, "Na": 315, "HCO3": 141.0, "Cl": 449}}}
    flag = session.post(f"{url}/v1/baselines/{baseline}/screenings", json=far, timeout=30).json()["results"][0]["flagId"] or "f-none"

    def fill(route):
        if route["method"] == "DELETE":
            ident = "b-0000000000000000"   # nothing the other cases need is deleted
        elif route["template"].startswith("/v1/flags/"):
            ident = flag
        else:
            ident = baseline
        t = route["template"]
        while "{" in t:
            t = t[: t.index("{")] + ident + t[t.index("}") + 1:]
        return t

    passed = failed = 0
    def record(ok, what):
        nonlocal passed, failed
        if ok:
            passed += 1
        else:
            failed += 1
            if failed <= 30:
                print("FAIL " + what)

    per_route = {}
    for route in routes:
        rng = random.Random(f"{SEED}:{route['method']} {route['template']}")
        mapped = {r["method"] for r in routes if r["template"] == route["template"]}
        path = fill(route)
        for family, method, target, body, ctype, headers in cases(route, path, mapped, rng):
            per_route[(route["method"], route["template"])] = per_route.get((route["method"], route["template"]), 0) + 1
            h = dict(headers)
            if ctype:
                h["Content-Type"] = ctype
            what = f"[{family}] {method} {target[:150]} ({ctype}) body {len(body or b'')} bytes: {(body or b'')[:150]!r}"
            try:
                r = session.request(method, url + target, data=body, headers=h, timeout=60)
            except requests.RequestException as e:
                record(False, f"no answer ({e.__class__.__name__}) to {what}")
                continue
            if r.status_code >= 500:
                record(False, f"{r.status_code} {r.text[:300]} to {what}")
            elif r.status_code >= 400 and (d := problem_defect(r.status_code, r.headers.get("Content-Type"), r.text)):
                record(False, f"{d} to {what}")
            else:
                record(True, what)

    for route in routes:
        record(per_route.get((route["method"], route["template"]), 0) >= 20, f"{route['method']} {route['template']} got fewer than 20 cases")

    # Framing the application never sees: Kestrel answers these itself (a 4xx without a body), or, for a body shorter
    # than its Content-Length, the application reads a truncated body. Only the status is checked here.
    host, port = parsed.hostname, parsed.port or 80
    body = by_key[("POST", "/v1/coordinates")]["json"].encode()
    def post(extra, payload, half_close=True):
        return b"POST /v1/coordinates HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\n" + extra + b"\r\n" + payload
    framing = {
        "Content-Length larger than the body": post(b"Content-Length: %d\r\n" % (len(body) + 100), body),
        "Content-Length smaller than the body": post(b"Content-Length: %d\r\n" % (len(body) // 2), body),
        "Content-Length not a number": post(b"Content-Length: abc\r\n", body),
        "Content-Length negative": post(b"Content-Length: -5\r\n", body),
        "Content-Length huge": post(b"Content-Length: 99999999999999999999\r\n", body),
        "two different Content-Lengths": post(b"Content-Length: 5\r\nContent-Length: %d\r\n" % len(body), body),
        "Content-Length and chunked": post(b"Content-Length: %d\r\nTransfer-Encoding: chunked\r\n" % len(body), body),
        "broken chunks": post(b"Transfer-Encoding: chunked\r\n", b"zz\r\n" + body + b"\r\n0\r\n\r\n"),
        "a null character in the path": b"GET /v1/baselines/%00 HTTP/1.1\r\nHost: x\r\n\r\n",
        "a 20 kB request line": b"GET /v1/flags?after=" + b"A" * 20000 + b" HTTP/1.1\r\nHost: x\r\n\r\n",
        "a 100 kB header": b"GET /healthz HTTP/1.1\r\nHost: x\r\nX-Big: " + b"h" * 100000 + b"\r\n\r\n",
        "no Host header": b"GET /healthz HTTP/1.1\r\n\r\n",
        "garbage": b"\x16\x03\x01\x02\x00\x01\x00\x01\xfc\x03\x03" + bytes(200),
    }
    for name, data in framing.items():
        try:
            status, answer = raw(host, port, data)
        except OSError as e:
            record(False, f"framing '{name}': {e}")
            continue
        record(status < 500, f"framing '{name}': status {status} {answer[:200]!r}")

    health = session.get(url + "/healthz", timeout=10)
    record(health.status_code == 200 and health.json().get("status") == "ok", f"/healthz after the hostile requests: {health.status_code}")
    for route in routes:
        if route["method"] == "DELETE":
            continue
        r = session.request(route["method"], url + fill(route), data=route["json"],
                            headers={"Content-Type": "application/json"} if route["json"] else {}, timeout=60)
        record(200 <= r.status_code < 300, f"valid {route['method']} {route['template']} after the hostile requests: {r.status_code} {r.text[:200]}")

    print(f"hostile: {len(routes)} routes, seed {SEED}")
    print(f"{passed} passed, {failed} failed")
    sys.exit(1 if failed else 0)


if __name__ == "__main__":
    main()
