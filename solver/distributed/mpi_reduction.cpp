#include <mpi.h>
#include <petscsys.h>

#include <stdexcept>

#include "solver/distributed/petsc_engine.hpp"

namespace aquiledger {

namespace {

class MpiReduction final : public ResultReduction {
 public:
  explicit MpiReduction(MPI_Comm comm) : comm_(comm) {
    MPI_Comm_rank(comm_, &rank_);
    MPI_Comm_size(comm_, &size_);
  }
  void sum(std::span<double> values) override {
    MPI_Allreduce(MPI_IN_PLACE, values.data(), static_cast<int>(values.size()), MPI_DOUBLE, MPI_SUM,
                  comm_);
  }
  bool any(bool flag) override {
    int f = flag ? 1 : 0;
    MPI_Allreduce(MPI_IN_PLACE, &f, 1, MPI_INT, MPI_LOR, comm_);
    return f != 0;
  }
  int rank() const override { return rank_; }
  int n_ranks() const override { return size_; }

 private:
  MPI_Comm comm_;
  int rank_ = 0;
  int size_ = 1;
};

}  // namespace

PetscRuntime::PetscRuntime(int* argc, char*** argv) {
  // PETSc options come from the PETSC_OPTIONS environment variable (e.g. -ksp_monitor).
  (void)argc;
  (void)argv;
  if (PetscInitializeNoArguments() != 0) throw std::runtime_error("PETSc could not start");
  MPI_Comm_rank(PETSC_COMM_WORLD, &rank_);
  MPI_Comm_size(PETSC_COMM_WORLD, &n_ranks_);
  reduction_ = std::make_unique<MpiReduction>(PETSC_COMM_WORLD);
}

PetscRuntime::~PetscRuntime() {
  reduction_.reset();
  PetscFinalize();
}

}  // namespace aquiledger
