#!/usr/bin/python3
"""Cross-checks of nucleate's CIF and extended XYZ I/O against Debian's pymatgen and ASE.

Usage: /usr/bin/python3 io_reference.py (cif | extxyz) READ_STRUCTURES_BINARY WORK_DIR

cif:    pymatgen builds a set of textbook structures and writes each as a symmetrised CIF
        (CifWriter(structure, symprec=0.1)); nucleate reads every file (read_structures read) and
        the result is compared with pymatgen's own CifParser reading of the same file. Then
        nucleate writes the structures back as P1 CIF and pymatgen and ASE read those.
extxyz: ASE writes a multi-frame extended XYZ with extra per-atom columns and info keys; nucleate
        reads it. nucleate writes extended XYZ; ASE reads it.

Compared: number of sites, composition, lattice parameters (1e-6 A and degrees), the set of
fractional positions per element up to a permutation (1e-6, periodic), and numeric info keys.
Exits non-zero with a message on any mismatch. Run with Debian's /usr/bin/python3 and the
packages python3-pymatgen, python3-ase and python3-numpy; a missing one fails the check.
"""

import json
import os
import subprocess
import sys
import warnings

MISSING = []
try:
    import numpy as np
except ImportError:
    MISSING.append("python3-numpy")
try:
    from pymatgen.core import Lattice, Structure
    from pymatgen.io.cif import CifParser, CifWriter
except ImportError:
    MISSING.append("python3-pymatgen")
try:
    import ase
    import ase.io
    from ase import Atoms
except ImportError:
    MISSING.append("python3-ase")
if MISSING:
    sys.stderr.write("io_reference: %s cannot import %s. Install the Debian package(s) %s "
                     "(apt-get install %s); this reference check does not skip.\n"
                     % (sys.executable, ", ".join(MISSING), ", ".join(MISSING), " ".join(MISSING)))
    sys.exit(2)

warnings.simplefilter("ignore")  # pymatgen warns about rounding of coordinates it fixes up

LATTICE_TOL = 1e-6   # task contract: lattice parameters to 1e-6
FRAC_TOL = 1e-6      # task contract: fractional positions to 1e-6, periodic
failures = []
checks = 0


def fail(message):
    failures.append(message)
    print("MISMATCH: " + message)


def check(condition, message):
    global checks
    checks += 1
    if not condition:
        fail(message)
    return condition


def parameters(matrix):
    """a, b, c, alpha, beta, gamma of lattice rows, computed here with numpy (not nucleate)."""
    m = np.asarray(matrix, dtype=float)
    a, b, c = (np.linalg.norm(m[i]) for i in range(3))

    def angle(u, v):
        return np.degrees(np.arctan2(np.linalg.norm(np.cross(u, v)), np.dot(u, v)))

    return np.array([a, b, c, angle(m[1], m[2]), angle(m[0], m[2]), angle(m[0], m[1])])


def same_positions(numbers_a, frac_a, numbers_b, frac_b, tol):
    """Whether the two site lists are equal up to a permutation (periodic, per coordinate).
    Returns the largest matched distance (fractional, max-norm) or None when they differ."""
    if len(numbers_a) != len(numbers_b) or sorted(numbers_a) != sorted(numbers_b):
        return None
    fa = np.asarray(frac_a, dtype=float).reshape(-1, 3)
    fb = np.asarray(frac_b, dtype=float).reshape(-1, 3)
    used = np.zeros(len(fb), dtype=bool)
    worst = 0.0
    for i, z in enumerate(numbers_a):
        d = fb - fa[i]
        d -= np.round(d)
        dist = np.abs(d).max(axis=1)
        dist[np.asarray(numbers_b) != z] = np.inf
        dist[used] = np.inf
        j = int(np.argmin(dist))
        if dist[j] > tol:
            return None
        used[j] = True
        worst = max(worst, float(dist[j]))
    return worst


def run_reader(binary, *args):
    out = subprocess.run([binary, *args], capture_output=True, text=True)
    if out.returncode != 0:
        fail("read_structures %s failed (%d): %s" % (" ".join(args), out.returncode, out.stderr))
        return None
    return json.loads(out.stdout) if args[0] == "read" else True


