// nucleate's half of the side-by-side benchmark against a PyTorch version of the same denoiser
// (tests/bench/side_by_side/README.md). Loads a model bundle through core (no C ABI method: the
// ABI does not grow for a benchmark), builds the benchmark's fixed batch of 64 cells of 20 atoms,
// and either
//   side_by_side_server MODEL dump DIR       writes tensors, inputs, outputs, loss and gradients
//   side_by_side_server MODEL serve THREADS  times work asked for on stdin:
//       "forward N"  N forward passes over the batch
//       "train N"    N training steps: forward, loss and backward (the gradient; no optimiser
//                    update, see side_by_side_network.h)
//       "gemm N"     N Eigen float32 matrix products on one thread, of the shape of a
//                    micro-batch's message product (edges x hidden times hidden x hidden): the
//                    matrix-multiply rate of this build, for context
//       "quit"       (or end of input) exits
//     and prints one line per request: the elapsed wall seconds, or "error: ..." for a bad line.
//     It prints "ready" once the batch is built, so a driver can alternate implementations with
//     set-up kept out of the timings.
#include <chrono>
#include <cstdio>
#include <iostream>
#include <sstream>
#include <string>

#include "core/common/error.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/denoiser.h"
#include "tests/bench/side_by_side/side_by_side_batch.h"
#include "tests/bench/side_by_side/side_by_side_dump.h"
#include "tests/bench/side_by_side/side_by_side_network.h"

namespace {

using namespace nucleate;

constexpr int kMaxThreads = 1024;
constexpr long kMaxRepeats = 1000000;

int Usage() {
  std::cerr << "usage: side_by_side_server MODEL dump DIR\n"
               "       side_by_side_server MODEL serve THREADS   (then 'forward N', 'train N', "
               "'gemm N', 'quit' on stdin)\n";
  return 2;
}

// The tensors must be exactly those of the network the architecture describes.
model::ModelBundle LoadBundle(const std::string& path) {
  return model::LoadModelBundle(path, {}, [](const model::Architecture& a) {
    return model::Denoiser(a).layout();
  });
}

// A whole decimal number in [low, high], or InvalidArgument naming `field`.
long ParseCount(const std::string& text, const std::string& field, long low, long high) {
  std::size_t used = 0;
  long value = 0;
  try {
    value = std::stol(text, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used == 0 || used != text.size() || value < low || value > high) {
    throw InvalidArgument(field, "'" + text + "' is not a whole number in " +
                                     std::to_string(low) + ".." + std::to_string(high));
  }
  return value;
}

// The message product's shape with fixed operands, multiplied on request.
struct MessageProduct {
  model::nn::Matrix<float> a, b, c;
  MessageProduct(int rows, int width)
      : a(model::nn::Matrix<float>::Random(rows, width)),
        b(model::nn::Matrix<float>::Random(width, width)),
        c(rows, width) {}
  void Multiply() { c.noalias() = a * b; }
};

int Serve(bench::SideBySideNetwork* network, MessageProduct* gemm) {
  std::cout << "ready" << std::endl;
  std::string line;
  for (long number = 1; std::getline(std::cin, line); ++number) {
    std::istringstream words(line);
    std::string command, count_text, extra;
    words >> command >> count_text >> extra;
    if (command == "quit") return 0;
    try {
      const std::string field = "stdin line " + std::to_string(number);
      if ((command != "forward" && command != "train" && command != "gemm") ||
          count_text.empty() || !extra.empty()) {
        throw InvalidArgument(field,
                              "'" + line + "' is not 'forward N', 'train N', 'gemm N' or 'quit'");
      }
      const long repeats = ParseCount(count_text, field + ": N", 1, kMaxRepeats);
      const auto start = std::chrono::steady_clock::now();
      for (long r = 0; r < repeats; ++r) {
        if (command == "forward") {
          network->Forward();
        } else if (command == "train") {
          network->Gradient();
        } else {
          gemm->Multiply();
        }
      }
      const double seconds =
          std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
      char text[32];
      std::snprintf(text, sizeof text, "%.9f", seconds);
      std::cout << text << std::endl;
    } catch (const std::exception& e) {
      std::cout << "error: " << e.what() << std::endl;
    }
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 4) return Usage();
  const std::string model_path = argv[1], mode = argv[2], argument = argv[3];
  if (mode != "dump" && mode != "serve") return Usage();
  try {
    const int threads =
        mode == "serve" ? static_cast<int>(ParseCount(argument, "THREADS", 1, kMaxThreads)) : 1;
    const model::ModelBundle bundle = LoadBundle(model_path);
    const bench::SideBySideBatch batch = bench::BuildSideBySideBatch(bundle);
    bench::SideBySideNetwork network(bundle, batch, threads);
    if (mode == "dump") {
      bench::DumpSideBySide(bundle, batch, &network, argument);
      std::cerr << "dump written to " << argument << " (" << batch.whole.atoms() << " atoms, "
                << batch.whole.edges() << " edges)\n";
      return 0;
    }
    MessageProduct gemm(batch.micro.front().edges(), bundle.architecture.hidden);
    return Serve(&network, &gemm);
  } catch (const std::exception& e) {
    std::cerr << "side_by_side_server: " << e.what() << "\n";
    return 1;
  }
}
