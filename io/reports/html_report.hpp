#pragma once
// A self-contained HTML page with Vega charts: the Vega library from Debian's libjs-vega is
// inlined at write time, so the page opens offline. When every chart has rendered, the
// element #render-status reads "ok" (or "error: ..." after a script error).
#include <filesystem>
#include <string>
#include <vector>

namespace aquiledger {

/// Folder of Debian's libjs-vega modules.
inline constexpr const char* vega_library_folder = "/usr/share/javascript/vega";

/// The Vega modules bundled into one script that defines window.vega (View, parse). Throws
/// ReadError naming the missing file and the package (libjs-vega) when it is absent.
std::string load_vega_library(const std::filesystem::path& folder = vega_library_folder);

class HtmlReport {
 public:
  explicit HtmlReport(std::string title);
  void add_heading(const std::string& text);
  /// Plain text, escaped.
  void add_paragraph(const std::string& text);
  /// A table of plain-text cells (escaped); fail_column: index of a pass/fail column to
  /// colour, or -1.
  void add_table(const std::vector<std::string>& header,
                 const std::vector<std::vector<std::string>>& rows, int fail_column = -1);
  /// A chart from a Vega spec (JSON text), with a caption.
  void add_chart(const std::string& caption, const std::string& vega_spec);
  int charts() const { return static_cast<int>(specs_.size()); }
  /// The whole page with the given Vega library inlined.
  std::string render(const std::string& vega_library) const;
  /// Loads the library (ReadError when it is missing) and writes the page atomically
  /// (OutputError when it cannot be written).
  void write(const std::filesystem::path& path) const;

 private:
  std::string title_;
  std::string body_;
  std::vector<std::string> specs_;
};

/// Escapes &, <, >, " for HTML text.
std::string html_escape(const std::string& text);

}  // namespace aquiledger
