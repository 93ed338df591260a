#pragma once
// The readers of the model file's sections, in the order io/model_file/model_reader.cpp calls them
// (io-internal header). Each reports into ctx and fills its part of the model.
#include <toml++/toml.h>

#include <string>

#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/reader_context.hpp"
#include "solver/model.hpp"

namespace aquiledger {

void read_model_section(ReaderContext& ctx, const toml::table& root, Model& model);
/// Reads nrow, ncol, dx, dy, origin into ctx.shape after the memory guard; false when the
/// grid cannot be used (then nothing per cell is read).
bool read_grid_shape(ReaderContext& ctx, const toml::table& root);
/// Reads the active mask and builds the grid (ctx.grid and model.grid).
void read_active_mask(ReaderContext& ctx, const toml::table& root, Model& model);
void read_periods(ReaderContext& ctx, const toml::table& root, Model& model);
void read_aquifer(ReaderContext& ctx, const toml::table& root, Model& model);
/// [interbeds] (after [aquifer], whose top and bottom bound the beds' thickness).
void read_interbeds(ReaderContext& ctx, const toml::table& root, Model& model);
void read_initial(ReaderContext& ctx, const toml::table& root, Model& model);
void read_fixed_heads(ReaderContext& ctx, const toml::table& root, Model& model);
void read_wells(ReaderContext& ctx, const toml::table& root, Model& model);
void read_recharges(ReaderContext& ctx, const toml::table& root, Model& model);
void read_drains(ReaderContext& ctx, const toml::table& root, Model& model);
void read_external_heads(ReaderContext& ctx, const toml::table& root, Model& model);
void read_evapotranspiration(ReaderContext& ctx, const toml::table& root, Model& model);
void read_rivers(ReaderContext& ctx, const toml::table& root, Model& model);
void read_leakage(ReaderContext& ctx, const toml::table& root, Model& model);
/// After every stress is read: a steady period (or [initial] steady = true) needs a cell whose
/// water can leave or enter at a set level; without one its heads are not determined.
void check_steady_has_set_level(ReaderContext& ctx, const toml::table& root, const Model& model);
void read_observations(ReaderContext& ctx, const toml::table& root, Model& model);
void read_subsidence_points(ReaderContext& ctx, const toml::table& root, Model& model);
void read_output(ReaderContext& ctx, const toml::table& root, Model& model);
void read_solver(ReaderContext& ctx, const toml::table& root, Model& model);

/// An optional plain-table section ([output], [solver]); reports one that is not a table.
const toml::table* optional_table(ReaderContext& ctx, const toml::table& root,
                                  std::string_view name);
/// The tables of an array-of-tables section ([[well]] ...); reports a plain [well] table.
const toml::array* section_tables(ReaderContext& ctx, const toml::table& root,
                                  std::string_view name);
/// "[[well]] \"north well\"" or "[[well]] #2" for messages.
std::string feature_path(std::string_view section, const toml::table& table, std::size_t index);
/// Warns when an explicitly placed stress lands on fixed-head cells (it is not applied there).
void warn_fixed_overlap(ReaderContext& ctx, const std::string& path, const SourceSpot& at,
                        const std::vector<CellIndex>& cells);
/// Reports a name used twice in one kind of feature; names must be unique per section.
void check_unique_name(ReaderContext& ctx, const toml::table& table, const std::string& path,
                       const std::string& name, NameSet& seen);

/// One table of a feature section with its key path and its (unique) name.
struct FeatureHead {
  const toml::table* table = nullptr;
  std::string path;
  std::string name;
};
/// Every table of a section with its key path and a unique name ("well 2" when unnamed);
/// `keys` are the keys the section allows.
std::vector<FeatureHead> feature_tables(ReaderContext& ctx, const toml::table& root,
                                        std::string_view section,
                                        std::initializer_list<std::string_view> keys);
/// Value rules the feature sections share: any finite elevation; >= 0 in `unit`.
extern const ValueRule any_elevation;
ValueRule non_negative(const std::string& unit);

}  // namespace aquiledger
