"""Posts single screenings to a Partwise service until it stops answering, recording every acknowledged one.

Usage: stream.py URL BASELINE_ID PREFIX ACK_FILE [WORKERS]

Each worker posts samples PREFIX-w-k with values derived from (w, k), one request at a time. Every 2xx answer is
appended to ACK_FILE (one JSON line: id, values, distance, flagId) and flushed before the next request, so the file
holds exactly the screenings the service said it stored. Stops after 3 consecutive connection failures.
"""
import json
import math
import sys
import threading

import requests


def values(w, k):
    # Invented values around the crash baseline's reference samples; every tenth one far out, so some raise flags.
    far = 4.0 if k % 10 == 0 else 1.0
    return {"a": round(2.0 + 0.3 * math.sin(k + w) * far, 6), "b": round(2.0 + 0.2 * math.cos(k * 1.3), 6), "c": round(2.5 / far + 0.1 * math.sin(w + 2 * k), 6)}


def worker(url, baseline, prefix, w, out, lock):
    session = requests.Session()
    failures = 0
    k = 0
    while failures < 3:
        sample_id = f"{prefix}-{w}-{k}"
        body = {"sample": {"id": sample_id, "values": values(w, k), "source": "crash-test"}}
        try:
            r = session.post(f"{url}/v1/baselines/{baseline}/screenings", json=body, timeout=10)
        except requests.RequestException:
            failures += 1
            continue
        failures = 0
        if 200 <= r.status_code < 300:
            result = r.json()["results"][0]
            line = json.dumps({"id": sample_id, "values": body["sample"]["values"], "distance": result["distance"], "flagId": result["flagId"]})
            with lock:
                out.write(line + "\n")
                out.flush()
        k += 1


def main():
    url, baseline, prefix, ack = sys.argv[1:5]
    workers = int(sys.argv[5]) if len(sys.argv) > 5 else 4
    lock = threading.Lock()
    with open(ack, "a", encoding="utf-8") as out:
        threads = [threading.Thread(target=worker, args=(url, baseline, prefix, w, out, lock)) for w in range(workers)]
        for t in threads:
            t.start()
        for t in threads:
            t.join()


if __name__ == "__main__":
    main()
