#pragma once
// Files of the sources-of-water command (postproc/water_sources.hpp): water_sources.csv
// (long: one row per period per source) and water_sources.json, and the reader of two
// results folders' budget tables (results contract version 2) for a comparison of two runs.
#include <filesystem>
#include <string>
#include <vector>

#include "io/files/calendar.hpp"
#include "io/files/output_error.hpp"
#include "postproc/water_sources.hpp"

namespace aquiledger {

/// What the files say besides the table.
struct WaterSourcesContext {
  std::string program_version;
  std::string length_unit = "m";
  std::string time_unit = "d";
  std::vector<std::string> chosen_wells;  ///< names; empty: every well (component level)
  std::string model_file;                 ///< absolute path (in-process runs), else empty
  std::string with_wells_folder;          ///< results folders compared, else empty
  std::string without_wells_folder;
  /// L3 per period: the chosen wells' planned withdrawal (rate x length); empty when not
  /// known (comparison of folders).
  std::vector<double> planned;
  std::string caution;
  /// The model's clock (a start date): the CSV then also gives start_date,end_date.
  std::optional<CalendarClock> clock;
};

/// Columns period,period_name,start,end,source,feature,volume,rate,share,cumulative_volume,
/// cumulative_share,pumped_volume,cumulative_pumped_volume,volume_unit,rate_unit.
std::string water_sources_csv(const WaterSources& sources, const WaterSourcesContext& context);
std::string water_sources_json(const WaterSources& sources, const WaterSourcesContext& context);
/// Both files into folder, atomically; throws OutputError.
void write_water_sources(const std::filesystem::path& folder, const WaterSources& sources,
                         const WaterSourcesContext& context);

/// Per-period volumes of one results folder, as the sources computation takes them.
struct FolderBudgets {
  std::vector<std::string> names;    ///< period names
  std::vector<double> start, end;    ///< T
  std::vector<WaterBudget> volumes;  ///< L3 per period; features follow `features`
  std::vector<SourceFeature> features;
  std::vector<BudgetComponent> storage;  ///< storage components the table lists
  std::string volume_unit;               ///< e.g. "m3"
};

/// Reads budget_periods.csv (version 2 long layout:
/// period,period_name,start,end,component,into_aquifer,out_of_aquifer,unit) and, when
/// features is set, budget_features.csv (feature,kind,period and in,out or
/// into_aquifer,out_of_aquifer). Throws ReadError naming file, line and column.
FolderBudgets read_folder_budgets(const std::filesystem::path& folder, bool features);

/// Lines both folders up for water_sources(): the features of either run (by kind and
/// name; a feature missing from one run counts zero there), chosen = wells named in
/// chosen_wells; without feature tables, one line per component and every well chosen.
/// Storage components empty in every period of both runs get no line.
/// Throws ReadError when the periods differ or a chosen name is not a well of either run.
std::vector<PeriodPair> pair_folders(const FolderBudgets& with_wells, const FolderBudgets& without,
                                     const std::vector<std::string>& chosen_wells,
                                     std::vector<SourceFeature>& features,
                                     std::vector<BudgetComponent>& storage);

}  // namespace aquiledger
