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

/// In a distributed run: another process could not write its part (that process reports
/// its own OutputError); thrown on the processes whose own writes succeeded.
class PeerOutputError : public OutputError {
 public:
  PeerOutputError() : OutputError("another process could not write its results") {}
};

}  // namespace aquiledger
