"""Posts single screenings for a fixed time, through a database outage, recording what each answer was.

Usage: stream.py URL BASELINE_ID PREFIX ACK_FILE ANSWERS_FILE SECONDS [WORKERS] [START]

START is the Unix time the caller counts from (default: now), so that its times and these agree.

Every 2xx answer is appended to ACK_FILE (one JSON line: id, values, distance, flagId, as tests/crash/verify.py
reads it) and flushed before the next request. Every answer is appended to ANSWERS_FILE as one JSON line: t and done (seconds
since the start when the request was sent and when it was answered), status, type (the problem type of a non-2xx answer, or null), problem (true when the answer was an
RFC 9457 problem document with type, title and a matching status). Samples are new ids; a sample refused with a 503
is retried under a new id, so a refused screening is never confused with an acknowledged one.
"""
import json
import math
import sys
import threading
import time

import requests


def values(w, k):
    far = 4.0 if k % 10 == 0 else 1.0
    return {"a": round(2.0 + 0.3 * math.sin(k + w) * far, 6), "b": round(2.0 + 0.2 * math.cos(k * 1.3), 6), "c": round(2.5 / far + 0.1 * math.sin(w + 2 * k), 6)}


def is_problem(r):
    if r.headers.get("Content-Type", "").split(";")[0] != "application/problem+json":
        return False, None
    try:
        doc = r.json()
    except ValueError:
        return False, None
    ok = isinstance(doc, dict) and bool(doc.get("type")) and bool(doc.get("title")) and doc.get("status") == r.status_code
    return ok, doc.get("type") if isinstance(doc, dict) else None


def worker(url, baseline, prefix, w, ack, answers, lock, start, seconds):
    session = requests.Session()
    k = 0
    while time.time() - start < seconds:
        sample_id = f"{prefix}-{w}-{k}"
        k += 1
        body = {"sample": {"id": sample_id, "values": values(w, k), "source": "outage-test"}}
        t = time.time() - start
        try:
            r = session.post(f"{url}/v1/baselines/{baseline}/screenings", json=body, timeout=15)
        except requests.RequestException as e:
            with lock:
                answers.write(json.dumps({"t": round(t, 2), "status": 0, "type": e.__class__.__name__, "problem": False}) + "\n")
            time.sleep(0.2)
            continue
        if 200 <= r.status_code < 300:
            result = r.json()["results"][0]
            line = json.dumps({"id": sample_id, "values": body["sample"]["values"], "distance": result["distance"], "flagId": result["flagId"]})
            record = {"t": round(t, 2), "done": round(time.time() - start, 2), "status": r.status_code, "type": None, "problem": False}
        else:
            line = None
            ok, kind = is_problem(r)
            record = {"t": round(t, 2), "done": round(time.time() - start, 2), "status": r.status_code, "type": kind, "problem": ok}
        with lock:
            if line:
                ack.write(line + "\n")
                ack.flush()
            answers.write(json.dumps(record) + "\n")
        if r.status_code == 503:
            time.sleep(0.1)


def main():
    url, baseline, prefix, ack_path, answers_path, seconds = sys.argv[1:7]
    workers = int(sys.argv[7]) if len(sys.argv) > 7 else 4
    lock = threading.Lock()
    start = float(sys.argv[8]) if len(sys.argv) > 8 else time.time()
    with open(ack_path, "a", encoding="utf-8") as ack, open(answers_path, "a", encoding="utf-8") as answers:
        threads = [threading.Thread(target=worker, args=(url, baseline, prefix, w, ack, answers, lock, start, float(seconds))) for w in range(workers)]
        for t in threads:
            t.start()
        for t in threads:
            t.join()


if __name__ == "__main__":
    main()
