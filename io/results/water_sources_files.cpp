#include "io/results/water_sources_files.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iterator>
#include <map>
#include <optional>

#include "io/files/atomic_file.hpp"
#include "io/files/csv_table.hpp"
#include "io/files/read_error.hpp"
#include "io/files/text_encoding.hpp"

namespace aquiledger {

namespace {

/// Budget components by their names in the results contract, version 2.
std::optional<BudgetComponent> component_named(const std::string& name) {
  if (name == "well") return BudgetComponent::well;
  for (std::size_t k = 0; k < n_budget_components; ++k) {
    const auto c = static_cast<BudgetComponent>(k);
    if (component_label(c) == name) return c;
  }
  return std::nullopt;
}

std::optional<FeatureKind> kind_named(const std::string& name) {
  for (FeatureKind k : {FeatureKind::well, FeatureKind::fixed_head, FeatureKind::recharge,
                        FeatureKind::river, FeatureKind::drain, FeatureKind::external_head,
                        FeatureKind::evapotranspiration, FeatureKind::leakage})
    if (name == feature_kind_label(k)) return k;
  return std::nullopt;
}

/// Reads a CSV table and reports its cells by column name with file, line and column.
class TableReader {
 public:
  TableReader(std::filesystem::path path, std::vector<std::vector<std::string>> alternatives)
      : path_(std::move(path)), table_(read_csv_file(path_)) {
    for (const auto& names : alternatives) {
      std::optional<std::size_t> found;
      for (const std::string& n : names)
        if (!found) found = table_.column(n);
      if (!found)
        throw ReadError(
            fmt::format("{}, line 1: no column '{}' (is this a results folder of "
                        "results contract version 2?)",
                        path_.string(), names.front()));
      columns_.push_back(*found);
    }
  }
  std::size_t rows() const { return table_.rows.size(); }
  const std::string& text(std::size_t row, std::size_t column) const {
    const auto& r = table_.rows[row];
    if (columns_[column] >= r.size())
      throw ReadError(
          fmt::format("{}, line {}: the row is shorter than the header", path_.string(), row + 2));
    return r[columns_[column]];
  }
  double number(std::size_t row, std::size_t column) const {
    const std::string& t = text(row, column);
    char* end = nullptr;
    const double v = std::strtod(t.c_str(), &end);
    if (t.empty() || *end != '\0' || !std::isfinite(v))
      throw ReadError(fmt::format("{}, line {}, column '{}': '{}' is not a finite number",
                                  path_.string(), row + 2, table_.header[columns_[column]], t));
    return v;
  }
  [[noreturn]] void fail(std::size_t row, const std::string& what) const {
    throw ReadError(fmt::format("{}, line {}: {}", path_.string(), row + 2, what));
  }

