// `side_by_side_server MODEL dump DIR`: everything another implementation needs to run the same
// network on the same batch and compare: the bundle's tensors, the batch's network inputs, the
// loss targets (the fixed noise draws of the training step), and nucleate's forward outputs, loss
// and parameter gradients. Arrays and manifest as described in array_dump.h; groups:
//   param/<tensor>   every network tensor, in layout order ("parameters" lists the order)
//   input/<name>     what the forward pass consumes, plus the geometry it was built from
//   target/<name>    loss targets (species: the clean token of a masked atom, -1 otherwise)
//   noise/<name>     the training step's noise draws and the clean cells they were applied to
//   output/<name>    one forward pass (micro-batch outputs stacked in cell order)
//   grad/<tensor>    gradient of the batch loss for every tensor
// Scalar facts: architecture, batch sizes, loss weights and the loss parts.
#pragma once

#include <string>

#include "core/model/bundle/model_bundle.h"
#include "tests/bench/side_by_side/side_by_side_batch.h"
#include "tests/bench/side_by_side/side_by_side_network.h"

namespace nucleate::bench {

void DumpSideBySide(const model::ModelBundle& bundle, const SideBySideBatch& batch,
                    SideBySideNetwork* network, const std::string& directory);

}  // namespace nucleate::bench
