// [[period]], [[observation]] (with measured heads), [output] and [solver].
#include <algorithm>
#include <cmath>
#include <fstream>

#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/files/input_file_guard.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {
// Guards against counts no model needs, which would only exhaust memory or time.
constexpr long long max_periods = 100000;
constexpr long long max_steps_per_period = 1000000;
constexpr long long max_total_steps = 10000000;

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
}  // namespace

void read_periods(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* periods = section_tables(ctx, root, "period");
  if (!periods) {
    if (!root.contains("period"))
      ctx.error(ctx.file_spot(), "[[period]]", "missing required section: at least one [[period]]");
    return;
  }
  if (static_cast<long long>(periods->size()) > max_periods) {
    ctx.error(*periods, "[[period]]",
              std::to_string(periods->size()) + " periods; at most " + std::to_string(max_periods) +
                  " are supported");
    return;
  }
  std::vector<std::string> names;
  long long total_steps = 0;
  const int errors_before = ctx.diagnostics.n_errors();
  for (std::size_t i = 0; i < periods->size(); ++i) {
    const toml::table& t = *(*periods)[i].as_table();
    const std::string path = feature_path("period", t, i);
    check_keys(ctx, t, path, {"name", "length", "steps", "growth", "steady"});
    Period p;
    p.name = read_string(ctx, t, "name", path, false).value_or("period " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, p.name, names);
    const std::string T = ctx.time_unit;
    if (auto length = read_number(ctx, t, "length", path, true)) {
      if (!(*length > 0.0))
        ctx.error(*t.get("length"), path + ".length",
                  "value " + show_number(*length) + "; expected > 0 " + T);
      p.length = *length;
    }
    if (auto steps = read_integer(ctx, t, "steps", path, false)) {
      if (*steps < 1 || *steps > max_steps_per_period)
        ctx.error(*t.get("steps"), path + ".steps",
                  "value " + std::to_string(*steps) + "; expected an integer from 1 to " +
                      std::to_string(max_steps_per_period));
      else
        p.steps = static_cast<int>(*steps);
    }
    if (auto growth = read_number(ctx, t, "growth", path, false)) {
      if (!(*growth > 0.0))
        ctx.error(
            *t.get("growth"), path + ".growth",
            "value " + show_number(*growth) + "; expected > 0 (ratio of consecutive step lengths)");
      p.growth = *growth;
    }
    p.steady = read_bool(ctx, t, "steady", path).value_or(false);
    if (p.steady && p.steps != 1)
      ctx.warning(ctx.spot(t), path + ".steps",
                  "a steady period is solved once; steps = " + std::to_string(p.steps) +
                      " only divides its time");
    // One backward-Euler step spreads the response over the whole period: a drawdown that
    // develops within the period is then not resolved (common practice: ten or more steps,
    // growing, in a period whose stresses change).
    if (!p.steady && p.steps == 1)
      ctx.warning(ctx.spot(t), path + ".steps",
                  "a transient period in a single time step: heads and budgets are resolved only "
                  "at its end; give steps (e.g. 10 with growth = 1.2) unless one step is meant");
    total_steps += p.steps;
    model.periods.push_back(p);
  }
  if (total_steps > max_total_steps)
    ctx.error(*periods, "[[period]]",
              std::to_string(total_steps) + " time steps in all; at most " +
                  std::to_string(max_total_steps) + " are supported");
  else if (ctx.grid)
    if (auto refusal = work_refusal(ctx.grid->n_active(), static_cast<double>(total_steps)))
      ctx.error(*periods, "[[period]]", *refusal);
  if (ctx.diagnostics.n_errors() == errors_before)
    ctx.n_periods = static_cast<int>(model.periods.size());
}

namespace {

/// time,head rows; a first line that is not numbers is a header.
std::vector<MeasuredHead> read_measured(ReaderContext& ctx, const std::filesystem::path& file,
                                        const SourceSpot& at, const std::string& key) {
  std::vector<MeasuredHead> rows;
  if (auto refusal = input_file_refusal(file, max_measured_file_bytes)) {
    ctx.error(at, key, "measured-head file " + *refusal);
    return rows;
  }
  std::ifstream in(file);
  if (!in) {
    ctx.error(at, key,
              "cannot open measured-head file '" + file.string() +
                  "' (expected a CSV with columns time,head)");
    return rows;
  }
  std::string line;
  int line_no = 0;
  while (std::getline(in, line)) {
    ++line_no;
    if (auto hash = line.find('#'); hash != std::string::npos) line.erase(hash);
    if (line.find_first_not_of(" \t\r,") == std::string::npos) continue;
    std::vector<std::string> cells;
    std::string cell;
    for (char c : line + ",") {
      if (c == ',') {
        const auto b = cell.find_first_not_of(" \t\r"), e = cell.find_last_not_of(" \t\r");
        cells.push_back(b == std::string::npos ? "" : cell.substr(b, e - b + 1));
        cell.clear();
      } else {
        cell += c;
      }
    }
    std::optional<double> time = cells.size() >= 2 ? parse_value(cells[0]) : std::nullopt;
    std::optional<double> head = cells.size() >= 2 ? parse_value(cells[1]) : std::nullopt;
    if (!time || !head || cells.size() != 2) {
      if (rows.empty() && line_no == 1 && cells.size() == 2) continue;  // header line
      ctx.error(SourceSpot{file, line_no, 0}, key,
                "expected two numbers time,head (" + ctx.time_unit + ", " + ctx.length_unit +
                    "), found '" + line + "'");
      continue;
    }
    rows.push_back({*time, *head});
  }
  if (rows.empty()) ctx.error(SourceSpot{file, 0, 0}, key, "no time,head rows found");
  return rows;
}

}  // namespace

