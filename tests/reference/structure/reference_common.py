"""Shared plumbing for the structure reference scripts: module checks and running dump_geometry.

Run with Debian's /usr/bin/python3. A missing module fails the test naming the Debian package:
these checks never skip.
"""

import importlib
import json
import os
import subprocess
import sys
import tempfile

DEBIAN_PACKAGES = {"numpy": "python3-numpy", "ase": "python3-ase", "pymatgen": "python3-pymatgen"}


def require(module):
    try:
        return importlib.import_module(module)
    except ImportError as error:
        sys.stderr.write("%s cannot import %s (%s). Install Debian's %s "
                         "(apt-get install %s); this reference check does not skip.\n"
                         % (sys.executable, module, error, DEBIAN_PACKAGES[module.split(".")[0]],
                            DEBIAN_PACKAGES[module.split(".")[0]]))
        sys.exit(2)


def run_dump(binary, args):
    result = subprocess.run([binary] + args, capture_output=True, text=True)
    if result.returncode != 0:
        sys.stderr.write("dump_geometry failed: %s\n" % result.stderr)
        sys.exit(1)
    return json.loads(result.stdout)


def dump_cases(binary, cases):
    """cases: list of (kind, name, lattice 3x3, numbers, frac Nx3, parameter)."""
    lines = [str(len(cases))]
    for kind, name, lattice, numbers, frac, parameter in cases:
        lines.append("%s %s" % (kind, name))
        lines.append(" ".join(repr(float(x)) for x in lattice.reshape(-1)))
        lines.append(str(len(numbers)))
        for z, f in zip(numbers, frac):
            lines.append("%d %s" % (z, " ".join(repr(float(x)) for x in f)))
        lines.append(repr(float(parameter)))
    with tempfile.NamedTemporaryFile("w", suffix=".txt", delete=False) as handle:
        handle.write("\n".join(lines) + "\n")
        path = handle.name
    try:
        return run_dump(binary, [path])
    finally:
        os.unlink(path)


class Failures:
    def __init__(self):
        self.messages = []

    def check(self, ok, message):
        if not ok:
            self.messages.append(message)
            print("MISMATCH: " + message)

    def finish(self, name):
        if self.messages:
            print("%s: %d mismatches" % (name, len(self.messages)))
            sys.exit(1)
        print("%s: all checks passed" % name)
