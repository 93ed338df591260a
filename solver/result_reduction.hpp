#pragma once
// How the processes of a distributed run combine their partial results. The recorder knows
// only this interface; the MPI implementation lives with the distributed engine
// (solver/distributed/), so neither io/ nor the serial solver needs MPI.
#include <span>

namespace aquiledger {

class ResultReduction {
 public:
  virtual ~ResultReduction() = default;
  /// Replaces each value by its sum over every process (the same on all of them).
  virtual void sum(std::span<double> values) = 0;
  /// True on every process when flag is true on any (also a barrier).
  virtual bool any(bool flag) = 0;
  virtual int rank() const = 0;
  virtual int n_ranks() const = 0;
};

}  // namespace aquiledger
