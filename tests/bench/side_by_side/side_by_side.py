"""Side-by-side benchmark: nucleate's denoiser against the same network in PyTorch, on the CPU.

1. `side_by_side_server MODEL dump DIR` writes the model's tensors, a fixed batch of 64 cells of
   20 atoms, and nucleate's forward outputs, training loss and parameter gradients.
2. Parity: the PyTorch network (denoiser_torch.py) loads the tensors and runs the same batch; every
   forward output, the loss and every parameter gradient must agree within a relative difference
   of 1e-4, measured per tensor as max|torch - nucleate| / max|nucleate|. Exits 1 otherwise.
3. Timing: `side_by_side_server MODEL serve THREADS` and PyTorch (torch.set_num_threads(THREADS))
   take turns, nucleate then torch, for each round; the medians, cells per second and the ratio
   torch time / nucleate time are printed. Only figures measured in this run are printed.

Usage: side_by_side.py --server PATH --model PATH [--threads N] [--rounds R] [--work DIR]
"""

import argparse
import os
import platform
import statistics
import subprocess
import sys
import tempfile
import time

import numpy as np
import torch

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import denoiser_torch as dt  # noqa: E402

PARITY_LIMIT = 1e-4
# Parameters whose gradient is exactly zero for every batch, and why.
ZERO_BY_CONSTRUCTION = {
    "head.coordinate.out.bias": "the score's per-cell mean is removed, which cancels a bias "
                                "added to every atom",
}


def relative_difference(ours, reference):
    """max|a - b| / max|b| over the tensor; 0 when both are all zero, inf when only b is."""
    a = np.asarray(ours, dtype=np.float64)
    b = np.asarray(reference, dtype=np.float64)
    if a.shape != b.shape:
        raise ValueError(f"shape {a.shape} differs from the reference's {b.shape}")
    scale = np.max(np.abs(b)) if b.size else 0.0
    difference = np.max(np.abs(a - b)) if b.size else 0.0
    if scale == 0.0:
        return 0.0 if difference == 0.0 else float("inf")
    return float(difference / scale)


def check_parity(manifest, groups):
    """Returns (passed, torch network, torch batch). Prints the worst difference per category."""
    net = dt.TorchDenoiser(manifest, groups["param"])
    batch = dt.Batch(manifest, groups["input"], groups["target"])
    rows = []  # (category, name, relative difference)
    rows.append(("input", "cell_inputs (time embedding + lattice numbers)",
                 relative_difference(batch.cell_inputs.numpy(), groups["input"]["cell_inputs"])))
    out = dt.forward_pass(net, batch)
    for name, reference in groups["output"].items():
        rows.append(("forward output", name, relative_difference(out[name].numpy(), reference)))
    total, parts = dt.training_step(net, batch, manifest["loss_weights"])
    loss = manifest["loss"]
    rows.append(("training loss", "total", relative_difference(total.item(), loss["total"])))
    for name, value in parts.items():
        rows.append(("training loss", name, relative_difference(value.item(), loss[name])))
    # A gradient that is exactly zero in exact arithmetic is rounding noise in both
    # implementations, and max|b| in the denominator makes any two noises look unequal. Such
    # tensors are compared against the largest gradient entry of the whole network instead, and
    # must themselves be zero to within float32 rounding (1e-6 of that scale).
    gradient_scale = max(float(np.max(np.abs(g))) for g in groups["grad"].values())
    for name in manifest["parameters"]:
        ours, reference = net.p[name].grad.numpy(), groups["grad"][name]
        if name in ZERO_BY_CONSTRUCTION:
            largest = max(float(np.max(np.abs(ours))), float(np.max(np.abs(reference))))
            value = float(np.max(np.abs(ours - reference))) / gradient_scale
            if largest > 1e-6 * gradient_scale:
                value = float("inf")
            print(f"  {name}: zero by construction ({ZERO_BY_CONSTRUCTION[name]}); largest entry "
                  f"{largest:.2e} in either, difference {value:.2e} of the largest gradient entry")
            rows.append(("gradient", name + " (zero by construction)", value))
        else:
            rows.append(("gradient", name, relative_difference(ours, reference)))

    print(f"parity: {len(rows)} comparisons, relative difference max|torch - nucleate| / "
          f"max|nucleate| per tensor, limit {PARITY_LIMIT:g}")
    for category in ("input", "forward output", "training loss", "gradient"):
        members = [r for r in rows if r[0] == category]
        worst = max(members, key=lambda r: r[2])
        print(f"  {category:15s} {len(members):3d} tensors, worst {worst[2]:.3e} ({worst[1]})")
    failed = [r for r in rows if not r[2] <= PARITY_LIMIT]
    worst = max(rows, key=lambda r: r[2])
    print(f"  worst overall: {worst[2]:.3e} ({worst[0]}: {worst[1]})")
    for category, name, value in failed:
        print(f"  FAILED {category} {name}: {value:.3e} > {PARITY_LIMIT:g}")
    print(f"  nucleate loss {loss['total']:.8f}, torch loss {total.item():.8f}")
    return not failed, net, batch