def reference_structures():
    """Textbook structures built by pymatgen from their space groups. Parameters are typical
    literature values (from memory); they only need to be realistic, both readers see the same
    file."""
    s = {}
    s["rocksalt_NaCl"] = Structure.from_spacegroup(
        "Fm-3m", Lattice.cubic(5.64), ["Na", "Cl"], [[0, 0, 0], [0.5, 0.5, 0.5]])
    s["rutile_TiO2"] = Structure.from_spacegroup(
        "P4_2/mnm", Lattice.tetragonal(4.594, 2.959), ["Ti", "O"],
        [[0, 0, 0], [0.3053, 0.3053, 0]])
    s["wurtzite_ZnO"] = Structure.from_spacegroup(
        "P6_3mc", Lattice.hexagonal(3.2496, 5.2042), ["Zn", "O"],
        [[1 / 3, 2 / 3, 0], [1 / 3, 2 / 3, 0.3821]])
    s["corundum_Al2O3"] = Structure.from_spacegroup(
        "R-3c", Lattice.hexagonal(4.759, 12.991), ["Al", "O"], [[0, 0, 0.3523], [0.3064, 0, 0.25]])
    # pymatgen's Fd-3m is origin choice 1: Mg on 8a (0,0,0), Al on 16d (5/8,5/8,5/8).
    s["spinel_MgAl2O4"] = Structure.from_spacegroup(
        "Fd-3m", Lattice.cubic(8.08), ["Mg", "Al", "O"],
        [[0, 0, 0], [0.625, 0.625, 0.625], [0.387, 0.387, 0.387]])
    s["perovskite_SrTiO3"] = Structure.from_spacegroup(
        "Pm-3m", Lattice.cubic(3.905), ["Sr", "Ti", "O"], [[0, 0, 0], [0.5, 0.5, 0.5], [0.5, 0.5, 0]])
    s["monoclinic_P21c"] = Structure.from_spacegroup(
        "P2_1/c", Lattice.monoclinic(5.21, 7.33, 6.05, 104.7), ["Cu", "S", "O"],
        [[0.1234, 0.2111, 0.3777], [0.6021, 0.1402, 0.0815], [0.8123, 0.4567, 0.2222]])
    s["triclinic_P1"] = Structure(
        Lattice.from_parameters(5.1, 6.3, 7.2, 82.1, 95.3, 103.7),
        ["Li", "Fe", "P", "O", "O"],
        [[0.11, 0.22, 0.33], [0.52, 0.61, 0.07], [0.29, 0.81, 0.64], [0.91, 0.13, 0.47],
         [0.43, 0.37, 0.88]])
    expected_sizes = {"rocksalt_NaCl": 8, "rutile_TiO2": 6, "wurtzite_ZnO": 4,
                      "corundum_Al2O3": 30, "spinel_MgAl2O4": 56, "perovskite_SrTiO3": 5,
                      "monoclinic_P21c": 12, "triclinic_P1": 5}
    for name, st in s.items():
        # Guards the fixture itself: a wrong setting would give another atom count.
        check(len(st) == expected_sizes[name],
              "%s: pymatgen built %d sites, expected %d" % (name, len(st), expected_sizes[name]))
    return s


def compare_crystal(tag, block, numbers, lattice_params, frac):
    if not check(block.get("error") is None, "%s: nucleate error: %s" % (tag, block.get("error"))):
        return None
    check(len(block["numbers"]) == len(numbers),
          "%s: %d sites from nucleate, %d from the reference" % (tag, len(block["numbers"]), len(numbers)))
    check(sorted(block["numbers"]) == sorted(numbers), "%s: compositions differ" % tag)
    dp = np.abs(parameters(block["lattice"]) - np.asarray(lattice_params)).max()
    check(dp <= LATTICE_TOL, "%s: lattice parameters differ by %.3g" % (tag, dp))
    worst = same_positions(block["numbers"], block["frac"], list(numbers), frac, FRAC_TOL)
    check(worst is not None, "%s: fractional positions differ beyond %g" % (tag, FRAC_TOL))
    return (dp, worst if worst is not None else np.inf)


def run_cif(binary, work):
    structures = reference_structures()
    paths = {}
    for name, st in structures.items():
        path = os.path.join(work, name + ".cif")
        CifWriter(st, symprec=0.1).write_file(path)
        paths[name] = path
    result = run_reader(binary, "read", *paths.values())
    if result is None:
        return
    figures = []
    for (name, path), entry in zip(paths.items(), result):
        blocks = entry["blocks"]
        if not check(len(blocks) == 1, "%s: %d data blocks" % (name, len(blocks))):
            continue
        ref = CifParser(path).get_structures(primitive=False)[0]
        got = compare_crystal(name + " (pymatgen CIF)", blocks[0], [sp.Z for sp in ref.species],
                              ref.lattice.parameters, ref.frac_coords)
        if got:
            figures.append((name, len(ref)) + got)
            print("  %-20s %3d sites  lattice |d| %.1e  positions |d| %.1e" % ((name, len(ref)) + got))

    # nucleate's P1 CIF, read by pymatgen and by ASE.
    p1 = os.path.join(work, "nucleate_p1.cif")
    if not run_reader(binary, "write-cif", p1, *paths.values()):
        return
    ours = run_reader(binary, "read", p1)
    if ours is None:
        return
    ours = ours[0]["blocks"]
    back = CifParser(p1).get_structures(primitive=False)
    check(len(back) == len(ours) == len(paths),
          "nucleate P1 CIF: %d blocks read by pymatgen, %d by nucleate, %d written"
          % (len(back), len(ours), len(paths)))
    for block, ref in zip(ours, back):
        compare_crystal(block["name"] + " (nucleate P1 CIF read by pymatgen)", block,
                        [sp.Z for sp in ref.species], ref.lattice.parameters, ref.frac_coords)
    ase_back = ase.io.read(p1, index=":", format="cif")
    check(len(ase_back) == len(ours), "nucleate P1 CIF: ASE read %d blocks" % len(ase_back))
    for block, atoms in zip(ours, ase_back):
        compare_crystal(block["name"] + " (nucleate P1 CIF read by ASE)", block,
                        list(atoms.numbers), atoms.cell.cellpar(),
                        atoms.get_scaled_positions(wrap=True))


