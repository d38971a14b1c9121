#!/usr/bin/python3
"""Minimum-image distances, closest pairs, neighbour lists and lattice parameters of nucleate
against an independent numpy brute force and, as a second reference, Debian's python3-ase.

Usage: /usr/bin/python3 geometry_reference.py DUMP_GEOMETRY_BINARY

Ground truth is the brute force: every lattice image within a range proven sufficient (for a
vector no longer than r, |n_k| <= r |b_k| + |frac difference|, b_k the reciprocal rows), plus a
margin. ASE's mic (ase.geometry.get_distances) is compared with the brute force too, and nucleate
is compared with ASE only where ASE agrees with the brute force: ASE's own search is not proven
for every skewed cell. The cells are strongly skewed on purpose: angles near 20 and 160 degrees,
axes up to 25:1.
"""

import sys

import reference_common as common

np = common.require("numpy")
ase_geometry = common.require("ase.geometry")
ase_neighborlist = common.require("ase.neighborlist")
ase = common.require("ase")

TOLERANCE = 1e-9  # angstrom: the brief's contract for distances
failures = common.Failures()


def standard_lattice(a, b, c, alpha, beta, gamma, rng):
    """A lattice with the given parameters, in a random orientation (numpy only)."""
    ca, cb, cg = (np.cos(np.radians(x)) for x in (alpha, beta, gamma))
    sg = np.sin(np.radians(gamma))
    cy = (ca - cb * cg) / sg
    m = np.array([[a, 0, 0], [b * cg, b * sg, 0], [c * cb, c * cy, c * np.sqrt(1 - cb ** 2 - cy ** 2)]])
    q, _ = np.linalg.qr(rng.normal(size=(3, 3)))
    return m @ q.T


def images_needed(lattice, r):
    recip = np.linalg.inv(lattice).T
    return int(np.ceil(r * np.linalg.norm(recip, axis=1).max())) + 2


def image_grid(n):
    r = np.arange(-n, n + 1)
    return np.array(np.meshgrid(r, r, r, indexing="ij")).reshape(3, -1).T


def brute_pair(lattice, fi, fj, exclude_zero=False):
    d = fj - fi
    naive = np.linalg.norm((d - np.round(d)) @ lattice)
    if exclude_zero:
        naive = np.linalg.norm(lattice, axis=1).min()
    grid = image_grid(max(images_needed(lattice, naive), 4))
    if exclude_zero:
        grid = grid[np.any(grid != 0, axis=1)]
    return np.linalg.norm((d + grid) @ lattice, axis=1).min()


def brute_neighbors(lattice, frac, cutoff):
    grid = image_grid(images_needed(lattice, cutoff))
    out = {}
    for i in range(len(frac)):
        for j in range(len(frac)):
            dist = np.linalg.norm((frac[j] - frac[i] + grid) @ lattice, axis=1)
            for n, dd in zip(grid[dist <= cutoff], dist[dist <= cutoff]):
                if i == j and not n.any():
                    continue
                out[(i, j, int(n[0]), int(n[1]), int(n[2]))] = dd
    return out


CELLS = [
    (3.0, 3.0, 3.0, 20.5, 20.5, 20.5), (3.0, 3.0, 3.0, 100, 100, 159),
    (1.2, 30.0, 5.0, 155, 140, 30), (2.0, 50.0, 2.2, 90, 21, 90),
    (8.0, 1.5, 1.6, 25, 160, 150), (4.0, 4.1, 40.0, 59.9, 60.1, 119.5),
    (5.0, 5.0, 5.0, 90, 90, 90), (2.5, 9.0, 4.0, 35, 140, 120),
]


