#include "postproc/well_test_models.hpp"

#include <cassert>
#include <cmath>
#include <numbers>

#include "postproc/analytical_solutions.hpp"
#include "postproc/laplace_inversion.hpp"

namespace aquiledger {

std::string model_name(WellTestModel model) {
  switch (model) {
    case WellTestModel::theis:
      return "theis";
    case WellTestModel::cooper_jacob:
      return "cooper-jacob";
    case WellTestModel::hantush_jacob:
      return "hantush-jacob";
  }
  return "";
}

std::vector<std::string> model_parameter_names(WellTestModel model) {
  if (model == WellTestModel::hantush_jacob)
    return {"transmissivity", "storativity", "leakage_factor"};
  return {"transmissivity", "storativity"};
}

int n_model_parameters(WellTestModel model) {
  return static_cast<int>(model_parameter_names(model).size());
}

double unit_rate_drawdown(WellTestModel model, const std::vector<double>& parameters, double r,
                          double t) {
  assert(static_cast<int>(parameters.size()) == n_model_parameters(model));
  if (t <= 0.0) return 0.0;
  const double transmissivity = parameters[0];
  const double storativity = parameters[1];
  switch (model) {
    case WellTestModel::theis:
      return theis_drawdown(1.0, transmissivity, storativity, r, t);
    case WellTestModel::cooper_jacob:
      return std::log(2.25 * transmissivity * t / (r * r * storativity)) /
             (4.0 * std::numbers::pi * transmissivity);
    case WellTestModel::hantush_jacob:
      return hantush_jacob_drawdown(1.0, transmissivity, storativity, parameters[2], r, t);
  }
  return 0.0;
}

double schedule_drawdown(WellTestModel model, const std::vector<double>& parameters,
                         const std::vector<RateStep>& schedule, double r, double t,
                         const std::vector<ImageWell>& images) {
  double s = 0.0;
  double previous_rate = 0.0;
  for (const RateStep& step : schedule) {
    if (step.start >= t) break;
    const double change = step.rate - previous_rate;
    previous_rate = step.rate;
    if (change == 0.0) continue;
    const double since = t - step.start;
    double unit = unit_rate_drawdown(model, parameters, r, since);
    for (const ImageWell& image : images) {
      const double si = unit_rate_drawdown(model, parameters, image.image_distance, since);
      unit += image.recharge ? -si : si;
    }
    s += change * unit;
  }
  return s;
}

double papadopulos_cooper_drawdown(double q, double transmissivity, double storativity,
                                   double r_well, double r_casing, double r, double t) {
  if (t <= 0.0) return 0.0;
  const double t_d = transmissivity * t / (storativity * r_well * r_well);
  const double r_d = r / r_well;
  const double c_d = r_casing * r_casing / (2.0 * storativity * r_well * r_well);
  auto transform = [&](double p) {
    const double root = std::sqrt(p);
    return std::cyl_bessel_k(0.0, r_d * root) /
           (p * (root * std::cyl_bessel_k(1.0, root) + c_d * p * std::cyl_bessel_k(0.0, root)));
  };
  return q / (2.0 * std::numbers::pi * transmissivity) * stehfest_inverse(transform, t_d);
}

std::vector<double> logarithmic_derivative(const std::vector<double>& times,
                                           const std::vector<double>& drawdowns, double smoothing) {
  assert(times.size() == drawdowns.size());
  const std::size_t n = times.size();
  std::vector<double> derivative(n, std::nan(""));
  if (n < 2) return derivative;
  for (std::size_t i = 0; i < n; ++i) {
    const double x = std::log(times[i]);
    std::size_t left = i, right = i;
    while (left > 0 && x - std::log(times[left]) < smoothing) --left;
    while (right + 1 < n && std::log(times[right]) - x < smoothing) ++right;
    const double dl = x - std::log(times[left]);
    const double dr = std::log(times[right]) - x;
    const double slope_left = dl > 0.0 ? (drawdowns[i] - drawdowns[left]) / dl : std::nan("");
    const double slope_right = dr > 0.0 ? (drawdowns[right] - drawdowns[i]) / dr : std::nan("");
    if (dl > 0.0 && dr > 0.0)  // Bourdet et al. (1989), their eq. for the weighted slope
      derivative[i] = (slope_left * dr + slope_right * dl) / (dl + dr);
    else
      derivative[i] = dl > 0.0 ? slope_left : slope_right;
  }
  return derivative;
}

}  // namespace aquiledger
