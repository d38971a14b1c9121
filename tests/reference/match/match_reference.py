#!/usr/bin/python3
"""nucleate's structure matcher against pymatgen's StructureMatcher (Debian python3-pymatgen).

Generates structure pairs from textbook structure types and random low-symmetry cells (same,
rotated, permuted, origin-shifted, other cell choice, supercell, small and large strain, small
and large site noise, different structure types of one composition), writes them as JSON, runs
match_pairs (nucleate) on them and compares with StructureMatcher at its defaults (ltol 0.2,
stol 0.3, angle_tol 5, primitive_cell True, scale True, attempt_supercell False).

Agreement rule: every verdict must agree, except pairs whose largest site displacement (as either
program reports it) lies within 5 % of the 0.3 site tolerance; those are BORDERLINE (the two
programs reach the threshold through different but equally valid rounding, primitive-cell
averaging and reduced-cell choices) and are listed one by one; and noisy copies of a
conventional cell that one program's primitive-cell search reduces and the other's does not
(explained at the check, listed one by one). Where both match, the rms values
must agree within 0.01 (units of (V/N)^(1/3)) or 5 %. Every pair pymatgen matches must also pass
nucleate's dedup screen, the exact lattice screen (else dedup would miss it).

usage: match_reference.py <match_pairs executable> [seed]
"""
import json
import subprocess
import sys
import tempfile
import time

try:
    import numpy as np
except ImportError:
    sys.exit("FAIL: numpy missing from /usr/bin/python3: apt-get install python3-numpy")
try:
    from pymatgen.core import Lattice, Structure
    from pymatgen.analysis.structure_matcher import StructureMatcher
except ImportError:
    sys.exit("FAIL: pymatgen missing from /usr/bin/python3: apt-get install python3-pymatgen")

STOL = 0.3
BORDER = 0.05  # relative band around STOL


def textbook():
    """Lattice constants and positions from memory (standard textbook values); only the
    structure types matter here, not the exact constants."""
    s = {}
    s["NaCl rock salt"] = Structure.from_spacegroup(
        "Fm-3m", Lattice.cubic(5.64), ["Na", "Cl"], [[0, 0, 0], [0.5, 0.5, 0.5]])
    s["CsCl"] = Structure.from_spacegroup(
        "Pm-3m", Lattice.cubic(4.12), ["Cs", "Cl"], [[0, 0, 0], [0.5, 0.5, 0.5]])
    s["ZnS zincblende"] = Structure.from_spacegroup(
        "F-43m", Lattice.cubic(5.41), ["Zn", "S"], [[0, 0, 0], [0.25, 0.25, 0.25]])
    s["ZnO wurtzite"] = Structure.from_spacegroup(
        "P6_3mc", Lattice.hexagonal(3.25, 5.21), ["Zn", "O"],
        [[1 / 3, 2 / 3, 0], [1 / 3, 2 / 3, 0.382]])
    s["TiO2 rutile"] = Structure.from_spacegroup(
        "P4_2/mnm", Lattice.tetragonal(4.594, 2.959), ["Ti", "O"], [[0, 0, 0], [0.305, 0.305, 0]])
    s["SrTiO3 perovskite"] = Structure.from_spacegroup(
        "Pm-3m", Lattice.cubic(3.905), ["Sr", "Ti", "O"],
        [[0, 0, 0], [0.5, 0.5, 0.5], [0.5, 0.5, 0]])
    s["CaF2 fluorite"] = Structure.from_spacegroup(
        "Fm-3m", Lattice.cubic(5.46), ["Ca", "F"], [[0, 0, 0], [0.25, 0.25, 0.25]])
    s["MgAl2O4 spinel-like"] = Structure.from_spacegroup(
        "Fd-3m", Lattice.cubic(8.08), ["Mg", "Al", "O"],
        [[0.125, 0.125, 0.125], [0.5, 0.5, 0.5], [0.2624, 0.2624, 0.2624]])
    return s


