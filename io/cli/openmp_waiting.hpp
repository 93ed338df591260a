#pragma once
// How OpenMP threads wait, set before the runtime loads: shared by the program (main.cpp) and
// the benchmark programs, so that their figures are those of the program as a user runs it.
#include <unistd.h>

#include <cstdlib>

namespace aquiledger {

/// OpenMP threads that finish a loop early wait for the others. GNU OpenMP's default is to
/// spin for a while first, which on a machine where another process keeps a core busy makes a
/// spinning thread compete with the thread it waits for (measured on a 13,000-cell switching
/// basin with 2 threads: 34.5 and 43.3 s beside a busy loop against 10.5 and 15.5 s waiting
/// passively, and 18.7 against 7.2 s on the idle machine; docs/performance.md). It also
/// competes with the single-threaded multigrid solve between two parallel loops (1e5-cell
/// switching basin, 2 threads: 0.27 to 0.72 s per step spinning against 0.14 to 0.16 s waiting
/// passively; docs/performance.md). The runtime reads its settings when it loads, before main,
/// so the program sets the policy and starts itself again, once; a policy the user set
/// (OMP_WAIT_POLICY or GOMP_SPINCOUNT) is kept.
inline void wait_passively_by_default(char** argv) {
  if (std::getenv("OMP_WAIT_POLICY") != nullptr || std::getenv("GOMP_SPINCOUNT") != nullptr) return;
  if (setenv("OMP_WAIT_POLICY", "passive", 1) != 0) return;
  execv("/proc/self/exe", argv);  // returns only on failure: run on with the default policy
}

}  // namespace aquiledger