 private:
  std::filesystem::path path_;
  CsvTable table_;
  std::vector<std::size_t> columns_;
};

std::size_t period_index(const TableReader& t, std::size_t row, double value) {
  if (value < 1.0 || value != std::floor(value)) t.fail(row, "the period must be 1, 2, ...");
  return static_cast<std::size_t>(value) - 1;
}

}  // namespace

std::string water_sources_csv(const WaterSources& s, const WaterSourcesContext& c) {
  const std::string vu = c.length_unit + "3", ru = c.length_unit + "3/" + c.time_unit;
  std::string out =
      "period,period_name,start,end,source,feature,volume,rate,share,cumulative_volume,"
      "cumulative_share,pumped_volume,cumulative_pumped_volume,volume_unit,rate_unit" +
      std::string(c.clock ? ",start_date,end_date" : "") + "\n";
  auto it = std::back_inserter(out);
  for (std::size_t p = 0; p < s.periods.size(); ++p) {
    const SourcePeriod& r = s.periods[p];
    const double length = r.end - r.start;
    std::string dates;  // (appended in steps: GCC 12 warns falsely on "," + string&&)
    if (c.clock)
      dates.append(",")
          .append(c.clock->date_of(r.start))
          .append(",")
          .append(c.clock->date_of(r.end));
    for (std::size_t k = 0; k < s.lines.size(); ++k)
      fmt::format_to(it, "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}{}\n", p + 1,
                     csv_text(r.name), r.start, r.end, s.lines[k].source,
                     csv_text(s.lines[k].feature), r.volume[k],
                     length > 0.0 ? r.volume[k] / length : 0.0, share_of(r.volume[k], r.withdrawn),
                     r.cumulative[k], share_of(r.cumulative[k], r.cumulative_withdrawn),
                     r.withdrawn, r.cumulative_withdrawn, vu, ru, dates);
  }
  return out;
}

std::string water_sources_json(const WaterSources& s, const WaterSourcesContext& c) {
  std::string out = "{\n";
  auto it = std::back_inserter(out);
  fmt::format_to(it, "  \"program\": \"aquiledger sources\",\n  \"program_version\": {},\n",
                 json_string(c.program_version));
  fmt::format_to(
      it, "  \"model_file\": {},\n  \"with_wells_folder\": {},\n  \"without_wells_folder\": {},\n",
      json_string(c.model_file), json_string(c.with_wells_folder),
      json_string(c.without_wells_folder));
  fmt::format_to(it, "  \"length_unit\": {},\n  \"time_unit\": {},\n", json_string(c.length_unit),
                 json_string(c.time_unit));
  out += "  \"chosen_wells\": [";
  for (std::size_t k = 0; k < c.chosen_wells.size(); ++k)
    out += (k ? ", " : "") + json_string(c.chosen_wells[k]);
  out += "],\n  \"periods\": [\n";
  double worst = 0.0;
  for (std::size_t p = 0; p < s.periods.size(); ++p) {
    const SourcePeriod& r = s.periods[p];
    double sum = 0.0;
    for (double v : r.cumulative) sum += v;
    if (r.cumulative_withdrawn != 0.0)
      worst = std::max(worst, std::abs(sum / r.cumulative_withdrawn - 1.0));
    fmt::format_to(
        it,
        "    {{\"period\": {}, \"period_name\": {}, \"start\": {}, \"end\": {}, "
        "\"pumped_volume\": {}, \"cumulative_pumped_volume\": {}, \"planned_volume\": {},\n"
        "     \"sources\": [\n",
        p + 1, json_string(r.name), json_number(r.start), json_number(r.end),
        json_number(r.withdrawn), json_number(r.cumulative_withdrawn),
        p < c.planned.size() ? json_number(c.planned[p]) : "null");
    for (std::size_t k = 0; k < s.lines.size(); ++k)
      fmt::format_to(it,
                     "       {{\"source\": {}, \"feature\": {}, \"group\": {}, \"volume\": {}, "
                     "\"share\": {}, \"cumulative_volume\": {}, \"cumulative_share\": {}}}{}\n",
                     json_string(s.lines[k].source), json_string(s.lines[k].feature),
                     json_string(std::string(source_group(s.lines[k].source))),
                     json_number(r.volume[k]), json_number(share_of(r.volume[k], r.withdrawn)),
                     json_number(r.cumulative[k]),
                     json_number(share_of(r.cumulative[k], r.cumulative_withdrawn)),
                     k + 1 < s.lines.size() ? "," : "");
    fmt::format_to(it, "     ]}}{}\n", p + 1 < s.periods.size() ? "," : "");
  }
  fmt::format_to(it, "  ],\n  \"largest_cumulative_share_sum_error\": {},\n  \"caution\": {}\n}}\n",
                 json_number(worst), json_string(c.caution));
  return out;
}

void write_water_sources(const std::filesystem::path& folder, const WaterSources& sources,
                         const WaterSourcesContext& context) {
  check_output_folder_writable(folder);
  write_file_atomically(folder / "water_sources.csv", water_sources_csv(sources, context));
  write_file_atomically(folder / "water_sources.json", water_sources_json(sources, context));
}

FolderBudgets read_folder_budgets(const std::filesystem::path& folder, bool features) {
  FolderBudgets b;
  const TableReader t(folder / "budget_periods.csv", {{"period"},
                                                      {"period_name"},
                                                      {"start"},
                                                      {"end"},
                                                      {"component"},
                                                      {"into_aquifer"},
                                                      {"out_of_aquifer"},
                                                      {"unit"}});
  std::vector<bool> storage_seen(n_budget_components, false);
  for (std::size_t row = 0; row < t.rows(); ++row) {
    const std::size_t p = period_index(t, row, t.number(row, 0));
    if (p > b.volumes.size()) t.fail(row, "periods must be listed in order");
    if (p == b.volumes.size()) {
      b.names.push_back(t.text(row, 1));
      b.start.push_back(t.number(row, 2));
      b.end.push_back(t.number(row, 3));
      b.volumes.emplace_back();
    }
    const std::string& name = t.text(row, 4);
    if (b.volume_unit.empty()) b.volume_unit = t.text(row, 7);
    if (name == "total") continue;
    const auto c = component_named(name);
    if (!c) t.fail(row, "unknown component '" + name + "'");
    b.volumes[p][*c] = {t.number(row, 5), t.number(row, 6)};
    if (!storage_source_label(*c).empty() && !storage_seen[static_cast<std::size_t>(*c)]) {
      storage_seen[static_cast<std::size_t>(*c)] = true;
      b.storage.push_back(*c);
    }
  }
  if (b.volumes.empty()) throw ReadError((folder / "budget_periods.csv").string() + ": no periods");
  if (!features) return b;

  const TableReader f(
      folder / "budget_features.csv",
      {{"feature"}, {"kind"}, {"period"}, {"into_aquifer", "in"}, {"out_of_aquifer", "out"}});
  std::map<std::pair<FeatureKind, std::string>, std::size_t> index;
  for (std::size_t row = 0; row < f.rows(); ++row) {
    const auto kind = kind_named(f.text(row, 1));
    if (!kind) f.fail(row, "unknown kind '" + f.text(row, 1) + "'");
    const std::size_t p = period_index(f, row, f.number(row, 2));
    if (p >= b.volumes.size()) f.fail(row, "period not in budget_periods.csv");
    const auto key = std::make_pair(*kind, f.text(row, 0));
    auto [pos, added] = index.emplace(key, b.features.size());
    if (added) b.features.push_back({key.second, *kind, false});
    for (WaterBudget& v : b.volumes) v.features.resize(b.features.size());
    b.volumes[p].features[pos->second] = {f.number(row, 3), f.number(row, 4)};
  }
  return b;
}

std::vector<PeriodPair> pair_folders(const FolderBudgets& with_wells, const FolderBudgets& without,
                                     const std::vector<std::string>& chosen_wells,
                                     std::vector<SourceFeature>& features,
                                     std::vector<BudgetComponent>& storage) {
  if (with_wells.volumes.size() != without.volumes.size())
    throw ReadError(fmt::format("the runs differ in their periods ({} and {})",
                                with_wells.volumes.size(), without.volumes.size()));
  for (std::size_t p = 0; p < with_wells.volumes.size(); ++p)
    if (std::abs(with_wells.end[p] - without.end[p]) >
        1e-9 * std::max(1.0, std::abs(with_wells.end[p])))
      throw ReadError(fmt::format("period {} ends at {} in one run and at {} in the other", p + 1,
                                  with_wells.end[p], without.end[p]));
  // The storage components either table lists, less those empty in every period of both
  // runs (a table may list all four whatever the model has).
  storage.clear();
  for (const FolderBudgets* run : {&with_wells, &without})
    for (BudgetComponent c : run->storage) {
      bool used = false;
      for (const FolderBudgets* r : {&with_wells, &without})
        for (const WaterBudget& b : r->volumes) used |= b[c].in != 0.0 || b[c].out != 0.0;
      if (used && std::find(storage.begin(), storage.end(), c) == storage.end())
        storage.push_back(c);
    }

  const bool by_feature = !with_wells.features.empty() || !without.features.empty();
  std::vector<PeriodPair> pairs(with_wells.volumes.size());
  for (std::size_t p = 0; p < pairs.size(); ++p)
    pairs[p] = {with_wells.names[p], with_wells.start[p], with_wells.end[p], {}, {}};
  features.clear();
  if (!by_feature) {
    // One line per component; every well counts as chosen.
    const std::pair<BudgetComponent, FeatureKind> lines[] = {
        {BudgetComponent::well, FeatureKind::well},
        {BudgetComponent::fixed_head, FeatureKind::fixed_head},
        {BudgetComponent::recharge, FeatureKind::recharge},
        {BudgetComponent::river, FeatureKind::river},
        {BudgetComponent::drain, FeatureKind::drain},
        {BudgetComponent::external_head, FeatureKind::external_head},
        {BudgetComponent::evapotranspiration, FeatureKind::evapotranspiration},
        {BudgetComponent::leakage, FeatureKind::leakage}};
    for (const auto& [c, kind] : lines) features.push_back({"", kind, kind == FeatureKind::well});
    for (std::size_t p = 0; p < pairs.size(); ++p) {
      pairs[p].with_wells = with_wells.volumes[p];
      pairs[p].without_wells = without.volumes[p];
      for (WaterBudget* b : {&pairs[p].with_wells, &pairs[p].without_wells}) {
        b->features.clear();
        for (const auto& [c, kind] : lines) b->features.push_back((*b)[c]);
      }
    }
    return pairs;
  }
  std::map<std::pair<FeatureKind, std::string>, std::size_t> index;
  for (const FolderBudgets* run : {&with_wells, &without})
    for (const SourceFeature& f : run->features)
      if (index.emplace(std::make_pair(f.kind, f.name), features.size()).second)
        features.push_back(f);
  for (const std::string& name : chosen_wells) {
    auto found = index.find({FeatureKind::well, name});
    if (found == index.end())
      throw ReadError("no well named '" + name + "' in budget_features.csv of either run");
    features[found->second].chosen = true;
  }
  for (std::size_t p = 0; p < pairs.size(); ++p) {
    pairs[p].with_wells = with_wells.volumes[p];
    pairs[p].without_wells = without.volumes[p];
    for (auto [b, run] : {std::make_pair(&pairs[p].with_wells, &with_wells),
                          std::make_pair(&pairs[p].without_wells, &without)}) {
      b->features.assign(features.size(), InOut{});
      for (std::size_t k = 0; k < run->features.size(); ++k)
        b->features[index.at({run->features[k].kind, run->features[k].name})] =
            run->volumes[p].features[k];
    }
  }
  return pairs;
}

}  // namespace aquiledger
