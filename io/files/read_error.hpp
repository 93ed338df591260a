#pragma once
#include <stdexcept>

namespace aquiledger {

/// A file the program reads back is missing or cannot be parsed: a results folder's tables
/// (`report`, `sources`), or the Vega library the HTML pages inline. The message names the
/// path, and the line and column where known. (A model file's problems are diagnostics of
/// io/model_file/, never this.)
class ReadError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

}  // namespace aquiledger