class NucleateServer:
    """side_by_side_server in serve mode: one request line in, elapsed seconds out."""

    def __init__(self, server, model, threads):
        self.process = subprocess.Popen([server, model, "serve", str(threads)],
                                        stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True)
        line = self.process.stdout.readline().strip()
        if line != "ready":
            self.process.kill()
            raise RuntimeError(f"side_by_side_server did not start (said {line!r})")

    def run(self, kind, repeats):
        self.process.stdin.write(f"{kind} {repeats}\n")
        self.process.stdin.flush()
        line = self.process.stdout.readline().strip()
        try:
            return float(line)
        except ValueError:
            raise RuntimeError(f"side_by_side_server answered {kind!r} with {line!r}") from None

    def close(self):
        if self.process.poll() is None:
            self.process.stdin.write("quit\n")
            self.process.stdin.close()
            self.process.wait(timeout=60)


def torch_run(kind, repeats, net, batch, weights):
    start = time.perf_counter()
    for _ in range(repeats):
        if kind == "forward":
            dt.forward_pass(net, batch)
        else:
            dt.training_step(net, batch, weights)
    return time.perf_counter() - start


def torch_gemm_rate(rows, width, repeats=50):
    """torch's float32 matrix product rate in GFLOP/s (at its current thread count)."""
    a, b = torch.randn(rows, width), torch.randn(width, width)
    torch.mm(a, b)
    start = time.perf_counter()
    for _ in range(repeats):
        torch.mm(a, b)
    return 2.0 * rows * width * width * repeats / (time.perf_counter() - start) / 1e9


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--server", required=True, help="the side_by_side_server program")
    parser.add_argument("--model", required=True, help="a nucleate model bundle")
    parser.add_argument("--threads", type=int, default=os.cpu_count() or 1)
    parser.add_argument("--rounds", type=int, default=5, help="timed turns of each (at least 5)")
    parser.add_argument("--forward-repeats", type=int, default=4, help="forward passes per turn")
    parser.add_argument("--train-repeats", type=int, default=2, help="training steps per turn")
    parser.add_argument("--work", help="directory for the dump (default: a temporary one)")
    args = parser.parse_args()
    if args.threads < 1:
        parser.error(f"--threads must be at least 1, got {args.threads}")
    if args.rounds < 5:
        parser.error(f"--rounds must be at least 5, got {args.rounds}")
    if args.forward_repeats < 1 or args.train_repeats < 1:
        parser.error("--forward-repeats and --train-repeats must be at least 1")

    work = args.work or tempfile.mkdtemp(prefix="side-by-side-")
    dump = os.path.join(work, "dump")
    subprocess.run([args.server, args.model, "dump", dump], check=True)
    manifest, groups = dt.read_dump(dump)
    arch = manifest["architecture"]
    cells, edges = manifest["cells"], manifest["edges"]
    print(f"model {args.model}: hidden {arch['hidden']}, {arch['layers']} layers, species "
          f"{arch['species_mode']}, {len(arch['elements'])} elements")
    print(f"batch: {cells} cells x {manifest['atoms_per_cell']} atoms, {edges} edges; nucleate "
          f"runs micro-batches of {manifest['micro_batch_cells']} cells, torch the whole batch")

    torch.set_num_threads(args.threads)
    passed, net, batch = check_parity(manifest, groups)
    if not passed:
        print("parity FAILED: no timings")
        return 1

    print(f"torch {torch.__version__} ({torch.__config__.parallel_info().splitlines()[-1].strip()}"
          f", OMP_WAIT_POLICY {os.environ.get('OMP_WAIT_POLICY', 'unset')}, BLAS {torch_blas()}), "
          f"numpy {np.__version__}, Python {platform.python_version()}, {args.threads} threads each")
    # Other work on the machine takes cores from both sides, and from OpenMP's lock-step teams
    # more than from work handed out one micro-batch at a time: say how busy it was.
    print(f"load average before timing: {load_average()} on {os.cpu_count()} hardware threads")
    weights = manifest["loss_weights"]
    server = NucleateServer(args.server, args.model, args.threads)
    results = {}
    try:
        # Context: each side's float32 matrix-multiply rate on one thread, on the shape of a
        # micro-batch's message product (nucleate's largest products).
        rows, width = edges // (cells // manifest["micro_batch_cells"]), arch["hidden"]
        flop = 2.0 * rows * width * width
        server.run("gemm", 5)
        nucleate_rate = flop * 50 / server.run("gemm", 50) / 1e9
        torch.set_num_threads(1)
        torch_rate = torch_gemm_rate(rows, width)
        torch.set_num_threads(args.threads)
        print(f"float32 matrix product {rows} x {width} x {width}, one thread: nucleate (Eigen, "
              f"this build) {nucleate_rate:.1f} GFLOP/s, torch {torch_rate:.1f} GFLOP/s")
        for kind, repeats in (("forward", args.forward_repeats), ("train", args.train_repeats)):
            server.run(kind, 1)  # warm-up: caches, page faults, thread pools
            torch_run(kind, 1, net, batch, weights)
            times = {"nucleate": [], "torch": []}
            for round_number in range(1, args.rounds + 1):
                times["nucleate"].append(server.run(kind, repeats) / repeats)
                times["torch"].append(torch_run(kind, repeats, net, batch, weights) / repeats)
                print(f"  {kind} round {round_number}/{args.rounds}: nucleate "
                      f"{times['nucleate'][-1]:.4f} s, torch {times['torch'][-1]:.4f} s", flush=True)
            results[kind] = times
    finally:
        server.close()

    print(f"load average after timing: {load_average()}")
    print(f"\nmedians over {args.rounds} alternating rounds, {args.threads} threads, "
          f"one batch of {cells} cells:")
    print(f"{'':15s} {'nucleate s':>11s} {'torch s':>11s} {'nucleate cells/s':>17s} "
          f"{'torch cells/s':>14s} {'torch/nucleate':>15s}")
    for kind, label in (("forward", "forward pass"), ("train", "training step")):
        ours = statistics.median(results[kind]["nucleate"])
        theirs = statistics.median(results[kind]["torch"])
        print(f"{label:15s} {ours:11.4f} {theirs:11.4f} {cells / ours:17.1f} "
              f"{cells / theirs:14.1f} {theirs / ours:15.2f}")
    return 0


def load_average():
    """The 1-minute load average (processes running or waiting for a core)."""
    return f"{os.getloadavg()[0]:.2f}"


def torch_blas():
    """The BLAS library torch's process has mapped (Debian's torch calls libblas.so.3, whichever
    implementation the alternatives system points it at)."""
    try:
        with open("/proc/self/maps", encoding="utf-8") as maps:
            paths = {line.split()[-1] for line in maps if "blas" in line.lower()}
    except OSError:
        return "unknown"
    resolved = sorted({os.path.realpath(p) for p in paths
                       if p.startswith("/") and "lapack" not in os.path.basename(p)})
    return ", ".join(resolved) if resolved else "none mapped"


if __name__ == "__main__":
    sys.exit(main())