def ase_frames():
    """Frames with extra per-atom columns (tags I:1, initial_magmoms R:1, a 3-column array) and
    info keys, so nucleate must skip columns by their declared widths."""
    frames = []
    for name, st in reference_structures().items():
        atoms = Atoms(numbers=[sp.Z for sp in st.species], cell=st.lattice.matrix,
                      scaled_positions=st.frac_coords, pbc=True)
        n = len(atoms)
        atoms.set_tags(np.arange(n))
        atoms.set_initial_magnetic_moments(np.linspace(-1, 1, n))
        atoms.new_array("velocity_like", np.arange(3 * n, dtype=float).reshape(n, 3) / 7.0)
        atoms.info["energy_ref"] = -1.25 * n
        atoms.info["config_type"] = name
        frames.append(atoms)
    return frames


def run_extxyz(binary, work):
    frames = ase_frames()
    path = os.path.join(work, "ase_frames.xyz")
    ase.io.write(path, frames, format="extxyz")
    result = run_reader(binary, "read", path)
    if result is None:
        return
    blocks = result[0]["blocks"]
    check(len(blocks) == len(frames), "ASE extxyz: nucleate read %d frames of %d" % (len(blocks), len(frames)))
    # Compare with ASE's own reading of the same file.
    ase_read = ase.io.read(path, index=":", format="extxyz")
    for block, atoms in zip(blocks, ase_read):
        tag = "%s (ASE extxyz)" % atoms.info.get("config_type")
        got = compare_crystal(tag, block, list(atoms.numbers), atoms.cell.cellpar(),
                              atoms.get_scaled_positions(wrap=True))
        if block.get("error") is None:
            check(np.allclose(block["lattice"], atoms.cell[:], atol=1e-12, rtol=0),
                  "%s: lattice matrix differs from ASE's" % tag)
            check(abs(block["properties"].get("energy_ref", np.nan) - atoms.info["energy_ref"]) < 1e-12,
                  "%s: energy_ref %s, ASE %s" % (tag, block["properties"].get("energy_ref"),
                                                 atoms.info["energy_ref"]))
            check("config_type" not in block["properties"], "%s: a string info key became a number" % tag)
        if got:
            print("  %-30s lattice |d| %.1e  positions |d| %.1e" % ((tag,) + got))

    # nucleate writes extended XYZ; ASE reads it.
    ours_path = os.path.join(work, "nucleate_frames.xyz")
    if not run_reader(binary, "write-extxyz", ours_path, path):
        return
    back = ase.io.read(ours_path, index=":", format="extxyz")
    check(len(back) == len(blocks), "nucleate extxyz: ASE read %d frames of %d" % (len(back), len(blocks)))
    for block, atoms in zip(blocks, back):
        tag = "%s (nucleate extxyz read by ASE)" % block["name"]
        check(bool(np.all(atoms.pbc)), "%s: ASE sees pbc %s" % (tag, atoms.pbc))
        compare_crystal(tag, block, list(atoms.numbers), atoms.cell.cellpar(),
                        atoms.get_scaled_positions(wrap=True))
        check(np.allclose(block["lattice"], atoms.cell[:], atol=1e-12, rtol=0),
              "%s: lattice matrix differs" % tag)
        check(atoms.info.get("energy_ref") == block["properties"]["energy_ref"],
              "%s: energy_ref %s read by ASE, %s written" % (tag, atoms.info.get("energy_ref"),
                                                             block["properties"]["energy_ref"]))
        check(atoms.info.get("label") == block["label"],
              "%s: label %r read by ASE, %r written" % (tag, atoms.info.get("label"), block["label"]))


def main():
    if len(sys.argv) != 4 or sys.argv[1] not in ("cif", "extxyz"):
        sys.stderr.write(__doc__)
        return 2
    mode, binary, work = sys.argv[1:]
    os.makedirs(work, exist_ok=True)
    print("Debian references: pymatgen %s, ASE %s, numpy %s" % (
        __import__("importlib.metadata").metadata.version("pymatgen"), ase.__version__, np.__version__))
    (run_cif if mode == "cif" else run_extxyz)(binary, work)
    if failures:
        print("%d of %d checks failed" % (len(failures), checks))
        return 1
    if checks == 0:
        print("no checks ran")
        return 1
    print("all %d checks passed" % checks)
    return 0


if __name__ == "__main__":
    sys.exit(main())
