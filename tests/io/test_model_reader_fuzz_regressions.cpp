// Inputs found by the model-reader fuzzer (tests/fuzz/build_and_run.sh), kept so that a
// fixed fault stays fixed. Each file in tests/data/fuzz/ is read as the fuzzer read it (in
// the seed folder its first line "#@FOLDER" names, tests/fuzz/fuzz_folder.hpp). Every one is
// invalid, so the reader must reject it with at least one error diagnostic, without
// throwing; under the sanitizer build (AQUILEDGER_SANITIZE) the read must also be free of
// undefined behaviour and memory errors, which is how the faults first showed.
#include <algorithm>
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "fuzz/fuzz_folder.hpp"
#include "io/model_file/model_reader.hpp"

namespace {

std::string read_bytes(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

bool has_error(const aquiledger::ReadResult& result) {
  return std::any_of(
      result.diagnostics.begin(), result.diagnostics.end(),
      [](const aquiledger::Diagnostic& d) { return d.severity == aquiledger::Severity::error; });
}

}  // namespace

TEST_CASE("every input the fuzzer found is rejected cleanly", "[io][fuzz]") {
  const std::filesystem::path folder = std::filesystem::path(AQUILEDGER_TEST_DATA_DIR) / "fuzz";
  std::vector<std::filesystem::path> inputs;
  for (const auto& entry : std::filesystem::directory_iterator(folder))
    if (entry.is_regular_file()) inputs.push_back(entry.path());
  std::sort(inputs.begin(), inputs.end());
  REQUIRE(inputs.size() >= 4);  // the inputs found so far (docs/robustness.md)
  for (const auto& input : inputs) {
    INFO(input.filename().string());
    const std::string text = read_bytes(input);
    const std::filesystem::path as_if =
        std::filesystem::path(AQUILEDGER_SOURCE_DIR) / fuzz_test::folder_of(text) / "model.toml";
    aquiledger::ReadResult result;
    REQUIRE_NOTHROW(result = aquiledger::read_model_text(text, as_if));
    CHECK_FALSE(result.ok());
    CHECK(has_error(result));
  }
}

TEST_CASE("an array holding a value below 1 is shown in a message", "[io][fuzz]") {
  // TOML++ 3.3's formatter took log10(0.1) = -1 as an unsigned count; our own rendering
  // shows the array as written.
  const std::string text = "[grid]\nnrow = 2\nncol = [0.0, 0.1]\ndx = 1.0\ndy = 1.0\n";
  const auto result = aquiledger::read_model_text(text, "/nonexistent/model.toml");
  REQUIRE_FALSE(result.ok());
  const bool shown = std::any_of(result.diagnostics.begin(), result.diagnostics.end(),
                                 [](const aquiledger::Diagnostic& d) {
                                   return d.message.find("[0, 0.1]") != std::string::npos;
                                 });
  CHECK(shown);
}
