#!/usr/bin/python3
"""Cross-check of nucleate's symmetry results with Debian's python3-spglib and python3-pymatgen.

Usage: /usr/bin/python3 symmetry_spglib_reference.py (DUMP_BINARY [SEED] | DUMP.json)

dump_symmetry prints the structures it analysed (exact doubles) and nucleate's results. Here the
same structures go through python3-spglib (the Python binding of the spglib C library, a separate
path from nucleate's wrapper: its own row/column conversion, buffers and copying) and
pymatgen's SpacegroupAnalyzer, and every field must agree:
  - number, Hall number, international symbol, Wyckoff letters, equivalent atoms, operation count,
    primitive cell volume (spglib.get_symmetry_dataset);
  - the idealised primitive and conventional cells (spglib.standardize_cell);
  - the Niggli-reduced lattice (spglib.niggli_reduce);
  - the crystal system (pymatgen SpacegroupAnalyzer.get_crystal_system, which derives it from the
    number independently of nucleate's table);
  - where nucleate raised an error, spglib must also have found nothing.
Exits non-zero with one line per mismatch. Run with Debian's /usr/bin/python3.
"""

import json
import subprocess
import sys


def require(module, package):
    try:
        return __import__(module)
    except ImportError:
        sys.stderr.write(
            "symmetry_spglib_reference: %s cannot be imported by %s. Install Debian's %s "
            "(apt-get install %s); this reference check does not skip.\n"
            % (module, sys.executable, package, package))
        sys.exit(2)


np = require("numpy", "python3-numpy")
spglib = require("spglib", "python3-spglib")
require("pymatgen", "python3-pymatgen")
from pymatgen.core import Lattice, Structure  # noqa: E402
from pymatgen.symmetry.analyzer import SpacegroupAnalyzer  # noqa: E402

VOLUME_RTOL = 1e-9
CELL_ATOL = 1e-8  # angstrom / fractional: same library, same input doubles

failures = []
counts = {"cases": 0, "agreed": 0, "errors_both": 0, "fields_compared": 0}


def fail(case, message):
    failures.append("%s: %s" % (case["name"], message))
    print("MISMATCH %s: %s" % (case["name"], message))


def as_cell(cell):
    return (np.array(cell["lattice"], dtype=float), np.array(cell["positions"], dtype=float),
            np.array(cell["numbers"], dtype=int))


def same_cell(case, what, ours, theirs):
    lattice, positions, numbers = theirs
    ok = True
    if len(numbers) != len(ours["numbers"]) or list(numbers) != list(ours["numbers"]):
        fail(case, "%s: atoms %s vs spglib %s" % (what, ours["numbers"], list(numbers)))
        return False
    if np.max(np.abs(np.array(ours["lattice"]) - lattice)) > CELL_ATOL:
        fail(case, "%s: lattice differs by %.3g" %
             (what, np.max(np.abs(np.array(ours["lattice"]) - lattice))))
        ok = False
    delta = np.array(ours["positions"]) - positions
    delta -= np.round(delta)
    if len(delta) and np.max(np.abs(delta)) > CELL_ATOL:
        fail(case, "%s: positions differ by %.3g" % (what, np.max(np.abs(delta))))
        ok = False
    return ok


def check(case):
    counts["cases"] += 1
    cell = as_cell(case["cell"])
    symprec = case["symprec"]
    dataset = spglib.get_symmetry_dataset(cell, symprec=symprec, angle_tolerance=-1.0)
    if "error" in case:
        if dataset is None or dataset["number"] == 0:
            counts["errors_both"] += 1
            return
        fail(case, "nucleate raised '%s' but spglib found %d" % (case["error"], dataset["number"]))
        return
    if dataset is None:
        fail(case, "spglib found nothing (%s); nucleate found %d"
             % (spglib.get_error_message(), case["number"]))
        return
    ok = True

    def compare(field, ours, theirs):
        nonlocal ok
        counts["fields_compared"] += 1
        if ours != theirs:
            fail(case, "%s: nucleate %r, spglib %r" % (field, ours, theirs))
            ok = False

    compare("number", case["number"], int(dataset["number"]))
    compare("hall_number", case["hall_number"], int(dataset["hall_number"]))
    compare("international", case["international"], dataset["international"])
    compare("wyckoffs", case["wyckoffs"], "".join(dataset["wyckoffs"]))
    compare("equivalent_atoms", case["equivalent_atoms"],
            [int(i) for i in dataset["equivalent_atoms"]])
    compare("n_operations", case["n_operations"], len(dataset["rotations"]))
    volume = abs(np.linalg.det(dataset["primitive_lattice"]))
    counts["fields_compared"] += 1
    if abs(case["primitive_volume"] - volume) > VOLUME_RTOL * volume:
        fail(case, "primitive volume: nucleate %.12g, spglib %.12g"
             % (case["primitive_volume"], volume))
        ok = False

    primitive = spglib.standardize_cell(cell, to_primitive=True, no_idealize=False,
                                        symprec=symprec)
    counts["fields_compared"] += 1
    ok &= primitive is not None and same_cell(case, "primitive cell", case["primitive_cell"],
                                              primitive)
    conventional = spglib.standardize_cell(cell, to_primitive=False, no_idealize=False,
                                           symprec=symprec)
    counts["fields_compared"] += 1
    ok &= conventional is not None and same_cell(case, "symmetrised cell",
                                                 case["symmetrised_cell"], conventional)
    # nucleate's Niggli reduction uses eps = 1e-5 by default, as does spglib.niggli_reduce.
    niggli = spglib.niggli_reduce(cell[0], eps=1e-5)
    counts["fields_compared"] += 1
    if niggli is None or np.max(np.abs(np.array(case["niggli_lattice"]) - niggli)) > CELL_ATOL:
        fail(case, "Niggli lattice differs")
        ok = False

    structure = Structure(Lattice(cell[0]), [int(z) for z in cell[2]], cell[1])
    analyzer = SpacegroupAnalyzer(structure, symprec=symprec, angle_tolerance=-1.0)
    compare("pymatgen space group number", case["number"], analyzer.get_space_group_number())
    compare("crystal_system (pymatgen)", case["crystal_system"], analyzer.get_crystal_system())
    if ok:
        counts["agreed"] += 1


def main():
    if len(sys.argv) < 2:
        sys.stderr.write(__doc__)
        return 2
    source = sys.argv[1]
    if source.endswith(".json"):
        with open(source) as handle:
            dump = json.load(handle)
    else:
        output = subprocess.run([source] + sys.argv[2:], check=True, capture_output=True,
                                text=True).stdout
        dump = json.loads(output)
    for case in dump["cases"]:
        check(case)
    print("symmetry reference (seed %d, spglib %s): %d cases, %d agree in every field, "
          "%d refused by both, %d fields compared, %d mismatches"
          % (dump["seed"], spglib.__version__, counts["cases"], counts["agreed"],
             counts["errors_both"], counts["fields_compared"], len(failures)))
    if counts["cases"] < 100:
        print("too few cases: the dump is broken")
        return 1
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
