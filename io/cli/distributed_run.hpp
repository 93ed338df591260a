#pragma once
// The engine `aquiledger run` computes with: the serial engine in this process, or (in a
// build with -DAQUILEDGER_WITH_PETSC=ON, `--engine petsc` under mpirun) one rank of the
// distributed engine. Neither MPI nor PETSc appears here.
#include <filesystem>
#include <memory>
#include <optional>
#include <string>

#include "io/model_file/model_reader.hpp"
#include "io/results/result_recorder.hpp"
#include "solver/simulation.hpp"

namespace aquiledger {

class RunEngine {
 public:
  virtual ~RunEngine() = default;
  /// The process that prints and writes the tables (rank 0).
  virtual bool root() const { return true; }
  /// A name for the summary ("serial", "petsc").
  virtual const char* name() const { return "serial"; }
  /// The rows of the per-cell inputs this process reads and holds (empty: every row).
  virtual BandOfGrid band_of() const { return {}; }
  /// Why this engine cannot run the model (empty when it can).
  virtual std::string unsupported(const Model&) const { return {}; }
  /// Collective in a distributed run: splits the grid and makes this process's recorder.
  virtual void make_recorder(const Model& model, const std::filesystem::path& folder,
                             std::optional<ResultRecorder>& recorder) {
    recorder.emplace(model, folder);
  }
  virtual RunResult run(const Model& model, ResultRecorder& recorder,
                        const SimulationOptions& options) {
    return run_simulation(model, recorder, options);
  }
  /// True on every process when flag is true on any (a distributed run decides together).
  virtual bool any(bool flag) { return flag; }
  /// The lowest rank on which flag is true, -1 when none (collective).
  virtual int lowest_rank_with(bool flag) { return flag ? 0 : -1; }
  /// This process's rank and the number of processes of the run (0 and 1 when serial).
  virtual int rank() const { return 0; }
  virtual int n_ranks() const { return 1; }
  /// "" for the serial engine, "rank 1 of 2: " for a distributed run's process (messages).
  virtual std::string process_label() const { return {}; }
  /// Ends the run on every process with this status after a failure on this process
  /// alone; the serial engine only returns the status.
  virtual int fail_everywhere(int status) { return status; }
};

/// One rank of the distributed engine; starts PETSc and MPI (only in a PETSc build).
std::unique_ptr<RunEngine> make_distributed_engine();

}  // namespace aquiledger
