// Two-atom ionic cells of two structure types, and tiny models trained on them in a folder of
// this process's own (ctest runs tests in parallel processes).
#pragma once

#include <string>
#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/structure/crystal.h"

namespace nucleate::assess::testing {

// Primitive rock-salt cell (fcc, conventional constant a): A at 0, B at (1/2, 1/2, 1/2).
structure::Crystal RockSalt(int a_number, int b_number, double a);
// CsCl type (simple cubic, constant a): A at 0, B at the body centre.
structure::Crystal CesiumChlorideType(int a_number, int b_number, double a);

// NaCl 5.64, KCl 6.29, LiF 4.03, MgO 4.21 (rock salt); CsCl 4.12, CsBr 4.29, TlCl 3.84 (CsCl
// type). Lattice constants in angstrom, from memory (handbook values); labelled by formula.
std::vector<structure::Crystal> IonicCells();

// Writes `cells` as CIFs into <dir>/structures and trains with the YAML body `yaml` (which
// must read data from "structures" and write "model.nucleate"); returns the bundle.
model::ModelBundle TrainOn(const std::string& dir, const std::vector<structure::Crystal>& cells,
                           const std::string& yaml);

// A model trained on IonicCells() for `epochs` steps (batch = the whole set), species given or
// absorbing. 3000 epochs learn the set; 60 do not.
model::ModelBundle TrainIonicModel(int epochs, const std::string& species);

}  // namespace nucleate::assess::testing
