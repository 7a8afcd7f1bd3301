#!/usr/bin/python3
"""An instrument feed: posts each sample of an instrument's CSV export as it "arrives" and prints what comes back.

    /usr/bin/python3 src/clients/python/examples/instrument_feed.py demo/well-11-instrument.csv
    /usr/bin/python3 src/clients/python/examples/instrument_feed.py demo/well-11-instrument.csv --interval 0 --url http://127.0.0.1:5080

The CSV has a header `sample,taken_at,instrument,<part>,...` and one line per sample in time order; a value below
its detection limit is written `<limit` (for example `<0.05`) and sent as 0, for the baseline's zero policy to
replace. Each sample is screened against a stored baseline (default: the one named "well-11 2025", created from
demo/well-11-baseline.json when the service has none of that name) with the client's retries: connection errors,
503 and 429 are retried with backoff, which is safe because the sample id makes screening idempotent (a sample
sent twice comes back as a duplicate, not as a second flag). Every result is printed, flags with their reasons.

Flags are statistical signals for a qualified analyst to review, not decisions: where water is used for drinking,
accredited methods, local regulation and licensed practice decide.
"""
import argparse
import csv
import json
import pathlib
import sys
import time

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parents[3]
sys.path.insert(0, str(HERE.parent))  # partwise_client from its source directory

from partwise_client import Client, PartwiseError, RetryPolicy  # noqa: E402

META = ("sample", "taken_at", "instrument")


def read_feed(path):
    """The samples of an instrument export, in file order: {"id", "values", "observedAt", "source"} each."""
    with open(path, newline="", encoding="utf-8") as f:
        for line, row in enumerate(csv.DictReader(f), start=2):
            values = {}
            for part, text in row.items():
                if part in META:
                    continue
                text = text.strip()
                try:
                    values[part] = 0.0 if text.startswith("<") else float(text)  # below detection: a zero to replace
                except ValueError:
                    raise SystemExit(f"{path}:{line}: '{text}' in column {part} is not a number")
            yield {"id": row["sample"], "values": values, "observedAt": row["taken_at"], "source": row["instrument"]}


def find_or_create_baseline(pw, name, body_path):
    """The id of the newest baseline named `name`; created from the JSON body at `body_path` when there is none."""
    found = pw.find_baseline(name)
    if found:
        return found["id"]
    with open(body_path, encoding="utf-8") as f:
        body = json.load(f)
    if body.get("name") != name:
        raise SystemExit(f"no baseline named '{name}' and {body_path} makes '{body.get('name')}'")
    options = {k: body[k] for k in ("description", "zeros", "coordinates", "scatter", "cutoff", "rules", "amalgamations") if k in body}
    created = pw.create_baseline(body, name, **options)
    print(f"created baseline '{name}' ({created['id']}) from {body_path}")
    return created["id"]


def describe(result, top):
    """One line for a screening result; a flag's reasons follow with their expected central 95% ranges."""
    head = (f"{'FLAG' if result['flagged'] else 'ok  '} {result['sampleId']}  distance {result['distance']:.3f}"
            f"  p {result['pValue']:.3g}" + ("  (already screened)" if result.get("duplicate") else ""))
    lines = [head]
    if result["flagged"]:
        for reason in result["reasons"][:top]:
            low, high = reason["expected"]
            lines.append(f"       {reason['label']:<12} {reason['value']:.4g}  expected {low:.4g} to {high:.4g}  (z {reason['z']:+.2f})")
        for rule in result.get("ruleViolations", []):
            bounds = " ".join(f"{k} {rule[k]:.4g}" for k in ("min", "max") if rule.get(k) is not None)
            lines.append(f"       rule {rule['label']}: {rule['value']:.4g} outside {bounds}")
    return "\n".join(lines)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("csv", help="the instrument's CSV export (sample,taken_at,instrument,parts...)")
    parser.add_argument("--url", default=None, help="the service (default $PARTWISE_URL or http://127.0.0.1:5080)")
    parser.add_argument("--key", default=None, help="API key sent as a bearer token (default $PARTWISE_KEY)")
    parser.add_argument("--baseline", default="well-11 2025", help="the stored baseline's name")
    parser.add_argument("--baseline-body", default=str(ROOT / "demo" / "well-11-baseline.json"),
                        help="the JSON body to create the baseline from when none of that name is stored")
    parser.add_argument("--interval", type=float, default=0.2, help="seconds between samples, as they arrive (default 0.2)")
    parser.add_argument("--attempts", type=int, default=6, help="tries per sample on connection errors, 503 and 429")
    parser.add_argument("--top", type=int, default=3, help="reasons printed per flag")
    args = parser.parse_args(argv)

    pw = Client(args.url, api_key=args.key, retry=RetryPolicy(attempts=args.attempts, backoff=0.5, max_delay=20))
    try:
        baseline_id = find_or_create_baseline(pw, args.baseline, args.baseline_body)
    except PartwiseError as e:
        print(f"cannot get the baseline: {e}", file=sys.stderr)
        return 2
    print(f"screening {args.csv} against '{args.baseline}' ({baseline_id}) on {pw.url}")
    screened = flagged = 0
    for k, sample in enumerate(read_feed(args.csv)):
        if k and args.interval > 0:
            time.sleep(args.interval)  # the next sample "arrives"
        try:
            result = pw.screen(baseline_id, [sample])[0]
        except PartwiseError as e:  # a 4xx about this sample (a 409: the same id with other values): report, go on
            print(f"ERR  {sample['id']}: {e}", flush=True)
            continue
        screened += 1
        flagged += bool(result["flagged"])
        print(describe(result, args.top), flush=True)
    print(f"{screened} samples screened, {flagged} flagged (signals for review, not decisions)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
