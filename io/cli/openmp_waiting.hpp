#pragma once
// How OpenMP threads wait, set before the runtime loads: shared by the program (main.cpp) and
// the benchmark programs, so that their figures are those of the program as a user runs it.
#include <alloca.h>
#include <unistd.h>

#include <cstring>

namespace aquiledger {

/// OpenMP threads that finish a loop early wait for the others. GNU OpenMP's default is to
/// spin for a while first, which on a machine where another process keeps a core busy makes a
/// spinning thread compete with the thread it waits for (measured on a 13,000-cell switching
/// basin with 2 threads: 34.5 and 43.3 s beside a busy loop against 10.5 and 15.5 s waiting
/// passively, and 18.7 against 7.2 s on the idle machine; docs/performance.md). It also
/// competes with the single-threaded multigrid solve between two parallel loops (1e5-cell
/// switching basin, 2 threads: 0.27 to 0.72 s per step spinning against 0.14 to 0.16 s waiting
/// passively; docs/performance.md). The runtime reads its settings in its initialiser, before
/// main, so the program starts itself again once with OMP_WAIT_POLICY=passive added to its
/// environment; a policy the user set (OMP_WAIT_POLICY or GOMP_SPINCOUNT) is kept.
///
/// Called from the program's .preinit_array (AQUILEDGER_WAIT_PASSIVELY_BY_DEFAULT below): the
/// dynamic loader calls those functions with (argc, argv, envp) after mapping and relocating
/// the libraries but before any library's initialiser, the C library's included (System V ABI
/// and glibc's ld.so; from memory, and seen with LD_DEBUG=libs: "calling preinit" comes before
/// "calling init: libc.so.6"). So the first start pays only the loading, none of the
/// initialisers (GNU OpenMP, Open MPI, VTK, the C++ run time) nor main's set-up
/// (docs/performance.md, "Threads on a shared machine"). Setting the variable there with
/// setenv instead does not work: the C library's initialiser, which runs after, points the
/// environment back at the one the kernel gave. The C library not being initialised yet, this
/// only reads envp and calls execve (a system call).
inline void restart_waiting_passively(int /*argc*/, char** argv, char** envp) noexcept {
  if (envp == nullptr) return;
  std::size_t n = 0;
  for (; envp[n] != nullptr; ++n)
    if (std::strncmp(envp[n], "OMP_WAIT_POLICY=", 16) == 0 ||
        std::strncmp(envp[n], "GOMP_SPINCOUNT=", 15) == 0)
      return;
  // The environment's pointers and one more, on this stack frame (execve copies them).
  auto** env = static_cast<char**>(alloca((n + 2) * sizeof(char*)));
  std::memcpy(env, envp, n * sizeof(char*));
  static char passive[] = "OMP_WAIT_POLICY=passive";
  env[n] = passive;
  env[n + 1] = nullptr;
  execve("/proc/self/exe", argv, env);  // returns only on failure: run on with the default policy
}

/// A .preinit_array entry: called by the dynamic loader with main's argc, argv and envp.
using PreinitFunction = void (*)(int, char**, char**);

}  // namespace aquiledger

/// In the file of a program's main: restart_waiting_passively as a .preinit_array entry (only an
/// executable's entries are called, and only once each).
#define AQUILEDGER_WAIT_PASSIVELY_BY_DEFAULT                                             \
  [[gnu::used, gnu::section(".preinit_array")]] static const aquiledger::PreinitFunction \
      aquiledger_passive_waiting_entry = &aquiledger::restart_waiting_passively
