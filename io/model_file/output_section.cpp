// [output]: the results folder, field output and head arrays.
#include <algorithm>
#include <cmath>
#include <fstream>

#include "io/files/input_file_guard.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

/// [output].head_arrays: "period_end", or an array of times (model time unit) within the run.
void read_head_array_times(ReaderContext& ctx, const toml::node& node, Model& model) {
  const std::string key = "[output].head_arrays";
  const std::string expected =
      "expected \"period_end\" or an array of times in " + ctx.time_unit + " (e.g. [0, 365])";
  if (const auto* text = node.as_string()) {
    if (text->get() == "period_end")
      model.output.head_arrays_at_period_ends = true;
    else
      ctx.error(node, key, "value \"" + text->get() + "\"; " + expected);
    return;
  }
  const toml::array* times = node.as_array();
  if (!times) {
    ctx.error(node, key, "found " + type_name(node) + "; " + expected);
    return;
  }
  double run_length = 0.0;
  for (const Period& p : model.periods) run_length += p.length;
  for (const toml::node& item : *times) {
    const std::optional<double> t = number_of(item);
    if (!t || *t < 0.0 || (!model.periods.empty() && *t > run_length * (1.0 + 1.0e-12))) {
      ctx.error(item, key,
                "value " + show(item) + "; expected a time from 0 to the end of the run (" +
                    show_number(run_length) + " " + ctx.time_unit + ")");
      continue;
    }
    model.output.head_array_times.push_back(*t);
  }
  std::sort(model.output.head_array_times.begin(), model.output.head_array_times.end());
}

}  // namespace

void read_output(ReaderContext& ctx, const toml::table& root, Model& model) {
  model.output.folder = (ctx.base_dir / "results").lexically_normal();
  const toml::table* t = optional_table(ctx, root, "output");
  if (!t) return;
  const std::string path = "[output]";
  check_keys(ctx, *t, path, {"folder", "fields", "budget", "head_arrays", "geotiff"});
  if (auto folder = read_string(ctx, *t, "folder", path, false)) {
    if (folder->empty())
      ctx.error(*t->get("folder"), path + ".folder",
                "expected a folder name, found an empty string");
    else
      model.output.folder = ctx.resolve(*folder);
  }
  if (auto f = read_choice(ctx, *t, "fields", path, {"every_step", "period_end", "none"}))
    model.output.fields = *f == "every_step" ? FieldCadence::every_step
                          : *f == "none"     ? FieldCadence::none
                                             : FieldCadence::period_end;
  if (auto b = read_bool(ctx, *t, "budget", path)) model.output.budget = *b;
  if (const toml::node* h = t->get("head_arrays")) read_head_array_times(ctx, *h, model);
  if (auto g = read_bool(ctx, *t, "geotiff", path); g && *g) {
    // A GeoTIFF's pixels are equal: a grid of equal column widths and equal row heights.
    auto uniform = [](const std::vector<double>& w) {
      return std::all_of(w.begin(), w.end(), [&](double v) { return v == w.front(); });
    };
    if (model.output.fields == FieldCadence::none)
      ctx.error(*t->get("geotiff"), path + ".geotiff",
                "GeoTIFF files are written at the field output times, and fields = \"none\" has "
                "none; give fields = \"period_end\" or \"every_step\"");
    else if (ctx.shape && (!uniform(ctx.shape->dx) || !uniform(ctx.shape->dy)))
      ctx.error(*t->get("geotiff"), path + ".geotiff",
                "a GeoTIFF needs equal column widths and equal row heights; this grid's dx or dy "
                "vary (the VTK field files hold every grid)");
    else
      model.output.geotiff = true;
  }
}

}  // namespace aquiledger
