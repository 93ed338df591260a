#include "io/reports/html_report.hpp"

#include <fstream>
#include <sstream>

#include "io/files/atomic_file.hpp"
#include "io/files/output_error.hpp"
#include "io/files/read_error.hpp"

namespace aquiledger {

namespace {

/// The modules a static chart needs (Debian ships Vega as separate UMD modules and no
/// single bundle). vega-functions asks for "vega-selections", shipped as vega-selection.
constexpr const char* vega_modules[] = {
    "vega-util",       "vega-canvas",    "vega-time",           "vega-format",
    "vega-loader",     "vega-dataflow",  "vega-scale",          "vega-scenegraph",
    "vega-expression", "vega-selection", "vega-statistics",     "vega-event-selector",
    "vega-functions",  "vega-parser",    "vega-runtime",        "vega-view",
    "vega-transforms", "vega-encode",    "vega-view-transforms"};

std::string read_text(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw ReadError("cannot read " + path.string() +
                    ": the HTML report needs Vega from Debian's libjs-vega package "
                    "(apt-get install libjs-vega)");
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

const char* page_style = R"(
body { font-family: "DejaVu Sans", Helvetica, Arial, sans-serif; margin: 2em auto; max-width: 980px;
       color: #1d2b33; background: #fbfaf6; }
h1 { font-size: 1.5em; border-bottom: 3px solid #1b6f7a; padding-bottom: .3em; }
h2 { font-size: 1.15em; color: #1b6f7a; margin-top: 2em; }
figure { margin: 1em 0 2em 0; background: #fff; border: 1px solid #e3e0d6; padding: .6em; }
figcaption { font-size: .9em; color: #4b5a62; margin-bottom: .4em; }
table { border-collapse: collapse; font-size: .85em; }
td, th { border: 1px solid #d8d4c8; padding: .25em .6em; text-align: left; }
th { background: #eef3f3; }
td.pass { color: #1c6b2b; font-weight: bold; } td.fail { color: #a4161a; font-weight: bold; }
#render-status { display: none; }
#render-status.error { display: block; color: #a4161a; font-weight: bold; }
)";

}  // namespace

std::string html_escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

std::string load_vega_library(const std::filesystem::path& folder) {
  std::string js =
      "(function(){var defs={},cache={};\n"
      "function req(n){if(n==='vega-selections')n='vega-selection';"
      "if(cache[n])return cache[n].exports;if(!defs[n])throw new Error('Vega module '+n+' "
      "missing');"
      "var m={exports:{}};cache[n]=m;defs[n].call(window,m.exports,m,req);return m.exports;}\n";
  for (const char* name : vega_modules) {
    std::string code = read_text(folder / (std::string(name) + ".min.js"));
    // Keep the inlined code from closing the script element early.
    for (std::size_t p = code.find("</script"); p != std::string::npos;
         p = code.find("</script", p + 3))
      code.replace(p, 2, "<\\/");
    js += "defs['" + std::string(name) + "']=function(exports,module,require){\n" + code + "\n};\n";
  }
  js +=
      "var df=req('vega-dataflow');"
      "Object.assign(df.transforms,req('vega-transforms'),req('vega-view-transforms'),req('vega-"
      "encode'));"
      "window.vega=Object.assign({},req('vega-util'),req('vega-scale'),req('vega-parser'),"
      "req('vega-view'),{transforms:df.transforms});})();\n";
  return js;
}

HtmlReport::HtmlReport(std::string title) : title_(std::move(title)) {}

void HtmlReport::add_heading(const std::string& text) {
  body_ += "<h2>" + html_escape(text) + "</h2>\n";
}

void HtmlReport::add_paragraph(const std::string& text) {
  body_ += "<p>" + html_escape(text) + "</p>\n";
}

void HtmlReport::add_table(const std::vector<std::string>& header,
                           const std::vector<std::vector<std::string>>& rows, int fail_column) {
  body_ += "<table><tr>";
  for (const auto& h : header) body_ += "<th>" + html_escape(h) + "</th>";
  body_ += "</tr>\n";
  for (const auto& row : rows) {
    body_ += "<tr>";
    for (std::size_t i = 0; i < row.size(); ++i) {
      std::string cls;
      if (static_cast<int>(i) == fail_column)
        cls = row[i] == "pass" ? " class=\"pass\"" : " class=\"fail\"";
      body_ += "<td" + cls + ">" + html_escape(row[i]) + "</td>";
    }
    body_ += "</tr>\n";
  }
  body_ += "</table>\n";
}

void HtmlReport::add_chart(const std::string& caption, const std::string& vega_spec) {
  const std::size_t n = specs_.size();
  body_ += "<figure><figcaption>" + html_escape(caption) +
           "</figcaption><div class=\"chart\" id=\"chart-" + std::to_string(n) +
           "\"></div></figure>\n";
  specs_.push_back(vega_spec);
}

std::string HtmlReport::render(const std::string& vega_library) const {
  std::string specs = "[";
  for (const auto& s : specs_) {
    if (specs.size() > 1) specs += ",\n";
    specs += s;
  }
  specs += "]";
  for (std::size_t p = specs.find("</"); p != std::string::npos; p = specs.find("</", p + 3))
    specs.replace(p, 2, "<\\/");
  std::string page = "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n<title>" +
                     html_escape(title_) + "</title>\n<style>" + page_style + "</style>\n";
  page +=
      "<script>window.reportErrors=[];window.onerror=function(m){window.reportErrors.push(String(m)"
      ");"
      "var e=document.getElementById('render-status');if(e){e.textContent='error: "
      "'+m;e.className='error';}};</script>\n";
  page += "<script>\n" + vega_library + "</script>\n</head><body>\n<h1>" + html_escape(title_) +
          "</h1>\n<p id=\"render-status\">rendering</p>\n" + body_;
  page += "<script>\n(function(){var specs=" + specs + ";\n";
  page +=
      "var status=document.getElementById('render-status');\n"
      "Promise.all(specs.map(function(s,i){return new vega.View(vega.parse(s),"
      "{renderer:'svg',container:'#chart-'+i,hover:true}).runAsync();}))"
      ".then(function(){status.textContent=window.reportErrors.length?'error: "
      "'+window.reportErrors[0]:'ok';if(window.reportErrors.length)status.className='error';})"
      ".catch(function(e){status.textContent='error: "
      "'+e;status.className='error';});})();\n</script>\n</body></html>\n";
  return page;
}

void HtmlReport::write(const std::filesystem::path& path) const {
  write_file_atomically(path, render(load_vega_library()));
}

}  // namespace aquiledger
