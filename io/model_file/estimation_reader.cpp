// The estimation set-up file: [estimate], [[parameter]], [[target]] (docs/estimation.md).
#include "io/model_file/estimation_reader.hpp"

#include <algorithm>
#include <cmath>

#include "io/model_file/input_file_text.hpp"
#include "io/model_file/model_reader.hpp"
#include "io/model_file/reader_context.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {
namespace {

constexpr std::uintmax_t max_setup_file_bytes = 16u << 20;

struct PropertyName {
  std::string_view word;
  ParameterProperty property;
};
constexpr PropertyName property_names[] = {
    {"k", ParameterProperty::conductivity},
    {"specific_storage", ParameterProperty::specific_storage},
    {"storativity", ParameterProperty::storativity},
    {"specific_yield", ParameterProperty::specific_yield},
    {"recharge", ParameterProperty::recharge},
    {"river_conductance", ParameterProperty::river_conductance},
    {"drain_conductance", ParameterProperty::drain_conductance},
    {"external_conductance", ParameterProperty::external_conductance}};

/// The key of Model::zone_maps that holds the zones of a cell property.
std::string_view zone_key(ParameterProperty p) {
  switch (p) {
    case ParameterProperty::conductivity:
      return "k";
    case ParameterProperty::specific_yield:
      return "specific_yield";
    default:
      return "specific_storage";
  }
}

/// Names of the features a feature property acts on, in the model's order.
std::vector<std::string> feature_names(const Model& m, ParameterProperty p) {
  std::vector<std::string> names;
  auto add = [&names](const auto& list) {
    for (const auto& f : list) names.push_back(f.name);
  };
  if (p == ParameterProperty::recharge) add(m.recharges);
  if (p == ParameterProperty::river_conductance) add(m.rivers);
  if (p == ParameterProperty::drain_conductance) add(m.drains);
  if (p == ParameterProperty::external_conductance) add(m.external_heads);
  return names;
}

/// The storage array a cell property writes (storativity is held as specific storage).
int storage_array(ParameterProperty p) {
  return p == ParameterProperty::storativity ? static_cast<int>(ParameterProperty::specific_storage)
                                             : static_cast<int>(p);
}

void read_estimate_section(ReaderContext& ctx, const toml::table& root, EstimationSetup& setup,
                           std::optional<std::filesystem::path>& model_file) {
  const toml::table* t = optional_table(ctx, root, "estimate");
  if (!t) {
    if (!root.contains("estimate"))
      ctx.error(ctx.file_spot(), "[estimate]",
                "missing [estimate] with model = \"model.toml\" (the model to calibrate)");
    return;
  }
  check_keys(ctx, *t, "[estimate]", {"model", "max_iterations", "gradient"});
  if (auto m = read_string(ctx, *t, "model", "[estimate]", true)) model_file = ctx.resolve(*m);
  if (auto n = read_integer(ctx, *t, "max_iterations", "[estimate]", false)) {
    if (*n < 1 || *n > 10000)
      ctx.error(*t->get("max_iterations"), "[estimate].max_iterations",
                "expected 1..10000, found " + std::to_string(*n));
    else
      setup.max_iterations = static_cast<int>(*n);
  }
  if (auto g = read_string(ctx, *t, "gradient", "[estimate]", false)) {
    if (*g == "auto")
      setup.gradient = GradientMethod::automatic;
    else if (*g == "forward")
      setup.gradient = GradientMethod::forward;
    else if (*g == "adjoint")
      setup.gradient = GradientMethod::adjoint;
    else
      ctx.error(*t->get("gradient"), "[estimate].gradient",
                "expected \"auto\", \"forward\" or \"adjoint\", found \"" + *g + "\"");
  }
}

void read_parameters(ReaderContext& ctx, const toml::table& root, const Model& model,
                     EstimationSetup& setup) {
  const std::vector<FeatureHead> tables =
      feature_tables(ctx, root, "parameter",
                     {"name", "property", "zone", "feature", "form", "start", "lower", "upper",
                      "log", "prior", "prior_weight"});
  if (tables.empty() && !ctx.diagnostics.has_errors())
    ctx.error(ctx.file_spot(), "[[parameter]]", "no [[parameter]]: nothing to estimate");
  // Cells already taken per storage array, and features per property, for overlaps.
  std::vector<std::vector<std::string>> cell_owner(8);
  std::vector<std::vector<std::string>> feature_owner(8);
  for (const FeatureHead& f : tables) {
    const toml::table& t = *f.table;
    const auto word =
        read_choice(ctx, t, "property", f.path,
                    {"k", "specific_storage", "storativity", "specific_yield", "recharge",
                     "river_conductance", "drain_conductance", "external_conductance"});
    if (!t.contains("property"))
      ctx.error(t, f.path + ".property", "missing: which property the parameter sets");
    const auto form = read_choice(ctx, t, "form", f.path, {"multiplier", "value"});
    const auto start = read_number(ctx, t, "start", f.path, false);
    const auto lower = read_number(ctx, t, "lower", f.path, true);
    const auto upper = read_number(ctx, t, "upper", f.path, true);
    const auto log = read_bool(ctx, t, "log", f.path);
    const auto prior = read_number(ctx, t, "prior", f.path, false);
    const auto prior_weight = read_number(ctx, t, "prior_weight", f.path, false);
    if (!word) continue;
    EstimatedParameter e;
    e.parameter.name = f.name;
    for (const auto& pn : property_names)
      if (pn.word == *word) e.parameter.property = pn.property;
    const ParameterProperty prop = e.parameter.property;
    e.parameter.form = form && *form == "value" ? ParameterForm::value : ParameterForm::multiplier;
    e.log = log.value_or(true);
    // A start given but refused (not a finite number) has its error already: no follow-on
    // error about a missing start or about lower <= start <= upper.
    if (t.contains("start") && !start) continue;
    e.start = start.value_or(e.parameter.form == ParameterForm::multiplier ? 1.0 : NAN);
    if (e.parameter.form == ParameterForm::value && !start)
      ctx.error(t, f.path + ".start", "a parameter of form = \"value\" needs a start value");
    if (!lower || !upper || std::isnan(e.start)) continue;
    e.lower = *lower;
    e.upper = *upper;
    if (!(e.lower > 0.0 && e.lower <= e.start && e.start <= e.upper)) {
      ctx.error(*t.get("lower"), f.path + ".lower",
                "expected 0 < lower <= start <= upper, found lower = " + show_number(e.lower) +
                    ", start = " + show_number(e.start) + ", upper = " + show_number(e.upper));
      continue;
    }
    if (prior) {
      if (!(*prior >= e.lower && *prior <= e.upper)) {
        ctx.error(*t.get("prior"), f.path + ".prior",
                  "expected a prior within lower..upper, found " + show_number(*prior));
        continue;
      }
      if (!prior_weight || !(*prior_weight > 0.0)) {
        ctx.error(
            t.get("prior_weight") ? *t.get("prior_weight") : static_cast<const toml::node&>(t),
            f.path + ".prior_weight",
            "a prior needs prior_weight > 0 (1 / variance of the prior, of ln p when "
            "log = true)");
        continue;
      }
      e.prior = *prior;
      e.prior_weight = *prior_weight;
    } else if (prior_weight) {
      ctx.error(*t.get("prior_weight"), f.path + ".prior_weight", "given without prior");
      continue;
    }

    if (is_cell_property(prop)) {
      if (t.contains("feature")) {
        ctx.error(*t.get("feature"), f.path + ".feature",
                  std::string("property \"") + std::string(*word) +
                      "\" is a field of the aquifer: select cells by zone, not by feature");
        continue;
      }
      const Condition cond = model.aquifer.condition;
      if (prop == ParameterProperty::specific_yield && cond == Condition::confined) {
        ctx.error(*t.get("property"), f.path + ".property",
                  "a confined model has no specific yield");
        continue;
      }
      if ((prop == ParameterProperty::specific_storage || prop == ParameterProperty::storativity) &&
          cond == Condition::water_table) {
        ctx.error(*t.get("property"), f.path + ".property",
                  "a water_table model stores water by specific yield only");
        continue;
      }
      std::vector<int> cells;
      if (auto zone = read_integer(ctx, t, "zone", f.path, false)) {
        const ZoneMap* zm = nullptr;
        for (const ZoneMap& z : model.zone_maps)
          if (z.key == zone_key(prop)) zm = &z;
        if (!zm) {
          ctx.error(*t.get("zone"), f.path + ".zone",
                    "the model gives [aquifer]." + std::string(zone_key(prop)) +
                        " without zones: give it as { zones = ..., values = [...] }, or leave "
                        "zone out for the whole field");
          continue;
        }
        for (int c = 0; c < model.grid.n_cells(); ++c)
          if (zm->zone[std::size_t(c)] == *zone && model.grid.is_active(CellIndex{c}))
            cells.push_back(c);
        if (cells.empty()) {
          ctx.error(*t.get("zone"), f.path + ".zone",
                    "no active cell has zone " + std::to_string(*zone) + " in [aquifer]." +
                        std::string(zone_key(prop)));
          continue;
        }
      } else if (!t.contains("zone")) {
        for (int c = 0; c < model.grid.n_cells(); ++c)
          if (model.grid.is_active(CellIndex{c})) cells.push_back(c);
      } else {
        continue;
      }
      if (prop == ParameterProperty::storativity && e.parameter.form == ParameterForm::value)
        for (int c : cells)
          if (!std::isfinite(model.aquifer.top[std::size_t(c)])) {
            ctx.error(*t.get("property"), f.path + ".property",
                      "storativity needs [aquifer].top (Ss = S / (top - bottom))");
            break;
          }
      auto& owner = cell_owner[std::size_t(storage_array(prop))];
      if (owner.empty()) owner.resize(std::size_t(model.grid.n_cells()));
      bool overlap = false;
      for (int c : cells)
        if (!owner[std::size_t(c)].empty()) {
          ctx.error(t, f.path,
                    "its cells overlap those of parameter \"" + owner[std::size_t(c)] +
                        "\" (first at " + describe_cell(model.grid.n_cols(), c) +
                        "): one parameter per cell and property");
          overlap = true;
          break;
        }
      if (overlap) continue;
      for (int c : cells) owner[std::size_t(c)] = f.name;
      e.parameter.cells = std::move(cells);
    } else {
      if (t.contains("zone")) {
        ctx.error(*t.get("zone"), f.path + ".zone",
                  std::string("property \"") + std::string(*word) +
                      "\" belongs to features: select them by feature, not by zone");
        continue;
      }
      if (e.parameter.form == ParameterForm::value) {
        ctx.error(*t.get("form"), f.path + ".form",
                  std::string("property \"") + std::string(*word) +
                      "\" varies by cell and period: only form = \"multiplier\" applies");
        continue;
      }
      const std::vector<std::string> names = feature_names(model, prop);
      std::vector<std::size_t> features;
      if (auto name = read_string(ctx, t, "feature", f.path, false)) {
        const auto it = std::find(names.begin(), names.end(), *name);
        if (it == names.end()) {
          ctx.error(*t.get("feature"), f.path + ".feature",
                    "the model has no such feature for \"" + std::string(*word) + "\": \"" + *name +
                        "\"" + (names.empty() ? "" : " (first: \"" + names[0] + "\")"));
          continue;
        }
        features.push_back(std::size_t(it - names.begin()));
      } else if (!t.contains("feature")) {
        for (std::size_t k = 0; k < names.size(); ++k) features.push_back(k);
        if (features.empty()) {
          ctx.error(*t.get("property"), f.path + ".property",
                    "the model has no feature of this kind");
          continue;
        }
      } else {
        continue;
      }
      auto& owner = feature_owner[std::size_t(prop)];
      owner.resize(names.size());
      bool overlap = false;
      for (std::size_t k : features)
        if (!owner[k].empty()) {
          ctx.error(
              t, f.path,
              "feature \"" + names[k] + "\" is already set by parameter \"" + owner[k] + "\"");
          overlap = true;
          break;
        }
      if (overlap) continue;
      for (std::size_t k : features) owner[k] = f.name;
      e.parameter.features = std::move(features);
    }
    setup.parameters.push_back(std::move(e));
  }
}

std::optional<std::size_t> find_bore(ReaderContext& ctx, const toml::table& t, std::string_view key,
                                     const std::string& path, const Model& model) {
  const auto name = read_string(ctx, t, key, path, true);
  if (!name) return std::nullopt;
  for (std::size_t k = 0; k < model.observations.size(); ++k)
    if (model.observations[k].name == *name) return k;
  ctx.error(*t.get(key), key_path(path, key),
            "the model has no [[observation]] named \"" + *name + "\"");
  return std::nullopt;
}

void read_targets(ReaderContext& ctx, const toml::table& root, const Model& model,
                  EstimationSetup& setup) {
  const std::vector<FeatureHead> tables =
      feature_tables(ctx, root, "target",
                     {"name", "kind", "bore", "minus", "feature", "times", "values",
                      "standard_deviation", "weight"});
  if (tables.empty() && !ctx.diagnostics.has_errors())
    ctx.error(ctx.file_spot(), "[[target]]", "no [[target]]: nothing measured to fit");
  const std::vector<FeatureRef> features = list_features(model);
  for (const FeatureHead& f : tables) {
    const toml::table& t = *f.table;
    const auto kind =
        read_choice(ctx, t, "kind", f.path, {"head", "drawdown", "head_difference", "flow"});
    if (!t.contains("kind"))
      ctx.error(t, f.path + ".kind", "missing: head, drawdown, head_difference or flow");
    const auto sd = read_number(ctx, t, "standard_deviation", f.path, false);
    const auto weight = read_number(ctx, t, "weight", f.path, false);
    if (!kind) continue;
    EstimationTarget target;
    target.name = f.name;
    for (TargetKind k :
         {TargetKind::head, TargetKind::drawdown, TargetKind::head_difference, TargetKind::flow})
      if (*kind == target_kind_label(k)) target.kind = k;
    double w = 1.0;
    if (sd && weight) {
      ctx.error(*t.get("weight"), f.path + ".weight",
                "give standard_deviation or weight, not both");
      continue;
    }
    if (sd) {
      if (!(*sd > 0.0)) {
        ctx.error(*t.get("standard_deviation"), f.path + ".standard_deviation",
                  "expected > 0, found " + show_number(*sd));
        continue;
      }
      w = 1.0 / (*sd * *sd);
    }
    if (weight) {
      if (!(*weight > 0.0)) {
        ctx.error(*t.get("weight"), f.path + ".weight",
                  "expected > 0, found " + show_number(*weight));
        continue;
      }
      w = *weight;
    }
    if (target.kind == TargetKind::flow) {
      const auto name = read_string(ctx, t, "feature", f.path, true);
      if (!name) continue;
      const auto it = std::find_if(features.begin(), features.end(), [&](const FeatureRef& r) {
        return r.name == *name && (r.kind == FeatureKind::river || r.kind == FeatureKind::drain ||
                                   r.kind == FeatureKind::external_head);
      });
      if (it == features.end()) {
        ctx.error(
            *t.get("feature"), f.path + ".feature",
            "the model has no [[river]], [[drain]] or [[external_head]] named \"" + *name + "\"");
        continue;
      }
      target.feature = *it;
    } else {
      const auto bore = find_bore(ctx, t, "bore", f.path, model);
      if (!bore) continue;
      target.bore = *bore;
      if (target.kind == TargetKind::head_difference) {
        const auto other = find_bore(ctx, t, "minus", f.path, model);
        if (!other) continue;
        target.other_bore = *other;
      } else if (t.contains("minus")) {
        ctx.error(*t.get("minus"), f.path + ".minus", "only a head_difference has a second bore");
        continue;
      }
    }
    const toml::node* times = t.get("times");
    const toml::node* values = t.get("values");
    if (!times && !values && target.kind == TargetKind::head) {
      const Observation& o = model.observations[target.bore];
      for (const MeasuredHead& m : o.measured) {
        target.times.push_back(m.time);
        target.values.push_back(m.head);
      }
      if (target.times.empty()) {
        ctx.error(t, f.path,
                  "bore \"" + o.name +
                      "\" has no measured heads: give its measured file in the model, or times "
                      "and values here");
        continue;
      }
    } else {
      if (!times || !values) {
        ctx.error(t, f.path, "expected both times and values");
        continue;
      }
      auto tv = read_number_array(ctx, *times, f.path + ".times");
      auto vv = read_number_array(ctx, *values, f.path + ".values");
      if (!tv || !vv) continue;
      if (tv->size() != vv->size() || tv->empty()) {
        ctx.error(*values, f.path + ".values",
                  "expected as many values as times (" + std::to_string(tv->size()) +
                      "), at least one; found " + std::to_string(vv->size()));
        continue;
      }
      target.times = std::move(*tv);
      target.values = std::move(*vv);
    }
    const double end = ctx.period_bounds.empty() ? 0.0 : ctx.period_bounds.back();
    bool bad = false;
    for (std::size_t k = 0; k < target.times.size() && !bad; ++k) {
      const double tk = target.times[k];
      if ((k > 0 && !(tk > target.times[k - 1])) || tk < 0.0 || tk > end) {
        ctx.error(times ? *times : static_cast<const toml::node&>(t), f.path + ".times",
                  "times must increase within the run (0.." + show_number(end) + "); entry " +
                      std::to_string(k) + " is " + show_number(tk));
        bad = true;
      }
    }
    if (bad) continue;
    target.weights.assign(target.values.size(), w);
    setup.targets.push_back(std::move(target));
  }
}

/// Model time of the run's end.
double run_end(const Model& model) {
  double t = 0.0;
  for (const Period& p : model.periods) t += p.length;
  return t;
}

}  // namespace

