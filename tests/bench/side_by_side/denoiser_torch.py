"""nucleate's denoiser written again in PyTorch (eager, float32), for the side-by-side benchmark.

The network follows core/model/DESIGN.md ("The network") and core/model/denoiser.cc layer for
layer, reading the tensors that `side_by_side_server MODEL dump DIR` writes. Weights keep
nucleate's layout: a linear map is y = x W + b with W of shape (in, out). The loss is
core/train/loss.h's batch loss. Benchmark code only: the product stays Python-free.
"""

import json
import os

import numpy as np
import torch
import torch.nn.functional as F

LAYER_NORM_EPSILON = 1e-5  # core/model/nn/layers.cc, kLayerNormEpsilon


def read_dump(directory):
    """The manifest and every array of a dump, as {group: {name: numpy array}}."""
    with open(os.path.join(directory, "manifest.json"), encoding="utf-8") as f:
        manifest = json.load(f)
    if manifest.get("byte_order") != "little":
        raise ValueError(f"{directory}/manifest.json: byte_order must be 'little'")
    dtypes = {"float32": "<f4", "float64": "<f8", "int32": "<i4"}
    groups = {}
    for entry in manifest["arrays"]:
        path = os.path.join(directory, entry["file"])
        values = np.fromfile(path, dtype=dtypes[entry["dtype"]])
        expected = int(np.prod(entry["shape"], dtype=np.int64))
        if values.size != expected:
            raise ValueError(f"{path}: {values.size} values, the manifest's shape "
                             f"{entry['shape']} needs {expected}")
        groups.setdefault(entry["group"], {})[entry["name"]] = values.reshape(entry["shape"])
    return manifest, groups


def time_embedding(time, width):
    """Sinusoidal embedding of t/T (core/model/graph_batch.cc, TimeEmbedding): width/2 sines then
    width/2 cosines of 1000 u / 10000^(k / (width/2)), computed in float64 as nucleate does."""
    half = width // 2
    frequency = np.power(10000.0, -np.arange(half, dtype=np.float64) / half)
    phase = 1000.0 * time[:, None] * frequency[None, :]
    return np.concatenate([np.sin(phase), np.cos(phase)], axis=1)


class Batch:
    """The dumped batch as torch tensors, plus the index vectors the scatter operations need."""

    def __init__(self, manifest, inputs, targets):
        arch = manifest["architecture"]
        self.cells = int(manifest["cells"])
        offsets = inputs["atom_offsets"].astype(np.int64)
        atoms_per_cell = np.diff(offsets)
        self.atoms = int(offsets[-1])
        long = lambda a: torch.from_numpy(np.ascontiguousarray(a, dtype=np.int64))
        f32 = lambda a: torch.from_numpy(np.ascontiguousarray(a, dtype=np.float32))
        self.atom_cell = long(np.repeat(np.arange(self.cells), atoms_per_cell))
        self.atom_count = f32(atoms_per_cell)
        self.tokens = long(inputs["tokens"])
        self.sender = long(inputs["edge_sender"])
        self.receiver = long(inputs["edge_receiver"])
        self.edge_count = f32(np.diff(inputs["edge_offsets"].astype(np.int64)))
        self.edge_geometry = f32(inputs["edge_geometry"])
        # The per-cell input row: time embedding, then the 6 standardised noisy lattice numbers.
        cell_inputs = np.concatenate(
            [time_embedding(inputs["time"], arch["time_embedding"]), inputs["lattice_features"]],
            axis=1)
        self.cell_inputs = f32(cell_inputs)
        self.composition = f32(inputs["composition"])
        self.composition_present = f32(inputs["composition_present"])
        self.crystal_system = long(inputs["crystal_system"])
        self.space_group = long(inputs["space_group"])
        self.properties = f32(inputs["properties"])
        self.properties_present = f32(inputs["properties_present"])
        # Loss targets.
        self.coordinate_target = f32(targets["coordinate_score"])
        self.lattice_target = f32(targets["lattice_noise"])
        species = targets["species"].astype(np.int64)
        self.masked = torch.from_numpy(species >= 0)
        self.species_target = long(np.where(species >= 0, species, 0))
        masked_per_cell = np.add.reduceat((species >= 0).astype(np.int64), offsets[:-1])
        # Per masked atom: 1 / (masked atoms of its cell), as core/train/loss.cc weighs them.
        per_atom = 1.0 / np.maximum(masked_per_cell, 1)[np.repeat(np.arange(self.cells),
                                                                  atoms_per_cell)]
        self.species_weight = f32(np.where(species >= 0, per_atom, 0.0))
        self.coordinate_weight = f32(1.0 / (3.0 * atoms_per_cell))[self.atom_cell]


def segment_mean(x, index, count, segments):
    """Mean of the rows of x per segment (index: the segment of each row); empty segments give 0."""
    total = x.new_zeros((segments, x.shape[1])).index_add(0, index, x)
    return total / count.clamp(min=1).unsqueeze(1)


