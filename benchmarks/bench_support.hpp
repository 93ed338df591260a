#pragma once
// Small tools shared by the benchmark programs: medians, a STREAM-style bandwidth probe, and
// running a measurement in a forked child (its own peak memory, and a fresh OpenMP runtime:
// the GNU OpenMP runtime does not survive a fork once its thread pool exists, so the parent
// never opens a parallel region).
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <type_traits>
#include <vector>

namespace aquiledger::bench {

using Clock = std::chrono::steady_clock;

inline double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

inline double median(std::vector<double> v) {
  if (v.empty()) return 0.0;
  std::sort(v.begin(), v.end());
  const std::size_t n = v.size();
  return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

/// STREAM triad a = b + s c (McCalpin, 1995), best of several passes, with all threads:
/// bytes per second (three arrays of 8-byte values, write-allocate traffic not counted,
/// as in STREAM).
inline double triad_bandwidth() {
  const std::size_t n = std::size_t{1} << 24;  // 128 MiB per array, well beyond the caches
  std::vector<double> a(n, 0.0), b(n, 1.0), c(n, 2.0);
  double best = 1e30;
  for (int pass = 0; pass < 8; ++pass) {
    const auto t0 = Clock::now();
#pragma omp parallel for schedule(static)
    for (std::size_t i = 0; i < n; ++i) a[i] = b[i] + 3.0 * c[i];
    best = std::min(best, seconds_since(t0));
  }
  if (a[n / 2] != 7.0) std::fprintf(stderr, "triad check failed\n");
  return 3.0 * 8.0 * static_cast<double>(n) / best;
}

/// Runs f() in a child process and returns its trivially copyable result through a pipe;
/// a value-initialised result when the child fails.
template <class F>
auto run_in_child(F&& f) -> std::invoke_result_t<F> {
  using R = std::invoke_result_t<F>;
  static_assert(std::is_trivially_copyable_v<R>);
  std::fflush(stdout);
  int fd[2];
  if (pipe(fd) != 0) return R{};
  const pid_t pid = fork();
  if (pid < 0) return R{};
  if (pid == 0) {
    close(fd[0]);
    const R r = f();
    [[maybe_unused]] auto w = write(fd[1], &r, sizeof r);
    std::fflush(stdout);
    _exit(0);
  }
  close(fd[1]);
  R r{};
  std::size_t got = 0;
  auto* bytes = reinterpret_cast<char*>(&r);
  while (got < sizeof r) {
    const ssize_t k = read(fd[0], bytes + got, sizeof r - got);
    if (k <= 0) break;
    got += static_cast<std::size_t>(k);
  }
  close(fd[0]);
  int status = 0;
  waitpid(pid, &status, 0);
  if (got != sizeof r) return R{};
  return r;
}

}  // namespace aquiledger::bench
