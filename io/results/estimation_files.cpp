#include "io/results/estimation_files.hpp"

#include <fmt/format.h>

#include "io/files/atomic_file.hpp"
#include "io/files/text_encoding.hpp"

namespace aquiledger {
namespace {

const char* form_label(ParameterForm f) {
  return f == ParameterForm::multiplier ? "multiplier" : "value";
}

std::string number(double v) { return json_number(v); }

}  // namespace

std::string estimated_parameters_csv(const EstimationSetup& setup, const EstimationResult& r) {
  std::string out =
      "parameter,property,form,value,lower_95,upper_95,css,at_bound,start,lower,upper\n";
  for (std::size_t j = 0; j < setup.parameters.size(); ++j) {
    const EstimatedParameter& e = setup.parameters[j];
    const auto i = static_cast<Eigen::Index>(j);
    out += fmt::format("{},{},{},{},{},{},{},{},{},{},{}\n", csv_text(e.parameter.name),
                       parameter_property_label(e.parameter.property), form_label(e.parameter.form),
                       number(r.fit.parameters[i]), number(r.fit.lower_95[i]),
                       number(r.fit.upper_95[i]), number(r.css[i]),
                       r.fit.at_bound[j] ? "true" : "false", number(e.start), number(e.lower),
                       number(e.upper));
  }
  return out;
}

std::string parameter_correlation_csv(const EstimationSetup& setup, const EstimationResult& r) {
  std::string out = "parameter";
  for (const EstimatedParameter& e : setup.parameters) {
    out += ',';  // in two steps: GCC 12's -Wrestrict misreads "," + std::string&&
    out += csv_text(e.parameter.name);
  }
  out += "\n";
  for (std::size_t i = 0; i < setup.parameters.size(); ++i) {
    out += csv_text(setup.parameters[i].parameter.name);
    for (std::size_t j = 0; j < setup.parameters.size(); ++j) {
      out += ',';
      out += number(r.fit.correlation(Eigen::Index(i), Eigen::Index(j)));
    }
    out += "\n";
  }
  return out;
}

std::string target_residuals_csv(const EstimationSetup& setup, const EstimationResult& r) {
  std::string out = "target,kind,time,measured,simulated,residual,weight,weighted_residual\n";
  Eigen::Index row = 0;
  for (const EstimationTarget& t : setup.targets)
    for (std::size_t i = 0; i < t.times.size(); ++i, ++row) {
      const double res = r.fit.residuals[row];
      out +=
          fmt::format("{},{},{},{},{},{},{},{}\n", csv_text(t.name), target_kind_label(t.kind),
                      number(t.times[i]), number(r.observed[row]), number(r.fit.simulated[row]),
                      number(res), number(r.weights[row]), number(res * std::sqrt(r.weights[row])));
    }
  return out;
}

std::string objective_history_csv(const EstimationResult& r) {
  std::string out = "iteration,objective\n";
  for (std::size_t i = 0; i < r.fit.cost_history.size(); ++i)
    out += fmt::format("{},{}\n", i, number(r.fit.cost_history[i]));
  return out;
}

std::string estimate_json(const EstimationSetup& setup, const EstimationResult& r,
                          const std::string& setup_file, const std::string& version) {
  const auto k = setup.parameters.size();
  std::string out = "{\n";
  out += fmt::format("  \"program\": \"aquiledger {}\",\n", version);
  out += fmt::format("  \"setup_file\": {},\n", json_string(setup_file));
  out += fmt::format("  \"converged\": {},\n", r.fit.converged ? "true" : "false");
  out += fmt::format("  \"iterations\": {},\n  \"model_runs\": {},\n", r.fit.n_iterations,
                     r.n_model_runs);
  out += fmt::format("  \"n_measurements\": {},\n", r.observed.size());
  out += fmt::format("  \"objective\": {},\n", number(r.fit.weighted_sum_of_squares));
  out += fmt::format("  \"gradient_method\": \"{}\",\n", r.gradient_method);
  out += fmt::format("  \"error_variance\": {},\n", number(r.fit.error_variance));
  out += fmt::format("  \"standard_error_of_regression\": {},\n",
                     number(std::sqrt(r.fit.error_variance)));
  out += "  \"parameters\": [\n";
  for (std::size_t j = 0; j < k; ++j) {
    const EstimatedParameter& e = setup.parameters[j];
    const auto i = static_cast<Eigen::Index>(j);
    out += fmt::format(
        "    {{\"name\": {}, \"property\": \"{}\", \"form\": \"{}\", \"log\": {}, \"value\": {}, "
        "\"lower_95\": {}, \"upper_95\": {}, \"css\": {}, \"at_bound\": {}, "
        "\"objective_gradient\": {}}}{}\n",
        json_string(e.parameter.name), parameter_property_label(e.parameter.property),
        form_label(e.parameter.form), e.log ? "true" : "false", number(r.fit.parameters[i]),
        number(r.fit.lower_95[i]), number(r.fit.upper_95[i]), number(r.css[i]),
        r.fit.at_bound[j] ? "true" : "false",
        number(i < r.gradient.size() ? r.gradient[i] : std::nan("")), j + 1 < k ? "," : "");
  }
  out += "  ],\n  \"correlation\": [";
  for (std::size_t i = 0; i < k; ++i) {
    out += i ? ", [" : "[";
    for (std::size_t j = 0; j < k; ++j)
      out += (j ? ", " : "") + number(r.fit.correlation(Eigen::Index(i), Eigen::Index(j)));
    out += "]";
  }
  out += "],\n  \"objective_history\": [";
  for (std::size_t i = 0; i < r.fit.cost_history.size(); ++i)
    out += (i ? ", " : "") + number(r.fit.cost_history[i]);
  out += "],\n  \"warnings\": [";
  for (std::size_t i = 0; i < r.warnings.size(); ++i)
    out += (i ? ", " : "") + json_string(r.warnings[i]);
  out += "]\n}\n";
  return out;
}

void write_estimation_files(const std::filesystem::path& folder, const EstimationSetup& setup,
                            const EstimationResult& r, const std::string& setup_file,
                            const std::string& version) {
  write_file_atomically(folder / "estimated_parameters.csv", estimated_parameters_csv(setup, r));
  write_file_atomically(folder / "parameter_correlation.csv", parameter_correlation_csv(setup, r));
  write_file_atomically(folder / "target_residuals.csv", target_residuals_csv(setup, r));
  write_file_atomically(folder / "objective_history.csv", objective_history_csv(r));
  write_file_atomically(folder / "estimate.json", estimate_json(setup, r, setup_file, version));
}

}  // namespace aquiledger