class TorchDenoiser:
    """The network with its tensors as leaf tensors (requires_grad for training)."""

    def __init__(self, manifest, params):
        self.arch = manifest["architecture"]
        self.names = manifest["parameters"]
        self.p = {name: torch.from_numpy(np.array(params[name], dtype=np.float32))
                  .requires_grad_(True) for name in self.names}
        self.hidden = self.arch["hidden"]

    def parameters(self):
        return [self.p[name] for name in self.names]

    def zero_grad(self):
        for tensor in self.p.values():
            tensor.grad = None

    def linear(self, name, x):
        # Weight (in, out), bias (1, out): y = x W + b.
        return torch.addmm(self.p[name + ".bias"], x, self.p[name + ".weight"])

    def layer_norm(self, name, x):
        return F.layer_norm(x, (x.shape[1],), self.p[name + ".gain"].view(-1),
                            self.p[name + ".shift"].view(-1), LAYER_NORM_EPSILON)

    def forward(self, b):
        arch, p = self.arch, self.p
        context = self.linear("context.out", F.silu(self.linear("context.in", b.cell_inputs)))
        if arch["condition_composition"]:
            composition = torch.cat([b.composition, 1.0 - b.composition_present], dim=1)
            context = context + self.linear("condition.composition", composition)
        if arch["condition_crystal_system"]:
            context = context + p["condition.crystal_system.table"][b.crystal_system]
        if arch["condition_space_group"]:
            context = context + p["condition.space_group.table"][b.space_group]
        if arch["properties"]:
            properties = torch.cat([b.properties, 1.0 - b.properties_present], dim=1)
            context = context + self.linear("condition.properties", properties)
        h = p["species.table"][b.tokens] + context[b.atom_cell]

        for layer in range(arch["layers"]):
            name = f"layer{layer}."
            x = self.layer_norm(name + "norm", h)
            edge = (self.linear(name + "geometry", b.edge_geometry)
                    + self.linear(name + "send", x)[b.sender]
                    + self.linear(name + "receive", x)[b.receiver])
            messages = F.silu(self.linear(name + "message", F.silu(edge)))
            mean = segment_mean(messages, b.receiver, b.edge_count, b.atoms)
            update_input = torch.cat([x, mean], dim=1)
            h = h + self.linear(name + "update_out",
                                F.silu(self.linear(name + "update_in", update_input)))

        final_x = self.layer_norm("final_norm", h)
        score = self.linear("head.coordinate.out",
                            F.silu(self.linear("head.coordinate.hidden", final_x)))
        # Translation projection: the per-cell mean is removed from the score.
        score = score - segment_mean(score, b.atom_cell, b.atom_count, b.cells)[b.atom_cell]
        pooled = segment_mean(final_x, b.atom_cell, b.atom_count, b.cells)
        lattice = self.linear("head.lattice.out", F.silu(self.linear("head.lattice.hidden", pooled)))
        out = {"coordinate_score": score, "lattice_noise": lattice}
        if arch["species_mode"] == "absorbing":
            out["species_logits"] = self.linear(
                "head.species.out", F.silu(self.linear("head.species.hidden", final_x)))
        return out


def batch_loss(b, out, weights):
    """core/train/loss.h: each cell weighs the same whatever its size,
    loss = 1/B sum_c [ w_c/(3 N_c) sum_i |score_i - target_i|^2 + w_l/6 |noise_c - eps_c|^2
                       + w_s/max(1, M_c) sum_{masked i} cross-entropy_i ].
    Returns (total, {part: tensor})."""
    per_cell = 1.0 / b.cells
    residual = out["coordinate_score"] - b.coordinate_target
    coordinates = (per_cell * weights["coordinates"]) * (
        residual.square().sum(dim=1) * b.coordinate_weight).sum()
    lattice = (per_cell * weights["lattice"] / 6.0) * (
        out["lattice_noise"] - b.lattice_target).square().sum()
    parts = {"coordinates": coordinates, "lattice": lattice}
    if "species_logits" in out:
        cross_entropy = F.cross_entropy(out["species_logits"], b.species_target, reduction="none")
        parts["species"] = (per_cell * weights["species"]) * (cross_entropy * b.species_weight).sum()
    total = sum(parts.values())
    return total, parts


def training_step(net, b, weights):
    """Forward, loss and backward: afterwards every parameter's .grad holds the batch gradient."""
    net.zero_grad()
    total, parts = batch_loss(b, net.forward(b), weights)
    total.backward()
    return total, parts


def forward_pass(net, b):
    with torch.inference_mode():
        return net.forward(b)


__all__ = ["read_dump", "time_embedding", "Batch", "TorchDenoiser", "batch_loss",
           "training_step", "forward_pass"]
