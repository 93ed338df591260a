#include "io/results/pumping_test_files.hpp"

#include <fmt/format.h>

#include <cmath>

#include "io/files/atomic_file.hpp"
#include "io/files/text_encoding.hpp"

namespace aquiledger {
namespace {

std::string json_numbers(const Eigen::VectorXd& v) {
  std::string out = "[";
  for (Eigen::Index i = 0; i < v.size(); ++i) out += (i ? ", " : "") + json_number(v[i]);
  return out + "]";
}

std::string model_json(const PumpingTest& test, const ModelFit& m, const std::string& indent) {
  const std::vector<std::string>& names = m.parameter_names;
  std::string params = "[";
  for (std::size_t j = 0; j < names.size(); ++j) {
    const auto i = static_cast<Eigen::Index>(j);
    params += fmt::format(
        "{}\n{}    {{\"name\": {}, \"value\": {}, \"low_95\": {}, \"high_95\": {}, \"unit\": {}, "
        "\"at_bound\": {}}}",
        j ? "," : "", indent, json_string(names[j]), json_number(m.fit.parameters[i]),
        json_number(m.fit.lower_95[i]), json_number(m.fit.upper_95[i]),
        json_string(parameter_unit(names[j], test)), m.fit.at_bound[j] ? "true" : "false");
  }
  params += "\n" + indent + "  ]";
  std::string correlation = "[";
  for (Eigen::Index r = 0; r < m.fit.correlation.rows(); ++r)
    correlation += (r ? ", " : "") + json_numbers(m.fit.correlation.row(r).transpose());
  correlation += "]";
  return fmt::format(
      "{{\n{0}  \"model\": {1},\n{0}  \"parameters\": {2},\n{0}  \"correlation\": {3},\n"
      "{0}  \"observations_used\": {4},\n{0}  \"weighted_sum_of_squares\": {5},\n"
      "{0}  \"rms_residual\": {6},\n{0}  \"aicc\": {7},\n{0}  \"converged\": {8},\n"
      "{0}  \"iterations\": {9}{10}\n{0}}}",
      indent, json_string(model_name(m.model)), params, correlation, m.n_used,
      json_number(m.fit.weighted_sum_of_squares), json_number(m.rms_residual), json_number(m.aicc),
      m.fit.converged ? "true" : "false", m.fit.n_iterations,
      m.description.empty()
          ? std::string()
          : fmt::format(",\n{}  \"description\": {}", indent, json_string(m.description)));
}

}  // namespace

std::string parameter_unit(const std::string& parameter, const PumpingTest& test) {
  if (parameter == "transmissivity") return test.length_unit + "2/" + test.time_unit;
  if (parameter == "storativity" || parameter == "specific_yield" ||
      parameter == "aquitard_storativity" || parameter == "anisotropy_ratio")
    return "-";
  return test.length_unit;
}

namespace {

/// A screen as JSON: {"top": .., "bottom": ..}, {"piezometer_tip": ..}, or null (the whole
/// aquifer).
std::string screen_json(const std::optional<WellScreen>& screen) {
  if (!screen) return "null";
  if (screen->top == screen->bottom)
    return fmt::format("{{\"piezometer_tip\": {}}}", json_number(screen->top));
  return fmt::format("{{\"top\": {}, \"bottom\": {}}}", json_number(screen->top),
                     json_number(screen->bottom));
}

}  // namespace

std::string drawdown_fit_json(const PumpingTest& test, const PumpingTestInterpretation& result,
                              const std::string& test_file, const std::string& version) {
  std::string candidates;
  for (std::size_t c = 0; c < result.candidates.size(); ++c)
    candidates += (c ? ",\n    " : "\n    ") + model_json(test, result.candidates[c], "    ");
  std::string wells;
  const bool screens = test.has_screens() && test.aquifer;
  for (std::size_t w = 0; w < test.wells.size(); ++w)
    wells += fmt::format("{}\n    {{\"name\": {}, \"distance\": {}, \"measurements\": {}{}}}",
                         w ? "," : "", json_string(test.wells[w].name),
                         json_number(test.wells[w].distance), test.wells[w].times.size(),
                         screens ? ", \"screen\": " + screen_json(test.wells[w].screen) : "");
  // The screens' frame: the aquifer's top and bottom, the pumped well's screen and K_z / K_r
  // held (a number) or fitted ("fit", then among the parameters).
  std::string screen_frame;
  if (screens)
    screen_frame = fmt::format(
        "  \"screens\": {{\"aquifer_top\": {}, \"aquifer_bottom\": {}, \"pumped\": {}, "
        "\"anisotropy_ratio\": {}}},\n",
        json_number(test.aquifer->bottom + test.aquifer->thickness()),
        json_number(test.aquifer->bottom), screen_json(test.pumped_screen),
        test.anisotropy_ratio ? json_number(*test.anisotropy_ratio) : json_string("fit"));
  std::string classification;
  for (std::size_t i = 0; i < result.classification.size(); ++i)
    classification += (i ? ",\n    " : "\n    ") + json_string(result.classification[i]);
  return fmt::format(
      "{{\n  \"program\": \"aquiledger drawdown-fit\",\n  \"program_version\": {},\n"
      "  \"test_file\": {},\n  \"title\": {},\n  \"length_unit\": {},\n  \"time_unit\": {},\n"
      "  \"wells\": [{}\n  ],\n{}  \"automatic_choice\": {},\n  \"chosen_model\": {},\n"
      "  \"choice_reason\": {},\n  \"candidates\": [{}\n  ],\n  \"classification\": [{}\n  ]\n}}\n",
      json_string(version), json_string(test_file), json_string(test.title),
      json_string(test.length_unit), json_string(test.time_unit), wells, screen_frame,
      result.automatic ? "true" : "false", json_string(model_name(result.chosen_fit().model)),
      json_string(result.choice_reason), candidates, classification);
}

std::string parameters_csv(const PumpingTest& test, const PumpingTestInterpretation& result) {
  std::string out = "model,parameter,value,low,high,unit\n";
  for (const ModelFit& m : result.candidates) {
    const std::vector<std::string>& names = m.parameter_names;
    for (std::size_t j = 0; j < names.size(); ++j) {
      const auto i = static_cast<Eigen::Index>(j);
      out += fmt::format("{},{},{},{},{},{}\n", model_name(m.model), names[j],
                         json_number(m.fit.parameters[i]), json_number(m.fit.lower_95[i]),
                         json_number(m.fit.upper_95[i]), csv_text(parameter_unit(names[j], test)));
    }
  }
  return out;
}

std::string fit_series_csv(const PumpingTest& test, const PumpingTestInterpretation& result) {
  auto cell = [](double v) { return std::isfinite(v) ? fmt::format("{}", v) : std::string(); };
  std::string out = "well,time,measured,fitted,residual,derivative\n";
  const ModelFit& m = result.chosen_fit();
  for (std::size_t w = 0; w < test.wells.size(); ++w) {
    const ObservationSeries& well = test.wells[w];
    for (std::size_t i = 0; i < well.times.size(); ++i)
      out += fmt::format("{},{},{},{},{},{}\n", csv_text(well.name), well.times[i],
                         well.drawdowns[i], cell(m.fitted[w][i]),
                         cell(well.drawdowns[i] - m.fitted[w][i]), cell(result.derivatives[w][i]));
  }
  return out;
}

void write_drawdown_fit_files(const std::filesystem::path& folder, const PumpingTest& test,
                              const PumpingTestInterpretation& result, const std::string& test_file,
                              const std::string& version) {
  check_output_folder_writable(folder);
  write_file_atomically(folder / "fit.json", drawdown_fit_json(test, result, test_file, version));
  write_file_atomically(folder / "parameters.csv", parameters_csv(test, result));
  write_file_atomically(folder / "fit_series.csv", fit_series_csv(test, result));
}

}  // namespace aquiledger