def random_cell(rng, species, volume_per_atom=12.0, min_dist=1.7):
    while True:
        abc = 1 + rng.random(3)
        angles = 75 + 30 * rng.random(3)
        try:
            lat = Lattice.from_parameters(*abc, *angles)
        except Exception:
            continue
        if lat.volume > 0.3 * np.prod(abc):
            break
    lat = lat.scale(volume_per_atom * len(species))
    frac = []
    for _ in species:
        for _attempt in range(2000):
            f = rng.random(3)
            if all(lat.get_distance_and_image(f, g)[0] >= min_dist for g in frac):
                break
        frac.append(f)
    return Structure(lat, species, frac)


def rotation(rng):
    q = rng.normal(size=4)
    q /= np.linalg.norm(q)
    w, x, y, z = q
    return np.array([[1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w)],
                     [2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w)],
                     [2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y)]])


def rotated(s, rng):
    return Structure(Lattice(s.lattice.matrix @ rotation(rng).T), s.species, s.frac_coords)


def permuted(s, rng):
    order = rng.permutation(len(s))
    return Structure(s.lattice, [s.species[i] for i in order], s.frac_coords[order])


def shifted(s, rng):
    return Structure(s.lattice, s.species, (s.frac_coords + rng.random(3)) % 1.0)


UNIMODULAR = [np.array(m) for m in ([[1, 1, 0], [0, 1, 0], [0, 0, 1]],
                                     [[1, 0, 0], [1, 1, 0], [-1, 0, 1]],
                                     [[0, 1, 0], [0, 0, 1], [1, 0, 0]],
                                     [[1, 0, 2], [0, -1, 0], [0, 0, 1]])]
SUPERCELLS = [[[2, 0, 0], [0, 1, 0], [0, 0, 1]], [[1, 1, 0], [-1, 1, 0], [0, 0, 1]],
              [[1, 0, 0], [0, 1, 0], [0, 0, 2]]]


def cell_choice(s, rng):
    u = UNIMODULAR[rng.integers(len(UNIMODULAR))]
    return Structure(Lattice(u @ s.lattice.matrix), s.species,
                     (s.frac_coords @ np.linalg.inv(u)) % 1.0)


def supercell(s, rng):
    t = s.copy()
    t.make_supercell(SUPERCELLS[rng.integers(len(SUPERCELLS))])
    return t


def strained(s, rng, low, high):
    """Symmetric strain whose largest principal value lies in [low, high]: the generator keeps
    small strains well under and large strains well over the 20 % length tolerance."""
    a = rng.normal(size=(3, 3))
    e = (a + a.T) / 2
    e *= rng.uniform(low, high) / np.max(np.abs(np.linalg.eigvalsh(e)))
    return Structure(Lattice(s.lattice.matrix @ (np.eye(3) + e).T), s.species, s.frac_coords)


def noisy(s, rng, fraction):
    """Each site moved by a random vector of length fraction * (V/N)^(1/3)."""
    unit = (s.volume / len(s)) ** (1 / 3)
    cart = s.cart_coords.copy()
    for i in range(len(cart)):
        v = rng.normal(size=3)
        cart[i] += fraction * unit * v / np.linalg.norm(v)
    return Structure(s.lattice, s.species, cart, coords_are_cartesian=True)


def relabel(s, mapping):
    return Structure(s.lattice, [mapping.get(str(sp), str(sp)) for sp in s.species], s.frac_coords)


