#include "io/model_file/memory_guard.hpp"

#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <string>

namespace aquiledger {

std::optional<double> physical_memory_bytes() {
  const long pages = sysconf(_SC_PHYS_PAGES);
  const long page_size = sysconf(_SC_PAGE_SIZE);
  if (pages <= 0 || page_size <= 0) return std::nullopt;
  return static_cast<double>(pages) * static_cast<double>(page_size);
}

std::optional<double> usable_memory_bytes() {
  std::optional<double> limit = physical_memory_bytes();
  auto take = [&](double bytes) {
    if (bytes > 0.0 && (!limit || bytes < *limit)) limit = bytes;
  };
  std::ifstream cgroup("/sys/fs/cgroup/memory.max");
  std::string text;
  if (cgroup >> text && text != "max") {
    char* end = nullptr;
    const double bytes = std::strtod(text.c_str(), &end);
    if (end && *end == '\0') take(bytes);
  }
  if (const char* env = std::getenv("AQUILEDGER_MEMORY_LIMIT_MB")) {
    char* end = nullptr;
    const double mb = std::strtod(env, &end);
    if (end != env && *end == '\0') take(mb * 1048576.0);
  }
  return limit;
}

std::optional<std::string> work_refusal(double n_cells, double n_steps) {
  const double work = n_cells * n_steps;
  if (work <= max_cell_steps) return std::nullopt;
  char text[320];
  std::snprintf(
      text, sizeof text,
      "%.0f cells over %.0f time steps make %.3g cell-steps, about %.0f days of computing at "
      "5 microseconds per cell-step; at most %.0g cell-steps are accepted",
      n_cells, n_steps, work, work * 5e-6 / 86400.0, max_cell_steps);
  return std::string(text);
}

std::optional<std::string> memory_refusal(double n_cells, double available_bytes, bool band) {
  const double needed = n_cells * bytes_per_cell_estimate;
  if (needed <= available_bytes) return std::nullopt;
  char text[320];
  std::snprintf(text, sizeof text,
                "%s %.0f cells needs about %.1f GiB (about 1 KiB per cell), but only %.1f GiB "
                "of memory is usable here (the least of the physical memory, the control-group "
                "limit and AQUILEDGER_MEMORY_LIMIT_MB)",
                band ? "this process's band of rows of" : "a grid of", n_cells,
                needed / 1073741824.0, available_bytes / 1073741824.0);
  return std::string(text);
}

}  // namespace aquiledger