def main():
    binary = sys.argv[1]
    rng = np.random.default_rng(20240611)
    cases, truth = [], {}
    for index, cell in enumerate(CELLS):
        lattice = standard_lattice(*cell, rng)
        if index % 2:
            lattice = lattice[[1, 0, 2]]  # left-handed on purpose
        n = 8
        frac = rng.uniform(0, 1, size=(n, 3))
        numbers = rng.integers(1, 90, size=n)
        cases.append(("distances", "cell%d" % index, lattice, numbers, frac, 0))
        cutoff = 1.2 * np.linalg.norm(lattice, axis=1).min() + 1.0
        cases.append(("neighbors", "cell%d_nl" % index, lattice, numbers, frac, cutoff))
        truth["cell%d" % index] = (lattice, numbers, frac, cell)
        truth["cell%d_nl" % index] = (lattice, numbers, frac, cutoff)
    # One-atom cells: the closest pair is the atom and its own image.
    a = 2.0
    bcc = np.array([[-a / 2, a / 2, a / 2], [a / 2, -a / 2, a / 2], [a / 2, a / 2, -a / 2]])
    cases.append(("distances", "bcc_one_atom", bcc, [26], np.zeros((1, 3)), 0))
    truth["bcc_one_atom"] = (bcc, [26], np.zeros((1, 3)), None)

    results = common.dump_cases(binary, cases)
    max_brute, max_ase, ase_disagreements, ase_compared = 0.0, 0.0, 0, 0
    for r in results:
        lattice, numbers, frac, extra = truth[r["name"]]
        if r["kind"] == "distances":
            n = len(numbers)
            got = np.array(r["distance_matrix"])
            cart = frac @ lattice
            ase_d = ase_geometry.get_distances(cart, cell=lattice, pbc=True)[1]
            for i in range(n):
                for j in range(n):
                    expected = brute_pair(lattice, frac[i], frac[j]) if i != j else 0.0
                    diff = abs(got[i, j] - expected)
                    max_brute = max(max_brute, diff)
                    failures.check(diff <= TOLERANCE, "%s d[%d,%d] = %.15g, brute force %.15g"
                                   % (r["name"], i, j, got[i, j], expected))
                    if abs(ase_d[i, j] - expected) <= TOLERANCE:
                        ase_compared += 1
                        max_ase = max(max_ase, abs(got[i, j] - ase_d[i, j]))
                    else:
                        ase_disagreements += 1
            self_image = brute_pair(lattice, frac[0], frac[0], exclude_zero=True)
            failures.check(abs(r["shortest_lattice_vector"] - self_image) <= TOLERANCE,
                           "%s shortest lattice vector %.15g, brute force %.15g"
                           % (r["name"], r["shortest_lattice_vector"], self_image))
            expected_min = min(self_image, min([brute_pair(lattice, frac[i], frac[j])
                                                for i in range(n) for j in range(i + 1, n)] or [np.inf]))
            failures.check(abs(r["min_distance"] - expected_min) <= TOLERANCE,
                           "%s min distance %.15g, brute force %.15g"
                           % (r["name"], r["min_distance"], expected_min))
            # Lattice parameters and the standard-orientation matrix against ASE's cellpar
            # functions (ASE also puts a along x and b in the xy plane).
            ase_par = ase_geometry.cell_to_cellpar(lattice)
            failures.check(np.allclose(r["parameters"], ase_par, rtol=0, atol=1e-9),
                           "%s parameters %s, ASE %s" % (r["name"], r["parameters"], list(ase_par)))
            ase_std = ase_geometry.cellpar_to_cell(ase_par)
            failures.check(np.allclose(np.array(r["standard_matrix"]).reshape(3, 3), ase_std,
                                       rtol=0, atol=1e-9),
                           "%s standard matrix differs from ASE cellpar_to_cell" % r["name"])
            failures.check(abs(r["signed_volume"] - np.linalg.det(lattice)) <= 1e-9 * abs(np.linalg.det(lattice)),
                           "%s signed volume %.15g, numpy det %.15g"
                           % (r["name"], r["signed_volume"], np.linalg.det(lattice)))
        else:
            cutoff = extra
            expected = brute_neighbors(lattice, frac, cutoff)
            got = {(a, b, c, d, e): dist for a, b, c, d, e, dist in r["neighbors"]}
            failures.check(set(got) == set(expected),
                           "%s neighbour keys differ: %d missing, %d extra"
                           % (r["name"], len(set(expected) - set(got)), len(set(got) - set(expected))))
            for key in set(got) & set(expected):
                max_brute = max(max_brute, abs(got[key] - expected[key]))
                failures.check(abs(got[key] - expected[key]) <= TOLERANCE,
                               "%s neighbour %s distance %.15g, brute force %.15g"
                               % (r["name"], key, got[key], expected[key]))
            # ASE's neighbor_list as a second reference for the count.
            atoms = ase.Atoms(numbers=numbers, scaled_positions=frac, cell=lattice, pbc=True)
            i_ase = ase_neighborlist.neighbor_list("i", atoms, cutoff)
            failures.check(len(i_ase) == len(expected),
                           "%s ASE neighbor_list finds %d pairs, brute force %d"
                           % (r["name"], len(i_ase), len(expected)))
    print("max |nucleate - brute force| = %.3g A" % max_brute)
    print("max |nucleate - ASE mic| = %.3g A over %d pairs where ASE agrees with brute force; "
          "ASE disagreed with brute force on %d pairs" % (max_ase, ase_compared, ase_disagreements))
    failures.check(ase_compared > 0, "ASE agreed with brute force on no pair: nothing compared")
    failures.finish("geometry_reference")


if __name__ == "__main__":
    main()
