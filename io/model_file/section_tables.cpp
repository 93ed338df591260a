// What the section readers share: finding a section's tables ([output], [[well]] ...), their
// key paths and unique names, common value rules, and the warning for a stress placed on
// fixed-head cells.
#include <algorithm>
#include <cmath>

#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

const ValueRule any_elevation{[](double v) { return std::isfinite(v); }, "an elevation"};

const toml::table* optional_table(ReaderContext& ctx, const toml::table& root,
                                  std::string_view name) {
  const toml::node* node = root.get(name);
  if (!node) return nullptr;
  if (!node->as_table()) {
    std::string section = "[";
    section.append(name).append("]");
    ctx.error(*node, section, "expected a table, found " + type_name(*node));
  }
  return node->as_table();
}

ValueRule non_negative(const std::string& unit) {
  return {[](double v) { return v >= 0.0; }, ">= 0 " + unit};
}

const toml::array* section_tables(ReaderContext& ctx, const toml::table& root,
                                  std::string_view name) {
  const toml::node* node = root.get(name);
  if (!node) return nullptr;
  const toml::array* arr = node->as_array();
  if (!arr || !arr->is_array_of_tables()) {
    ctx.error(*node, "[[" + std::string(name) + "]]",
              "expected an array of tables, written [[" + std::string(name) +
                  "]] (double brackets), found " + type_name(*node));
    return nullptr;
  }
  return arr;
}

std::string feature_path(std::string_view section, const toml::table& table, std::size_t index) {
  const std::string head = "[[" + std::string(section) + "]]";
  if (auto name = table["name"].value<std::string>()) return head + " \"" + *name + "\"";
  return head + " #" + std::to_string(index + 1);
}

void check_unique_name(ReaderContext& ctx, const toml::table& table, const std::string& path,
                       const std::string& name, NameSet& seen) {
  if (!seen.insert(name).second) {
    const toml::node* node = table.get("name");
    ctx.error(node ? ctx.spot(*node) : ctx.spot(table), path + ".name",
              "duplicate name \"" + name + "\"; names must be unique within a section");
  }
}

/// Every table of a section with its key path and a unique name; `keys` are checked.
std::vector<FeatureHead> feature_tables(ReaderContext& ctx, const toml::table& root,
                                        std::string_view section,
                                        std::initializer_list<std::string_view> keys) {
  std::vector<FeatureHead> out;
  const toml::array* arr = section_tables(ctx, root, section);
  if (!arr) return out;
  NameSet names;
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const toml::table& t = *(*arr)[i].as_table();
    FeatureHead f{&t, feature_path(section, t, i), ""};
    check_keys(ctx, t, f.path, keys);
    f.name = read_string(ctx, t, "name", f.path, false)
                 .value_or(std::string(section) + " " + std::to_string(i + 1));
    check_unique_name(ctx, t, f.path, f.name, names);
    out.push_back(std::move(f));
  }
  return out;
}

/// Warns when an explicitly placed stress lands on fixed-head cells, where it is not applied.
void warn_fixed_overlap(ReaderContext& ctx, const std::string& path, const SourceSpot& at,
                        const std::vector<CellIndex>& cells) {
  int n = 0, first = -1;
  for (CellIndex c : cells)
    if (!ctx.fixed.empty() && ctx.fixed[std::size_t(c.value)] && n++ == 0) first = c.value;
  if (n > 0)
    ctx.warning(at, path,
                std::to_string(n) + " of its " + std::to_string(cells.size()) +
                    " cell(s) are fixed-head cells (first at " +
                    describe_cell(ctx.grid->n_cols(), first) +
                    "); the stress is not applied there");
}

}  // namespace aquiledger
