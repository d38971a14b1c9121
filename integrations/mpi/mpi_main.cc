// nucleate-mpi: the commands of `nucleate` that gain from many processes, run under MPI:
//   mpirun -n P nucleate-mpi sample ...   the flags and job files of `nucleate sample`; each rank
//                                         samples its slice of the indices, rank 0 writes what a
//                                         serial run writes, byte for byte (mpi_sample.h).
//   mpirun -n P nucleate-mpi train ...    `nucleate train`, data-parallel: each rank computes its
//                                         share of every batch's gradient (mpi_collective.h);
//                                         rank 0 writes the checkpoint and the model.
// Every rank must get the same command line. Exit codes as `nucleate`; messages from rank 0 only.
#include <iostream>
#include <ostream>
#include <streambuf>
#include <string>

#include <mpi.h>

#include <CLI/CLI.hpp>

#include "mpi_collective.h"
#include "mpi_sample.h"
#include "nucleate/nucleate.h"
#include "sample_command.h"
#include "train_command.h"

namespace {

constexpr int kExitFailed = 1;
constexpr int kExitUsage = 2;

// Where ranks other than 0 send what rank 0 already says.
class NullBuffer : public std::streambuf {
 protected:
  int overflow(int c) override { return c; }
};

int Run(int argc, char** argv, int rank) {
  NullBuffer null_buffer;
  std::ostream null_stream(&null_buffer);
  std::ostream& out = rank == 0 ? std::cout : null_stream;
  std::ostream& err = rank == 0 ? std::cerr : null_stream;

  CLI::App app{"nucleate-mpi: nucleate's sampling and training spread over MPI ranks (run with mpirun)"};
  app.require_subcommand(1);
  std::function<int()> run;
  CLI::App* version = app.add_subcommand("version", "Print the library version");
  version->callback([&] {
    run = [&] {
      int ranks = 1;
      MPI_Comm_size(MPI_COMM_WORLD, &ranks);
      out << "nucleate " << nucleate_version() << " (ABI " << nucleate_abi_version() << "), "
          << ranks << " MPI ranks\n";
      return 0;
    };
  });
  nucleate::cli::AddSampleCommand(app, &run, nucleate::mpi::DistributedSampleCaller(MPI_COMM_WORLD));
  const nucleate::mpi::MpiCollective collective(MPI_COMM_WORLD);
  nucleate::cli::AddTrainCommand(app, &run, {collective.get(), rank == 0});
  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& help) {
    return app.exit(help, out, err);
  } catch (const CLI::ParseError& error) {
    app.exit(error, out, err);
    return kExitUsage;
  }
  try {
    return run();
  } catch (const CLI::ParseError& error) {
    err << "nucleate-mpi: " << error.get_name() << ": " << error.what() << '\n';
    return kExitUsage;
  } catch (const std::exception& error) {
    err << "nucleate-mpi: " << error.what() << '\n';
    return kExitFailed;
  }
}

}  // namespace

int main(int argc, char** argv) {
  MPI_Init(&argc, &argv);
  int rank = 0;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  const int code = Run(argc, argv, rank);
  MPI_Finalize();
  return code;
}
