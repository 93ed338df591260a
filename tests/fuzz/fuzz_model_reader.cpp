// libFuzzer target for the model reader: every input is TOML text read as though it were a
// model file inside a copy of one of the project's model folders (so that array files named
// by the seeds exist). A first line "#@FOLDER" (a TOML comment) picks the folder, FOLDER being
// the source-relative path of a folder that holds a seed model; otherwise the first folder is
// used. The reader must never crash, hang, leak or trip a sanitizer, whatever the input.
//
// Environment: AQUILEDGER_FUZZ_ROOT, the folder that mirrors the seed folders (set by
// tests/fuzz/build_and_run.sh).
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <string_view>

#include "io/model_file/model_reader.hpp"
#include "tests/fuzz/fuzz_folder.hpp"

namespace {
std::filesystem::path fuzz_root;
}

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  const char* root = std::getenv("AQUILEDGER_FUZZ_ROOT");
  fuzz_root = root ? root : ".";
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const std::filesystem::path model = fuzz_root / fuzz_test::folder_of(text) / "model.toml";
  const aquiledger::ReadResult result = aquiledger::read_model_text(text, model);
  // Touch the result so that nothing is optimised away: a usable model has cells.
  if (result.ok() && result.model->grid.n_cells() <= 0) std::abort();
  return 0;
}
