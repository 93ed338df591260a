#include <mpi.h>
#include <petscsys.h>

#include <cstdlib>
#include <stdexcept>
#include <string>

#include "solver/distributed/petsc_engine.hpp"

namespace aquiledger {

namespace {

void check_mpi(int code, const char* what) {
  if (code != MPI_SUCCESS) throw std::runtime_error(std::string("MPI failed: ") + what);
}

class MpiReduction final : public ResultReduction {
 public:
  explicit MpiReduction(MPI_Comm comm) : comm_(comm) {
    check_mpi(MPI_Comm_rank(comm_, &rank_), "MPI_Comm_rank");
    check_mpi(MPI_Comm_size(comm_, &size_), "MPI_Comm_size");
  }
  void sum(std::span<double> values) override {
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, values.data(), static_cast<int>(values.size()),
                            MPI_DOUBLE, MPI_SUM, comm_),
              "MPI_Allreduce (result sums)");
  }
  bool any(bool flag) override {
    int f = flag ? 1 : 0;
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, &f, 1, MPI_INT, MPI_LOR, comm_),
              "MPI_Allreduce (any process)");
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
  check_mpi(MPI_Comm_rank(PETSC_COMM_WORLD, &rank_), "MPI_Comm_rank");
  check_mpi(MPI_Comm_size(PETSC_COMM_WORLD, &n_ranks_), "MPI_Comm_size");
  reduction_ = std::make_unique<MpiReduction>(PETSC_COMM_WORLD);
}

PetscRuntime::~PetscRuntime() {
  reduction_.reset();
  PetscFinalize();  // its code is not checked: a destructor has no one to report to
}

void PetscRuntime::abort_all(int status) {
  // Every rank of the run ends with this status; mpirun reports which rank asked.
  MPI_Abort(PETSC_COMM_WORLD, status);
  std::_Exit(status);  // not reached
}

}  // namespace aquiledger
