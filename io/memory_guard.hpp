#pragma once
// Refuses a grid this machine cannot hold, before anything per cell is allocated.
#include <cstdint>
#include <optional>
#include <string>

namespace aquiledger {

/// Rough bytes per cell for the solver's state, matrix and factorisation (about 1 KiB; the
/// direct factorisation of a 1000 x 1000 grid took ~770 MB, see /work/shared/deps.md).
inline constexpr double bytes_per_cell_estimate = 1024.0;

/// Physical memory of this machine in bytes, if the system tells.
std::optional<double> physical_memory_bytes();

/// An explanation when n_cells need more memory than `available` bytes, else nullopt.
std::optional<std::string> memory_refusal(double n_cells, double available_bytes);

}  // namespace aquiledger
