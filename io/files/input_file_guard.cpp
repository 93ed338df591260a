#include "io/files/input_file_guard.hpp"

#include <fmt/format.h>

namespace aquiledger {

namespace {

std::string show_bytes(double bytes) {
  if (bytes >= 1073741824.0) return fmt::format("{:.1f} GiB", bytes / 1073741824.0);
  if (bytes >= 1048576.0) return fmt::format("{:.1f} MiB", bytes / 1048576.0);
  return fmt::format("{:.0f} bytes", bytes);
}

}  // namespace

std::uintmax_t max_array_file_bytes(double n_values) {
  const double bytes = 64.0 * std::max(n_values, 0.0) + 1048576.0;
  return bytes >= 1.8e19 ? UINTMAX_MAX : static_cast<std::uintmax_t>(bytes);
}

std::optional<std::string> input_file_refusal(const std::filesystem::path& path,
                                              std::uintmax_t max_bytes) {
  std::error_code ec;
  const auto status = std::filesystem::status(path, ec);
  if (ec || !std::filesystem::exists(status)) return std::nullopt;
  if (!std::filesystem::is_regular_file(status))
    return fmt::format(
        "'{}' is not a regular file (a folder, device or pipe cannot be read as input)",
        path.string());
  const std::uintmax_t size = std::filesystem::file_size(path, ec);
  if (ec) return std::nullopt;
  if (size > max_bytes)
    return fmt::format("'{}' is {}, more than the {} its content can need; it was not read",
                       path.string(), show_bytes(static_cast<double>(size)),
                       show_bytes(static_cast<double>(max_bytes)));
  return std::nullopt;
}

}  // namespace aquiledger
