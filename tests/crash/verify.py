"""Checks that every acknowledged screening survived: re-posts each one and expects duplicate: true with the same
distance and flag id. Prints "N passed, N failed" (one check per acknowledged screening, plus one for the baseline).

Usage: verify.py URL BASELINE_ID ACK_FILE
"""
import json
import sys

import requests


def main():
    url, baseline, ack = sys.argv[1:4]
    session = requests.Session()
    passed = failed = 0
    r = session.get(f"{url}/v1/baselines/{baseline}", timeout=10)
    if r.status_code == 200:
        passed += 1
    else:
        failed += 1
        print(f"FAIL the baseline {baseline} is gone after the restart: {r.status_code}")
    with open(ack, encoding="utf-8") as f:
        acked = [json.loads(line) for line in f if line.strip()]
    for a in acked:
        body = {"sample": {"id": a["id"], "values": a["values"], "source": "crash-test"}}
        r = session.post(f"{url}/v1/baselines/{baseline}/screenings", json=body, timeout=10)
        ok = r.status_code == 200
        if ok:
            result = r.json()["results"][0]
            ok = result["duplicate"] is True and result["distance"] == a["distance"] and result["flagId"] == a["flagId"]
        if ok:
            passed += 1
        else:
            failed += 1
            print(f"FAIL {a['id']}: acknowledged before the kill, after the restart {r.status_code} {r.text[:300]}")
    print(f"{passed} passed, {failed} failed")
    sys.exit(1 if failed else 0)


if __name__ == "__main__":
    main()
