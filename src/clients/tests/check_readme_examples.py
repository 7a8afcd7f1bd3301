#!/usr/bin/python3
"""Runs the README's Python and R examples exactly as written there and checks that they print the same lines.

Usage (from the repository root): /usr/bin/python3 src/clients/tests/check_readme_examples.py
The examples are the fenced code blocks between `<!-- readme-example: python -->` and `<!-- /readme-example: python -->`
(and the same for `r`) in README.md; they run from the repository root with PARTWISE_URL passed on (the examples
default to http://127.0.0.1:5080). Needs python3-requests, python3-pandas, r-base-core, r-cran-httr, r-cran-jsonlite.
Prints PASS/FAIL per check and "N passed, N failed"; exits 1 when any failed.
"""
import pathlib
import re
import subprocess
import sys
import tempfile

ROOT = pathlib.Path(__file__).resolve().parents[3]


def example(readme, language):
    """The code of the one fenced block between the language's markers."""
    pattern = (rf"<!-- readme-example: {language} -->\s*```{language}\n(.*?)```\s*<!-- /readme-example: {language} -->")
    found = re.findall(pattern, readme, flags=re.S)
    if len(found) != 1:
        raise SystemExit(f"README.md has {len(found)} marked {language} examples, expected 1")
    return found[0]


def run(command, code, suffix):
    with tempfile.NamedTemporaryFile("w", suffix=suffix, delete=False, encoding="utf-8") as f:
        f.write(code)
    try:
        return subprocess.run(command + [f.name], cwd=ROOT, capture_output=True, text=True, timeout=300)
    finally:
        pathlib.Path(f.name).unlink()


def main():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    python = run(["/usr/bin/python3"], example(readme, "python"), ".py")
    r = run(["Rscript"], example(readme, "r"), ".R")
    checks = []

    def check(what, ok, detail=""):
        checks.append(ok)
        print(f"{'PASS' if ok else 'FAIL'}  readme examples: {what}" + ("" if ok else f"\n{detail}"))

    check("the Python example runs", python.returncode == 0, python.stdout[-2000:] + python.stderr[-3000:])
    check("the R example runs", r.returncode == 0, r.stdout[-2000:] + r.stderr[-3000:])
    lines = python.stdout.splitlines()
    number = r"-?\d+\.\d{6}"
    shaped = (len(lines) >= 5 and lines[0].startswith("id clr(Ca) ")
              and all(re.fullmatch(rf"\S+( {number}){{8}}", line) for line in lines[1:4])
              and all(re.fullmatch(rf"\S+ {number}", line) for line in lines[4:]))
    check("the output is the header, 3 rows of 8 clr coordinates and the chosen ratios", shaped, python.stdout)
    check("Python and R print the same lines", python.stdout == r.stdout and bool(lines),
          "python:\n" + python.stdout + "\nR:\n" + r.stdout)
    passed = sum(checks)
    print(f"{passed} passed, {len(checks) - passed} failed")
    return 0 if passed == len(checks) else 1


if __name__ == "__main__":
    sys.exit(main())
