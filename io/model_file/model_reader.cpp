#include "io/model_file/model_reader.hpp"

#include <toml++/toml.h>

#include <algorithm>

#include "io/files/input_file_guard.hpp"
#include "io/model_file/input_file_text.hpp"
#include "io/model_file/plausibility.hpp"
#include "io/model_file/reader_context.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

bool ReadResult::ok() const {
  if (!model) return false;
  for (const Diagnostic& d : diagnostics)
    if (d.severity == Severity::error) return false;
  return true;
}

namespace {

/// Reads every section in dependency order: units, grid (after the memory guard), periods
/// (their count sizes per-period arrays), aquifer, fixed heads (other stresses are checked
/// against them), the other stresses, observations and settings.
void read_sections(ReaderContext& ctx, const toml::table& root, Model& model) {
  check_keys(ctx, root, "(top level)",
             {"model", "grid", "aquifer", "initial", "period", "well", "fixed_head", "recharge",
              "river", "drain", "external_head", "evapotranspiration", "leakage", "interbeds",
              "observation", "subsidence_point", "output", "solver"});
  read_model_section(ctx, root, model);
  // Without a usable grid nothing per cell is read; the other sections are still checked for
  // keys and scalar values.
  if (read_grid_shape(ctx, root)) read_active_mask(ctx, root, model);
  read_periods(ctx, root, model);
  // The per-cell sections keep the band's window of rows (every row when no band is given).
  if (ctx.part) ctx.band = ctx.part->window;
  read_aquifer(ctx, root, model);
  read_interbeds(ctx, root, model);
  read_initial(ctx, root, model);
  ctx.band.reset();
  model.band = ctx.part;
  read_fixed_heads(ctx, root, model);
  read_wells(ctx, root, model);
  read_recharges(ctx, root, model);
  read_rivers(ctx, root, model);
  read_drains(ctx, root, model);
  read_external_heads(ctx, root, model);
  read_evapotranspiration(ctx, root, model);
  read_leakage(ctx, root, model);
  check_steady_has_set_level(ctx, root, model);
  read_observations(ctx, root, model);
  read_subsidence_points(ctx, root, model);
  read_output(ctx, root, model);
  read_solver(ctx, root, model);
}

ReadResult read_parsed(ReaderContext& ctx, const toml::table& root) {
  Model model;
  model.source_file = ctx.model_file;
  read_sections(ctx, root, model);
  for (const auto& [file, source] : ctx.array_cache) model.input_files.push_back(file);
  for (const auto& [file, series] : ctx.series_cache) model.input_files.push_back(file);
  for (const auto* points : {&model.observations, &model.subsidence_points})
    for (const Observation& o : *points)
      if (!o.measured_file.empty()) model.input_files.push_back(o.measured_file);
  model.input_files.insert(model.input_files.end(), ctx.other_inputs.begin(),
                           ctx.other_inputs.end());
  std::sort(model.input_files.begin(), model.input_files.end());
  model.input_files.erase(std::unique(model.input_files.begin(), model.input_files.end()),
                          model.input_files.end());
  ReadResult result;
  if (!ctx.diagnostics.has_errors()) {
    for (auto& w : plausibility_warnings(model)) ctx.warning(ctx.file_spot(), w.key, w.message);
    // Each warning once, with where it comes from (a message the reader gave twice, e.g.
    // for two features, is listed once).
    for (const Diagnostic& d : ctx.diagnostics.items()) {
      if (d.severity != Severity::warning) continue;
      std::string text = d.to_string();
      if (const auto at = text.find(": warning: "); at != std::string::npos)
        text.replace(at, 11, ": ");
      if (std::find(model.warnings.begin(), model.warnings.end(), text) == model.warnings.end())
        model.warnings.push_back(std::move(text));
    }
    result.model = std::move(model);
  }
  result.diagnostics = ctx.diagnostics.take();
  return result;
}

}  // namespace

ReadResult read_model_text(std::string_view toml_text, const std::filesystem::path& as_if_path,
                           const BandOfGrid& band_of) {
  ReaderContext ctx;
  ctx.band_of = band_of;
  ctx.model_file = as_if_path;
  ctx.base_dir = as_if_path.parent_path();
  if (ctx.base_dir.empty()) ctx.base_dir = ".";
  try {
    const toml::table root = toml::parse(toml_text, as_if_path.string());
    return read_parsed(ctx, root);
  } catch (const toml::parse_error& e) {
    ctx.error(ctx.spot(e.source()), "", "TOML syntax: " + std::string(e.description()));
    ReadResult result;
    result.diagnostics = ctx.diagnostics.take();
    return result;
  }
}

ReadResult read_model_file(const std::filesystem::path& path, const BandOfGrid& band_of) {
  InputFileText input = read_input_file_text(path, max_model_file_bytes, "model file");
  if (input.error) {
    ReadResult result;
    result.diagnostics.push_back(std::move(*input.error));
    return result;
  }
  return read_model_text(input.text, std::filesystem::absolute(path).lexically_normal(), band_of);
}

}  // namespace aquiledger