def make_pairs(seed):
    rng = np.random.default_rng(seed)
    bases = textbook()
    for k, species in enumerate([["Mg", "Mg", "Si", "O", "O", "O", "O"], ["Li", "Fe", "P", "O", "O", "O", "O"],
                                 ["Ba", "Ti", "O", "O", "O"], ["Ga", "Ga", "N", "N"],
                                 ["K", "Al", "Si", "Si", "O", "O", "O", "O"], ["Cu", "Cu", "Zn", "Sn", "S", "S", "S", "S"]]):
        bases["random P1 #%d" % k] = random_cell(rng, species)
    pairs = []  # (kind, base name, a, b)
    for name, s in bases.items():
        for _ in range(4):
            pairs.append(("same", name, s, s.copy()))
            pairs.append(("rotated", name, s, rotated(s, rng)))
            pairs.append(("permuted", name, s, permuted(s, rng)))
            pairs.append(("origin-shifted", name, s, shifted(s, rng)))
            pairs.append(("cell choice", name, s, rotated(permuted(cell_choice(s, rng), rng), rng)))
            pairs.append(("supercell", name, s, shifted(supercell(s, rng), rng)))
            pairs.append(("strained small", name, s, strained(s, rng, 0.01, 0.06)))
            pairs.append(("strained large", name, s, strained(s, rng, 0.35, 0.5)))
            pairs.append(("noise small", name, s, noisy(s, rng, rng.uniform(0.02, 0.12))))
            pairs.append(("noise large", name, s, noisy(s, rng, rng.uniform(0.35, 0.6))))
    # Different structures of one composition.
    tb = bases
    different = [
        ("rock salt vs CsCl as NaCl", tb["NaCl rock salt"], relabel(tb["CsCl"], {"Cs": "Na"})),
        ("zincblende vs wurtzite as ZnS", tb["ZnS zincblende"], relabel(tb["ZnO wurtzite"], {"O": "S"})),
        ("zincblende vs rock salt as ZnS", tb["ZnS zincblende"], relabel(tb["NaCl rock salt"], {"Na": "Zn", "Cl": "S"})),
        ("fluorite vs rutile as CaF2", tb["CaF2 fluorite"], relabel(tb["TiO2 rutile"], {"Ti": "Ca", "O": "F"})),
        ("rock salt vs zincblende as NaCl", tb["NaCl rock salt"], relabel(tb["ZnS zincblende"], {"Zn": "Na", "S": "Cl"})),
        ("CsCl vs zincblende as CsCl", tb["CsCl"], relabel(tb["ZnS zincblende"], {"Zn": "Cs", "S": "Cl"})),
    ]
    for label, a, b in different:
        for _ in range(3):
            pairs.append(("different", label, a, rotated(shifted(b, rng), rng)))
            pairs.append(("different", label + " (strained)", a, strained(b, rng, 0.01, 0.05)))
    for k in range(30):  # random cells of one composition
        sp = ["Ga", "Ga", "N", "N"] if k % 2 else ["Mg", "Mg", "Si", "O", "O", "O", "O"]
        pairs.append(("different", "two random cells " + "".join(sp), random_cell(rng, sp), random_cell(rng, sp)))
    for k in range(20):  # different composition
        names = list(bases)
        a, b = rng.choice(len(names), 2, replace=False)
        pairs.append(("different", "%s vs %s" % (names[a], names[b]), bases[names[a]], bases[names[b]]))
    return pairs


def to_json(s):
    return {"lattice": [float(x) for x in s.lattice.matrix.ravel()],
            "numbers": [int(sp.Z) for sp in s.species],
            "frac": [float(x) for x in (s.frac_coords % 1.0).ravel()]}


