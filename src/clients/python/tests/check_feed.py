#!/usr/bin/python3
"""Runs the instrument feed example (examples/instrument_feed.py) against a running service and checks its output.

Usage (from the repository root): /usr/bin/python3 src/clients/python/tests/check_feed.py
The service comes from PARTWISE_URL (default http://127.0.0.1:5080). Each run uses a baseline of its own name
(created from demo/well-11-baseline.json), so the checks do not depend on what the store holds already.
Prints PASS/FAIL per check and "N passed, N failed"; exits 1 when any failed.
"""
import csv
import json
import os
import pathlib
import re
import subprocess
import sys
import tempfile
import time
import uuid

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parents[3]
sys.path.insert(0, str(HERE.parent))
from partwise_client import Client  # noqa: E402

URL = os.environ.get("PARTWISE_URL", "http://127.0.0.1:5080")
FEED = ROOT / "demo" / "well-11-instrument.csv"
LINE = re.compile(r"^(FLAG|ok  ) (\S+)  distance ([0-9.]+)  p (\S+)( +\(already screened\))?$")


def run_feed(body_path, name, interval):
    started = time.monotonic()
    done = subprocess.run([sys.executable, str(ROOT / "src/clients/python/examples/instrument_feed.py"), str(FEED),
                           "--url", URL, "--baseline", name, "--baseline-body", body_path, "--interval", str(interval)],
                          capture_output=True, text=True, timeout=300)
    return done, time.monotonic() - started


def main():
    name = f"well-11 2025 feed-check {uuid.uuid4().hex[:8]}"
    with open(ROOT / "demo" / "well-11-baseline.json", encoding="utf-8") as f:
        body = json.load(f)
    body["name"] = name
    tmp = tempfile.NamedTemporaryFile("w", suffix=".json", delete=False)
    json.dump(body, tmp)
    tmp.close()
    with open(FEED, newline="", encoding="utf-8") as f:
        expected_ids = [row["sample"] for row in csv.DictReader(f)]
    interval = 0.02
    first, elapsed = run_feed(tmp.name, name, interval)
    second, _ = run_feed(tmp.name, name, 0)
    os.unlink(tmp.name)
    results = [LINE.match(line) for line in first.stdout.splitlines()]
    results = [m for m in results if m]
    again = [m for m in (LINE.match(line) for line in second.stdout.splitlines()) if m]
    flagged = [m.group(2) for m in results if m.group(1) == "FLAG"]
    checks = []

    def check(what, ok, detail=""):
        checks.append(ok)
        print(f"{'PASS' if ok else 'FAIL'}  feed: {what}" + ("" if ok else f"\n{detail}"))

    check("the example exits 0 and creates its baseline", first.returncode == 0 and "created baseline" in first.stdout,
          first.stdout[-2000:] + first.stderr[-2000:])
    check("one result line per sample, in the file's order", [m.group(2) for m in results] == expected_ids,
          first.stdout[-2000:])
    check("samples arrive at the interval", elapsed >= interval * (len(expected_ids) - 1), f"{elapsed:.2f} s")
    check("the drifting well's last samples are flagged", set(expected_ids[-5:]) <= set(flagged), str(flagged))
    check("each flag prints reasons with expected ranges",
          first.stdout.count(" expected ") >= len(flagged) and all(0 <= float(m.group(4)) <= 1 for m in results),
          first.stdout[-2000:])
    check("a second run is idempotent: every sample a duplicate with the same distance",
          second.returncode == 0 and len(again) == len(results) and all(a.group(5) for a in again)
          and [a.group(3) for a in again] == [m.group(3) for m in results], second.stdout[-2000:])
    pw = Client(URL)
    baseline_id = pw.find_baseline(name)["id"]
    flags = list(pw.iter_flags(baseline=baseline_id, status="any"))
    check("one stored flag per flagged sample, none doubled by the second run",
          sorted(f["sampleId"] for f in flags) == sorted(flagged), f"{len(flags)} flags for {len(flagged)} flagged samples")
    pw.retire_baseline(baseline_id)
    passed = sum(checks)
    print(f"{passed} passed, {len(checks) - passed} failed")
    return 0 if passed == len(checks) else 1


if __name__ == "__main__":
    sys.exit(main())
