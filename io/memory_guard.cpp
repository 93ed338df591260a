#include "io/memory_guard.hpp"

#include <unistd.h>

#include <cstdio>

namespace aquiledger {

std::optional<double> physical_memory_bytes() {
  const long pages = sysconf(_SC_PHYS_PAGES);
  const long page_size = sysconf(_SC_PAGE_SIZE);
  if (pages <= 0 || page_size <= 0) return std::nullopt;
  return static_cast<double>(pages) * static_cast<double>(page_size);
}

std::optional<std::string> memory_refusal(double n_cells, double available_bytes) {
  const double needed = n_cells * bytes_per_cell_estimate;
  if (needed <= available_bytes) return std::nullopt;
  char text[256];
  std::snprintf(text, sizeof text,
                "a grid of %.0f cells needs about %.1f GiB (about 1 KiB per cell), but this "
                "machine has %.1f GiB of "
                "physical memory",
                n_cells, needed / 1073741824.0, available_bytes / 1073741824.0);
  return std::string(text);
}

}  // namespace aquiledger