def main():
    exe = sys.argv[1]
    seed = int(sys.argv[2]) if len(sys.argv) > 2 else 20240611
    pairs = make_pairs(seed)
    with tempfile.NamedTemporaryFile("w", suffix=".json", delete=False) as f:
        json.dump({"pairs": [{"a": to_json(a), "b": to_json(b)} for _, _, a, b in pairs]}, f)
        path = f.name
    t0 = time.time()
    out = subprocess.run([exe, path], capture_output=True, text=True, check=True).stdout
    t_ours = time.time() - t0
    ours = {}
    for line in out.splitlines():
        idx, verdict, rms, mx, screen, reason = (line.split(" ", 5) + [""])[:6]
        ours[int(idx)] = (verdict, float(rms), float(mx), screen == "1", reason)
    if len(ours) != len(pairs):
        sys.exit("FAIL: match_pairs answered %d of %d pairs" % (len(ours), len(pairs)))

    matcher = StructureMatcher()  # defaults: ltol=0.2, stol=0.3, angle_tol=5, primitive, scale
    t0 = time.time()
    agree = rms_checked = 0
    rms_worst = 0.0
    borderline, failures, screen_misses, primitive_differs = [], [], [], []
    by_kind = {}
    for i, (kind, name, a, b) in enumerate(pairs):
        fit = matcher.fit(a, b)
        prms, pmax = (None, None)
        if fit:
            r = matcher.get_rms_dist(a, b)
            if r is not None:
                prms, pmax = r
        verdict, rms, mx, screen, reason = ours[i]
        if verdict == "error":
            failures.append("%d %s %s: nucleate raised %s" % (i, kind, name, reason))
            continue
        mine = verdict == "1"
        stats = by_kind.setdefault(kind, [0, 0, 0])
        stats[0] += 1
        stats[1] += fit
        if fit and not screen:
            screen_misses.append("%d %s %s" % (i, kind, name))
        if mine == fit:
            agree += 1
            stats[2] += 1
            if fit and prms is not None:
                rms_checked += 1
                diff = abs(rms - prms)
                rms_worst = max(rms_worst, diff)
                if diff > 0.01 and diff > 0.05 * prms:
                    failures.append("%d %s %s: rms %.4f vs pymatgen %.4f" % (i, kind, name, rms, prms))
            continue
        near = [x for x in (mx, pmax) if x is not None and np.isfinite(x)]
        text = "%d %s %s: nucleate %s (max %.3f, %s), pymatgen %s%s" % (
            i, kind, name, mine, mx, reason or "matched", fit,
            "" if pmax is None else " (max %.3f)" % pmax)
        if any(abs(x - STOL) <= BORDER * STOL for x in near):
            borderline.append(text)
        elif kind.startswith("noise") and len(a.get_primitive_structure()) != len(b.get_primitive_structure()):
            # Explained difference: pymatgen's primitive search (tolerance 0.25 A per axis of
            # the HNF candidate cell it tries) keeps the noisy copy's conventional cell, so it
            # compares cells of different size and says no; nucleate's search (same tolerance,
            # per axis of the reduced candidate cell) reduces it and finds the match.
            primitive_differs.append(text)
        else:
            failures.append(text)
    t_pmg = time.time() - t0

    print("pairs: %d, verdicts agreeing: %d, borderline disagreements: %d, primitive-search "
          "differences: %d, other disagreements or errors: %d"
          % (len(pairs), agree, len(borderline), len(primitive_differs), len(failures)))
    print("rms compared on %d matched pairs, largest |difference| %.2e" % (rms_checked, rms_worst))
    print("time: nucleate %.1f s, pymatgen %.1f s" % (t_ours, t_pmg))
    for kind, (n, n_fit, n_agree) in sorted(by_kind.items()):
        print("  %-16s %4d pairs, pymatgen matches %4d, agree %4d" % (kind, n, n_fit, n_agree))
    for text in borderline:
        print("BORDERLINE " + text)
    for text in primitive_differs:
        print("PRIMITIVE-CELL SEARCH DIFFERS " + text)
    for text in screen_misses:
        print("SCREEN MISS (pymatgen matches, dedup screen would not compare) " + text)
    for text in failures:
        print("DISAGREE " + text)
    if len(pairs) < 500:
        sys.exit("FAIL: only %d pairs" % len(pairs))
    if failures or screen_misses:
        sys.exit("FAIL")
    print("OK")


if __name__ == "__main__":
    main()
