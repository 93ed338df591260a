#include "io/model_file/input_file_text.hpp"

#include <fstream>
#include <sstream>

#include "io/files/input_file_guard.hpp"

namespace aquiledger {

InputFileText read_input_file_text(const std::filesystem::path& path, std::uintmax_t max_bytes,
                                   const std::string& what) {
  InputFileText result;
  if (auto refusal = input_file_refusal(path, max_bytes)) {
    result.error = Diagnostic{Severity::error, path, 0, 0, "", what + " " + *refusal};
    return result;
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    result.error = Diagnostic{Severity::error, path, 0, 0, "", "cannot open the " + what};
    return result;
  }
  std::ostringstream text;
  text << in.rdbuf();
  result.text = std::move(text).str();
  return result;
}

}  // namespace aquiledger
