#!/usr/bin/python3
"""A local HTTP server that answers with a script of (status, headers, body) and records every request.

Used by the clients' retry tests (Python: imported; R: run as a program). Binds 127.0.0.1 only.

    /usr/bin/python3 scripted_server.py PORT SCRIPT.json RECORD.json
serves the answers of SCRIPT.json ([{"status": 503, "headers": {...}, "body": {...} or "text"}, ...]) in order,
writes the requests seen to RECORD.json after each one ([{"method", "path", "headers", "body"}]), and exits once
the script is used up (or after 60 s), leaving RECORD.json.done once its port is closed.
"""
import http.server
import json
import sys
import threading


class Scripted(http.server.BaseHTTPRequestHandler):
    """Answers each request with the next entry of the server's script and records it."""

    def _answer(self):
        length = int(self.headers.get("Content-Length") or 0)
        body = self.rfile.read(length) if length else b""
        server = self.server
        server.seen.append({"method": self.command, "path": self.path, "headers": dict(self.headers), "body": body})
        status, headers, payload = server.script.pop(0) if server.script else (500, {}, b"script exhausted")
        self.send_response(status)
        for k, v in headers.items():
            self.send_header(k, v)
        data = payload if isinstance(payload, bytes) else json.dumps(payload).encode()
        self.send_header("Content-Length", str(len(data)))
        self.end_headers()
        self.wfile.write(data)
        if server.on_answer:
            server.on_answer(server)

    do_GET = do_POST = do_DELETE = _answer

    def log_message(self, *args):  # quiet
        pass


def serve(port):
    """A started ThreadingHTTPServer on 127.0.0.1:port with an empty `script` and `seen`."""
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), Scripted)
    server.script, server.seen, server.on_answer = [], [], None
    threading.Thread(target=server.serve_forever, daemon=True).start()
    return server


def main(port, script_path, record_path):
    with open(script_path, encoding="utf-8") as f:
        entries = json.load(f)
    server = serve(port)
    server.script[:] = [(e["status"], e.get("headers", {}), e["body"].encode() if isinstance(e.get("body"), str) else e.get("body", b""))
                        for e in entries]
    done = threading.Event()

    def record(s):
        seen = [dict(r, body=r["body"].decode("utf-8", "replace")) for r in s.seen]
        with open(record_path, "w", encoding="utf-8") as f:
            json.dump(seen, f)
        if not s.script:
            done.set()

    server.on_answer = record
    with open(record_path, "w", encoding="utf-8") as f:
        json.dump([], f)
    print("ready", flush=True)
    done.wait(60)
    server.shutdown()
    server.server_close()
    with open(record_path + ".done", "w", encoding="utf-8") as f:  # the port is free again
        f.write("done\n")


if __name__ == "__main__":
    main(int(sys.argv[1]), sys.argv[2], sys.argv[3])