void read_observations(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* obs = section_tables(ctx, root, "observation");
  if (!obs) return;
  std::vector<std::string> names;
  for (std::size_t i = 0; i < obs->size(); ++i) {
    const toml::table& t = *(*obs)[i].as_table();
    const std::string path = feature_path("observation", t, i);
    check_keys(ctx, t, path, {"name", "x", "y", "measured"});
    Observation o;
    o.name =
        read_string(ctx, t, "name", path, false).value_or("observation " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, o.name, names);
    auto x = read_number(ctx, t, "x", path, true);
    auto y = read_number(ctx, t, "y", path, true);
    auto measured = read_string(ctx, t, "measured", path, false);
    if (!x || !y || !ctx.grid) continue;
    o.x = *x;
    o.y = *y;
    const auto cell = ctx.grid->locate(*x, *y);
    const std::string where = "point (" + show_number(*x) + ", " + show_number(*y) + ")";
    if (!cell) {
      ctx.error(*t.get("x"), path + ".x",
                where + " lies outside the grid (x " + show_number(ctx.grid->x_min()) + ".." +
                    show_number(ctx.grid->x_max()) + ", y " + show_number(ctx.grid->y_min()) +
                    ".." + show_number(ctx.grid->y_max()) + " " + ctx.length_unit + ")");
      continue;
    }
    if (!ctx.grid->is_active(*cell)) {
      ctx.error(*t.get("x"), path + ".x",
                where + " lies in an inactive cell (" +
                    describe_cell(ctx.grid->n_cols(), cell->value) + ")");
      continue;
    }
    o.cell = *cell;
    if (measured) {
      o.measured_file = ctx.resolve(*measured);
      o.measured =
          read_measured(ctx, o.measured_file, ctx.spot(*t.get("measured")), path + ".measured");
    }
    model.observations.push_back(std::move(o));
  }
}

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
  check_keys(ctx, *t, path, {"folder", "fields", "budget", "head_arrays"});
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
}

void read_solver(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::table* t = optional_table(ctx, root, "solver");
  if (!t) return;
  const std::string path = "[solver]";
  check_keys(ctx, *t, path,
             {"linear", "head_tolerance", "flow_tolerance", "max_iterations", "max_cutbacks",
              "threads", "face_thickness"});
  SolverSettings& s = model.solver;
  if (auto l = read_choice(ctx, *t, "linear", path, {"auto", "direct", "pcg", "bicgstab"}))
    s.linear = *l == "direct"     ? LinearChoice::direct
               : *l == "pcg"      ? LinearChoice::pcg
               : *l == "bicgstab" ? LinearChoice::bicgstab
                                  : LinearChoice::automatic;
  if (auto f = read_choice(ctx, *t, "face_thickness", path, {"mean", "upstream"}))
    s.face_thickness = *f == "upstream" ? FaceThickness::upstream : FaceThickness::mean;
  auto positive = [&](std::string_view key, double& into, const std::string& unit) {
    if (auto v = read_number(ctx, *t, key, path, false)) {
      if (*v > 0.0)
        into = *v;
      else
        ctx.error(*t->get(key), key_path(path, key),
                  "value " + show_number(*v) + "; expected > 0" + unit);
    }
  };
  positive("head_tolerance", s.head_tolerance, " " + ctx.length_unit);
  positive("flow_tolerance", s.flow_tolerance, " (relative to the throughflow)");
  auto count = [&](std::string_view key, int& into, long long lowest) {
    if (auto v = read_integer(ctx, *t, key, path, false)) {
      if (*v >= lowest && *v <= 1000000)
        into = static_cast<int>(*v);
      else
        ctx.error(*t->get(key), key_path(path, key),
                  "value " + std::to_string(*v) + "; expected an integer from " +
                      std::to_string(lowest) + " to 1000000");
    }
  };
  count("max_iterations", s.max_iterations, 1);
  count("max_cutbacks", s.max_cutbacks, 0);
  count("threads", s.threads, 0);
}

}  // namespace aquiledger
