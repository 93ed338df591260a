#pragma once
#include <stdexcept>
#include <string>

namespace aquiledger {

/// A result file or folder could not be written; the message names the path and the
/// operating system's reason.
class OutputError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

}  // namespace aquiledger
