// Compiled only with -DAQUILEDGER_WITH_PETSC=ON.
#include "io/cli/distributed_run.hpp"

#include <cstdio>
#include <string>
#include <vector>

#include "solver/distributed/petsc_engine.hpp"

namespace aquiledger {

namespace {

class PetscRunEngine final : public RunEngine {
 public:
  PetscRunEngine() : runtime_(nullptr, nullptr) {}
  bool root() const override { return runtime_.rank() == 0; }
  BandOfGrid band_of() const override {
    // More ranks than rows is refused once the model is read (unsupported); until then the
    // rank reads every row.
    return [ranks = runtime_.n_ranks(), rank = runtime_.rank()](int n_rows, int n_cols) {
      return ranks <= n_rows ? rank_part(n_rows, n_cols, ranks, rank)
                             : GridPart{n_cols, {0, n_rows}, {0, n_rows}};
    };
  }
  const char* name() const override { return "petsc"; }
  std::string unsupported(const Model& model) const override {
    if (model.output.geotiff)
      return "[output].geotiff is written by the serial engine only; run without --engine petsc "
             "or leave geotiff out (the .pvtr field sets hold the same fields)";
    if (model.aquifer.interbeds && model.aquifer.interbeds->delay)
      return "[interbeds] delay beds are solved by the serial engine only; run without "
             "--engine petsc";
    if (runtime_.n_ranks() <= model.grid.n_rows()) return {};
    return "the distributed engine gives each rank at least one grid row: " +
           std::to_string(runtime_.n_ranks()) + " ranks for " +
           std::to_string(model.grid.n_rows()) + " rows";
  }
  void make_recorder(const Model& model, const std::filesystem::path& folder,
                     std::optional<ResultRecorder>& recorder) override {
    engine_ = std::make_unique<DistributedEngine>(model);
    recorder.emplace(model, folder, engine_->part(), runtime_.reduction());
  }
  RunResult run(const Model&, ResultRecorder& recorder, const SimulationOptions& options) override {
    return engine_->run(recorder, options);
  }
  int rank() const override { return runtime_.rank(); }
  int n_ranks() const override { return runtime_.n_ranks(); }
  bool any(bool flag) override { return runtime_.reduction().any(flag); }
  int lowest_rank_with(bool flag) override {
    std::vector<double> flags(static_cast<std::size_t>(runtime_.n_ranks()), 0.0);
    flags[static_cast<std::size_t>(runtime_.rank())] = flag ? 1.0 : 0.0;
    runtime_.reduction().sum(flags);
    for (std::size_t r = 0; r < flags.size(); ++r)
      if (flags[r] > 0.0) return static_cast<int>(r);
    return -1;
  }
  std::string process_label() const override {
    return "rank " + std::to_string(runtime_.rank()) + " of " + std::to_string(runtime_.n_ranks()) +
           ": ";
  }
  int fail_everywhere(int status) override {
    std::fflush(stdout);
    std::fflush(stderr);
    if (runtime_.n_ranks() > 1) PetscRuntime::abort_all(status);
    return status;
  }

 private:
  PetscRuntime runtime_;
  std::unique_ptr<DistributedEngine> engine_;  // destroyed before the runtime
};

}  // namespace

std::unique_ptr<RunEngine> make_distributed_engine() { return std::make_unique<PetscRunEngine>(); }

}  // namespace aquiledger
