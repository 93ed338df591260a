// The fitted model written back as a model file (docs/estimation.md, "The fitted model").
#include "io/model_file/fitted_model_writer.hpp"

#include <fmt/format.h>
#include <toml++/toml.h>

#include <cmath>
#include <cstdlib>
#include <optional>
#include <sstream>

#include "io/files/atomic_file.hpp"

namespace aquiledger {
namespace {

/// Keys whose string value is a path relative to the model file (docs/model-format.md).
constexpr std::string_view fitted_path_keys[] = {"file",  "zones",  "raster",         "measured",
                                                 "table", "series", "measured_series"};

/// Rewrites every relative path of node so that it still names the same file from `to`.
void rebase_fitted_paths(toml::node& node, const std::filesystem::path& from,
                         const std::filesystem::path& to) {
  if (toml::array* a = node.as_array()) {
    for (toml::node& e : *a) rebase_fitted_paths(e, from, to);
    return;
  }
  toml::table* t = node.as_table();
  if (!t) return;
  for (auto&& [key, value] : *t) {
    bool is_path = false;
    for (std::string_view k : fitted_path_keys) is_path |= key.str() == k;
    if (is_path && value.is_string()) {
      const std::filesystem::path p(value.as_string()->get());
      if (p.is_absolute()) continue;
      const std::filesystem::path target = (from / p).lexically_normal();
      std::filesystem::path rel = target.lexically_relative(to);
      *value.as_string() = (rel.empty() ? target : rel).generic_string();
    } else {
      rebase_fitted_paths(value, from, to);
    }
  }
}

/// Every number of a zone table's values times factor.
void scale_fitted_zone_values(toml::table& values, double factor) {
  std::vector<std::pair<std::string, double>> scaled;
  for (auto&& [zone, v] : values)
    if (auto x = v.value<double>()) scaled.emplace_back(std::string(zone.str()), *x * factor);
  for (auto& [zone, x] : scaled) values.insert_or_assign(zone, x);
}

/// node times factor, for the value forms of a feature's rate or conductance: a number, a
/// per-period array, zones with values. Throws FittedModelUnsupported for the rest.
void scale_fitted_node(toml::node& node, double factor, const std::string& where) {
  if (toml::array* a = node.as_array()) {
    for (std::size_t i = 0; i < a->size(); ++i) {
      toml::node& e = *a->get(i);
      if (auto v = e.value<double>(); v && (e.is_integer() || e.is_floating_point()))
        a->replace(a->cbegin() + static_cast<std::ptrdiff_t>(i), *v * factor);
      else
        scale_fitted_node(e, factor, where + "[" + std::to_string(i) + "]");
    }
    return;
  }
  if (toml::table* t = node.as_table(); t && t->contains("zones") && t->contains("values")) {
    if (toml::table* values = t->get_as<toml::table>("values")) {
      scale_fitted_zone_values(*values, factor);
      return;
    }
  }
  throw FittedModelUnsupported(
      fmt::format("{} is given by a file, raster or time series, which the fitted model cannot "
                  "scale: multiply it by {} in a copy of the model by hand",
                  where, factor));
}

/// t[key] times factor (see scale_fitted_node).
void scale_fitted_key(toml::table& t, const std::string& key, double factor,
                      const std::string& where) {
  toml::node* node = t.get(key);
  if (!node) return;
  if (auto v = node->value<double>(); v && (node->is_integer() || node->is_floating_point()))
    t.insert_or_assign(key, *v * factor);
  else
    scale_fitted_node(*node, factor, where + "." + key);
}

/// The text of a full nrow x ncol array, north row first, for { file = }.
std::string fitted_array_text(const Model& m, const std::vector<double>& cells,
                              const std::string& comment) {
  std::string out = "# " + comment + "\n";
  const int nc = m.grid.n_cols();
  for (int r = 0; r < m.grid.n_rows(); ++r) {
    for (int c = 0; c < nc; ++c) {
      const double v = cells[static_cast<std::size_t>(r * nc + c)];
      out += fmt::format("{}{}", c ? " " : "", std::isfinite(v) ? v : 0.0);
    }
    out += '\n';
  }
  return out;
}

struct FittedCellProperty {
  std::string key;                  ///< [aquifer] key written
  std::string zone_key;             ///< Model::zone_maps key of the property's zones
  std::string unit;                 ///< for the array file's comment
  std::vector<double> cell_values;  ///< per grid cell, fitted
};

/// The fitted property as a TOML value: zones with new values where the original was given
/// by zones and every zone holds one value; one number where every active cell does; else an
/// array file (added to files).
void put_fitted_cell_property(toml::table& aquifer, const Model& m, const FittedCellProperty& p,
                              std::vector<FittedModelFile>& files) {
  std::vector<std::size_t> active;
  for (int c = 0; c < m.grid.n_cells(); ++c)
    if (m.grid.is_active(CellIndex{c})) active.push_back(static_cast<std::size_t>(c));
  auto same = [](double a, double b) { return std::abs(a - b) <= 1e-12 * std::abs(a); };

  const ZoneMap* zones = nullptr;
  for (const ZoneMap& z : m.zone_maps)
    if (z.key == p.zone_key) zones = &z;
  toml::table* original = aquifer.get_as<toml::table>(p.key);
  if (zones && original && original->contains("zones") && original->get_as<toml::table>("values")) {
    toml::table& values = *original->get_as<toml::table>("values");
    bool uniform = true;
    std::vector<std::pair<std::string, double>> fitted;
    for (auto&& [zone, v] : values) {
      const int z = std::atoi(std::string(zone.str()).c_str());
      std::optional<double> first;
      for (std::size_t c : active)
        if (zones->zone[c] == z) {
          if (!first) first = p.cell_values[c];
          uniform &= same(*first, p.cell_values[c]);
        }
      if (first) fitted.emplace_back(std::string(zone.str()), *first);
    }
    if (uniform) {
      for (auto& [zone, x] : fitted) values.insert_or_assign(zone, x);
      return;
    }
  }
  bool uniform = !active.empty();
  for (std::size_t c : active) uniform &= same(p.cell_values[active.front()], p.cell_values[c]);
  if (uniform) {
    aquifer.insert_or_assign(p.key, p.cell_values[active.front()]);
    return;
  }
  const std::string name = "fitted_" + p.key + ".txt";
  files.push_back({name, fitted_array_text(m, p.cell_values,
                                           "fitted " + p.key + " (" + p.unit +
                                               "), one grid row "
                                               "a line, north "
                                               "first")});
  toml::table file{{"file", name}};
  file.is_inline(true);
  aquifer.insert_or_assign(p.key, std::move(file));
}

std::vector<double> fitted_cells_of(const CellArray<double>& a, int n) {
  std::vector<double> out(static_cast<std::size_t>(n));
  for (std::size_t c = 0; c < out.size(); ++c) out[c] = a[c];
  return out;
}

}  // namespace

std::vector<FittedModelFile> fitted_model_files(const std::filesystem::path& model_file,
                                                const Model& base, const EstimationSetup& setup,
                                                const std::vector<double>& values,
                                                const std::filesystem::path& folder,
                                                const std::vector<std::string>& header) {
  toml::table root = toml::parse_file(model_file.string());
  const Model fitted = model_with_parameters(base, setup, values);
  const std::filesystem::path from = std::filesystem::absolute(model_file).parent_path();
  const std::filesystem::path to = std::filesystem::absolute(folder).lexically_normal();
  rebase_fitted_paths(root, from.lexically_normal(), to);
  std::vector<FittedModelFile> files;

  // Cell properties: each property once, from the fitted model's arrays.
  const int n = base.grid.n_cells();
  const std::string L = base.length_unit, T = base.time_unit;
  bool k = false, sy = false, storage = false;
  for (const EstimatedParameter& e : setup.parameters) {
    k |= e.parameter.property == ParameterProperty::conductivity;
    sy |= e.parameter.property == ParameterProperty::specific_yield;
    storage |= e.parameter.property == ParameterProperty::specific_storage ||
               e.parameter.property == ParameterProperty::storativity;
  }
  toml::table& aquifer = *root["aquifer"].as_table();
  if (k)
    put_fitted_cell_property(aquifer, base,
                             {"k", "k", L + "/" + T, fitted_cells_of(fitted.aquifer.kx, n)}, files);
  if (sy)
    put_fitted_cell_property(aquifer, base,
                             {"specific_yield", "specific_yield", "-",
                              fitted_cells_of(fitted.aquifer.specific_yield, n)},
                             files);
  if (storage) {
    std::vector<double> ss = fitted_cells_of(fitted.aquifer.specific_storage, n);
    if (aquifer.contains("storativity")) {
      for (std::size_t c = 0; c < ss.size(); ++c)
        ss[c] *= base.aquifer.top[c] - base.aquifer.bottom[c];
      put_fitted_cell_property(aquifer, base, {"storativity", "specific_storage", "-", ss}, files);
    } else {
      // The compressibility route becomes a specific storage (its skeleton/water split of the
      // budget is not a fitted quantity).
      aquifer.erase("compressibility");
      put_fitted_cell_property(aquifer, base,
                               {"specific_storage", "specific_storage", "1/" + L, ss}, files);
    }
  }

  // Feature properties (multipliers): the feature's own value forms times the fitted factor.
  for (std::size_t j = 0; j < setup.parameters.size(); ++j) {
    const ModelParameter& p = setup.parameters[j].parameter;
    if (is_cell_property(p.property)) continue;
    std::string section, key;
    switch (p.property) {
      case ParameterProperty::recharge:
        section = "recharge", key = "rate";
        break;
      case ParameterProperty::river_conductance:
        section = "river", key = "bed_conductance";
        break;
      case ParameterProperty::drain_conductance:
        section = "drain", key = "conductance";
        break;
      default:
        section = "external_head", key = "conductance";
        break;
    }
    toml::array* list = root[section].as_array();
    for (std::size_t f : p.features) {
      toml::table* t = list && f < list->size() ? list->get(f)->as_table() : nullptr;
      if (!t)
        throw std::logic_error("fitted model: no [[" + section + "]] entry " + std::to_string(f));
      const std::string where = fmt::format("[[{}]] {}", section, f + 1);
      if (section == "river" && !t->contains(key)) {
        if (toml::table* bed = t->get_as<toml::table>("bed"))
          scale_fitted_key(*bed, "k", values[j], where + ".bed");
      } else {
        scale_fitted_key(*t, key, values[j], where);
      }
    }
  }

  // The fitted model's own runs go beside it, never over the calibrated model's results.
  if (!root.contains("output")) root.insert("output", toml::table{});
  root["output"].as_table()->insert_or_assign("folder", "results");
  if (!root.contains("model")) root.insert("model", toml::table{});
  toml::table& m = *root["model"].as_table();
  const std::string title =
      m.contains("title") ? m["title"].value_or(std::string()) : model_file.stem().string();
  m.insert_or_assign("title", title + " (fitted)");

  std::ostringstream text;
  for (const std::string& line : header) text << "# " << line << '\n';
  text << '\n' << root << '\n';
  files.push_back({"fitted_model.toml", text.str()});
  return files;
}

void write_fitted_model(const std::filesystem::path& folder,
                        const std::vector<FittedModelFile>& files) {
  for (const FittedModelFile& f : files) write_file_atomically(folder / f.name, f.contents);
}

}  // namespace aquiledger
