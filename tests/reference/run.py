#!/usr/bin/python3
"""Runs every reference check against a running Partwise service.

Usage: /usr/bin/python3 tests/reference/run.py      (service URL from PARTWISE_URL, default http://127.0.0.1:5080)

Imports every module check_*.py beside this file and calls every function named check_* defined in it with the
base URL. Prints one line per check and a final line "N passed, N failed"; exits 1 when any check failed or when no
check ran at all.
"""
import importlib
import inspect
import os
import pathlib
import sys
import time
import traceback

HERE = pathlib.Path(__file__).resolve().parent


def discover():
    """(name, function) of every check, modules in file-name order, checks in source order."""
    sys.path.insert(0, str(HERE))
    found = []
    for path in sorted(HERE.glob("check_*.py")):
        name = path.stem
        try:
            module = importlib.import_module(name)
        except Exception:  # an unimportable module is one failed check, not a crash of the runner
            found.append((name, None, traceback.format_exc(limit=3)))
            continue
        checks = [
            (fname, fn)
            for fname, fn in inspect.getmembers(module, inspect.isfunction)
            if fname.startswith("check_") and fn.__module__ == module.__name__
        ]
        checks.sort(key=lambda item: item[1].__code__.co_firstlineno)
        found.extend((f"{name}.{fname}", fn, None) for fname, fn in checks)
    return found


def main():
    base = os.environ.get("PARTWISE_URL", "http://127.0.0.1:5080").rstrip("/")
    only = sys.argv[1:]  # optional substrings to select checks
    print(f"reference checks against {base}")
    try:
        import requests
        requests.get(base + "/healthz", timeout=10).raise_for_status()
    except Exception as ex:  # the checks still run, and fail, so the count says what happened
        print(f"note: {base}/healthz does not answer ({type(ex).__name__}); is the service running?")
    passed = failed = 0
    for name, fn, import_error in discover():
        if only and not any(o in name for o in only):
            continue
        if fn is None:
            failed += 1
            print(f"FAIL  {name}: cannot import\n{import_error}")
            continue
        started = time.monotonic()
        try:
            fn(base)
        except Exception as ex:  # every failure is reported and counted; the run goes on
            failed += 1
            detail = (str(ex) or type(ex).__name__).replace("\n", " ")
            if len(detail) > 600:
                detail = detail[:600] + " ..."
            where = traceback.extract_tb(ex.__traceback__)[-1]
            print(f"FAIL  {name}: {type(ex).__name__}: {detail}  [{pathlib.Path(where.filename).name}:{where.lineno}]")
            continue
        passed += 1
        print(f"ok    {name}  ({time.monotonic() - started:.2f} s)")
    print(f"{passed} passed, {failed} failed")
    return 1 if failed or passed + failed == 0 else 0


if __name__ == "__main__":
    sys.exit(main())
