#!/usr/bin/python3
"""Runs the Python client's tests against a running Partwise service.

Usage (from the repository root): /usr/bin/python3 src/clients/python/tests/run.py
The service's address comes from PARTWISE_URL (default http://127.0.0.1:5080). Needs Debian's python3-requests,
python3-numpy and python3-pandas; the package is imported from its source directory (no install step).
Prints one line per test and a final line "N passed, N failed"; exits 1 when any failed or none ran.
"""
import pathlib
import sys
import unittest

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))  # partwise_client from its source directory
sys.path.insert(0, str(HERE))


class CountingResult(unittest.TextTestResult):
    """Prints PASS/FAIL per test, as tests/reference/run.py does."""

    def addSuccess(self, test):
        super().addSuccess(test)
        self.stream.writeln(f"PASS  {test.id()}")

    def addFailure(self, test, err):
        super().addFailure(test, err)
        self.stream.writeln(f"FAIL  {test.id()}\n{self._exc_info_to_string(err, test)}")

    def addError(self, test, err):
        super().addError(test, err)
        self.stream.writeln(f"FAIL  {test.id()} (error)\n{self._exc_info_to_string(err, test)}")

    def addSkip(self, test, reason):
        super().addSkip(test, reason)
        self.stream.writeln(f"SKIP  {test.id()}: {reason}")


def main():
    suite = unittest.defaultTestLoader.discover(str(HERE), pattern="test_*.py", top_level_dir=str(HERE))
    runner = unittest.TextTestRunner(resultclass=CountingResult, verbosity=0, stream=sys.stdout)
    result = runner.run(suite)
    failed = len(result.failures) + len(result.errors)
    passed = result.testsRun - failed - len(result.skipped)
    print(f"{passed} passed, {failed} failed" + (f", {len(result.skipped)} skipped" if result.skipped else ""))
    return 0 if failed == 0 and passed > 0 else 1


if __name__ == "__main__":
    sys.exit(main())