EstimationReadResult read_estimation_text(std::string_view toml_text,
                                          const std::filesystem::path& as_if_path) {
  ReaderContext ctx;
  ctx.model_file = as_if_path;
  ctx.base_dir = as_if_path.parent_path();
  if (ctx.base_dir.empty()) ctx.base_dir = ".";
  EstimationReadResult result;
  try {
    const toml::table root = toml::parse(toml_text, as_if_path.string());
    check_keys(ctx, root, "(top level)", {"estimate", "parameter", "target"});
    EstimationSetup setup;
    std::optional<std::filesystem::path> model_file;
    read_estimate_section(ctx, root, setup, model_file);
    if (model_file) {
      result.model_file = std::filesystem::absolute(*model_file).lexically_normal();
      ReadResult read = read_model_file(*model_file);
      for (Diagnostic& d : read.diagnostics) result.diagnostics.push_back(std::move(d));
      if (read.model) {
        result.model = std::move(read.model);
        ctx.period_bounds = {0.0, run_end(*result.model)};
        if (result.model->aquifer.interbeds)
          ctx.error(*root.get("estimate"), "[estimate].model",
                    "a model with [interbeds] cannot be calibrated yet (docs/estimation.md)");
        read_parameters(ctx, root, *result.model, setup);
        read_targets(ctx, root, *result.model, setup);
        if (!ctx.diagnostics.has_errors() && setup.n_measurements() <= int(setup.parameters.size()))
          ctx.error(ctx.file_spot(), "[[target]]",
                    "expected more measured values (" + std::to_string(setup.n_measurements()) +
                        ") than parameters (" + std::to_string(setup.parameters.size()) + ")");
        if (!ctx.diagnostics.has_errors()) result.setup = std::move(setup);
      } else {
        ctx.error(*root.get("estimate"), "[estimate].model",
                  "the model '" + model_file->string() + "' could not be read (errors above)");
      }
    }
  } catch (const toml::parse_error& e) {
    ctx.error(ctx.spot(e.source()), "", "TOML syntax: " + std::string(e.description()));
  }
  for (Diagnostic& d : ctx.diagnostics.take()) result.diagnostics.push_back(std::move(d));
  if (!result.setup) result.setup.reset();
  return result;
}

EstimationReadResult read_estimation_file(const std::filesystem::path& path) {
  InputFileText input = read_input_file_text(path, max_setup_file_bytes, "set-up file");
  if (input.error) {
    EstimationReadResult result;
    result.diagnostics.push_back(std::move(*input.error));
    return result;
  }
  return read_estimation_text(input.text, std::filesystem::absolute(path).lexically_normal());
}

}  // namespace aquiledger
