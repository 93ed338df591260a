#pragma once
// Refuses a grid this machine cannot hold, before anything per cell is allocated.
#include <cstdint>
#include <optional>
#include <string>

namespace aquiledger {

/// Rough bytes per cell for the solver's state, matrix and factorisation: about 1 KiB (a
/// million-cell switching basin peaked at 1048 B per cell, docs/performance.md).
inline constexpr double bytes_per_cell_estimate = 1024.0;

/// Physical memory of this machine in bytes, if the system tells.
std::optional<double> physical_memory_bytes();

/// The memory a run may use: the least of the physical memory, the control group's limit
/// (/sys/fs/cgroup/memory.max, as in a container) and AQUILEDGER_MEMORY_LIMIT_MB when set.
std::optional<double> usable_memory_bytes();

/// Largest run accepted, in cell-steps (active cells x time steps): 1e12. At the roughly
/// 5 microseconds per cell-step measured for tests/data/robust/restart.toml on the 2-core
/// test machine (Newton, factorisation and output included) that is two months of computing.
inline constexpr double max_cell_steps = 1.0e12;

/// An explanation when n_cells x n_steps exceeds max_cell_steps, else nullopt.
std::optional<std::string> work_refusal(double n_cells, double n_steps);

/// An explanation when n_cells need more memory than `available` bytes, else nullopt.
/// `band`: the cells are one process's band of rows of a distributed run.
std::optional<std::string> memory_refusal(double n_cells, double available_bytes,
                                          bool band = false);

}  // namespace aquiledger
