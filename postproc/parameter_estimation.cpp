#include "postproc/parameter_estimation.hpp"

#include <cmath>
#include <sstream>
#include <stdexcept>

#include "postproc/observation_sampler.hpp"
#include "solver/forward_sensitivities.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {
namespace {

/// Every record holds, per bore and per flow target, the value and its d / d ln p.
class TargetRecorder : public SensitivityObserver {
 public:
  TargetRecorder(const Model& model, const EstimationSetup& setup,
                 const std::vector<ModelParameter>& parameters)
      : model_(model),
        setup_(setup),
        parameters_(parameters),
        layout_(make_system_layout(model)),
        sampler_(model.grid, model.observations) {
    for (const EstimationTarget& t : setup.targets)
      if (t.kind == TargetKind::flow) flow_positions_.push_back(flow_position(t.feature));
  }

  std::size_t width() const { return 1 + parameters_.size(); }
  std::size_t bore_channel(std::size_t bore) const { return bore * width(); }
  std::size_t flow_channel(std::size_t f) const {
    return (model_.observations.size() + f) * width();
  }

  void state(const StepInfo* info, std::span<const double> head,
             const HeadSensitivities& s) override {
    times.push_back(info ? info->time : 0.0);
    const std::size_t p = parameters_.size();
    std::vector<double> row((model_.observations.size() + flow_positions_.size()) * width(), 0.0);
    const std::vector<double> h = sampler_.sample(head);
    for (std::size_t b = 0; b < h.size(); ++b) row[bore_channel(b)] = h[b];
    for (std::size_t k = 0; k < p; ++k) {
      const std::vector<double> sk = sampler_.sample(s[k]);
      for (std::size_t b = 0; b < sk.size(); ++b) row[bore_channel(b) + 1 + k] = sk[b];
    }
    const std::size_t period = info ? info->period : 0;
    for (std::size_t f = 0; f < flow_positions_.size(); ++f) {
      double q = 0.0;
      std::vector<double> dq(p, 0.0);
      for (const CellStressFlow& c :
           feature_cell_flows(model_, layout_, period, head, flow_positions_[f])) {
        q += c.q.value;
        for (std::size_t k = 0; k < p; ++k)
          dq[k] += c.q.slope * s[k][static_cast<std::size_t>(c.cell.value)];
      }
      // Out of the aquifer into the feature: -q; a parameter of this feature scales q itself.
      row[flow_channel(f)] = -q;
      for (std::size_t k = 0; k < p; ++k)
        row[flow_channel(f) + 1 + k] =
            -dq[k] - (acts_on(parameters_[k], flow_positions_[f]) ? q : 0.0);
    }
    rows.push_back(std::move(row));
  }

  /// Channel c linearly interpolated at time t (T).
  double at(double t, std::size_t c) const {
    std::size_t i = 1;
    while (i < times.size() && times[i] < t) ++i;
    if (i >= times.size()) return rows.back()[c];
    const double t0 = times[i - 1], t1 = times[i];
    const double a = t1 > t0 ? (t - t0) / (t1 - t0) : 1.0;
    return (1.0 - a) * rows[i - 1][c] + a * rows[i][c];
  }

  std::vector<double> times;
  std::vector<std::vector<double>> rows;

 private:
  std::size_t flow_position(const FeatureRef& f) const {
    const std::vector<FeatureRef> all = list_features(model_);
    for (std::size_t k = 0; k < all.size(); ++k)
      if (all[k].kind == f.kind && all[k].index == f.index) return k;
    throw std::invalid_argument("estimation: no such feature " + f.name);
  }
  bool acts_on(const ModelParameter& p, std::size_t position) const {
    if (is_cell_property(p.property)) return false;
    for (std::size_t f : p.features)
      if (feature_position(model_, p.property, f) == position) return true;
    return false;
  }

  const Model& model_;
  const EstimationSetup& setup_;
  const std::vector<ModelParameter>& parameters_;
  SystemLayout layout_;
  ObservationSampler sampler_;
  std::vector<std::size_t> flow_positions_;
};

}  // namespace

SimulatedTargets simulate_targets(const Model& base, const EstimationSetup& setup,
                                  const Eigen::VectorXd& values) {
  const Model model = model_with_parameters(
      base, setup, std::vector<double>(values.data(), values.data() + values.size()));
  std::vector<ModelParameter> parameters;
  for (const EstimatedParameter& e : setup.parameters) parameters.push_back(e.parameter);
  TargetRecorder rec(model, setup, parameters);
  const SensitivityRun run = run_with_sensitivities(model, parameters, rec);
  if (!run.run.converged) throw std::runtime_error("the run did not converge: " + run.run.failure);
  const std::size_t p = parameters.size();
  SimulatedTargets out;
  out.values.resize(setup.n_measurements());
  out.d_ln_p.resize(setup.n_measurements(), static_cast<Eigen::Index>(p));
  Eigen::Index row = 0;
  std::size_t flow = 0;
  for (const EstimationTarget& t : setup.targets) {
    const std::size_t c =
        t.kind == TargetKind::flow ? rec.flow_channel(flow++) : rec.bore_channel(t.bore);
    const std::size_t other = rec.bore_channel(t.other_bore);
    for (double time : t.times) {
      for (std::size_t j = 0; j <= p; ++j) {
        double v = rec.at(time, c + j);
        if (t.kind == TargetKind::drawdown) v = rec.rows.front()[c + j] - v;
        if (t.kind == TargetKind::head_difference) v -= rec.at(time, other + j);
        if (j == 0)
          out.values[row] = v;
        else
          out.d_ln_p(row, static_cast<Eigen::Index>(j - 1)) = v;
      }
      ++row;
    }
  }
  return out;
}

Eigen::VectorXd composite_scaled_sensitivities(const Eigen::MatrixXd& d_ln_p,
                                               const Eigen::VectorXd& weights) {
  const Eigen::Index n = d_ln_p.rows();
  Eigen::VectorXd css(d_ln_p.cols());
  for (Eigen::Index j = 0; j < d_ln_p.cols(); ++j)
    css[j] = std::sqrt((d_ln_p.col(j).array().square() * weights.array()).sum() / double(n));
  return css;
}

EstimationResult estimate_parameters(const Model& base, const EstimationSetup& setup) {
  const auto k = static_cast<Eigen::Index>(setup.parameters.size());
  const Eigen::Index n = setup.n_measurements();
  EstimationResult result;
  result.observed.resize(n);
  result.weights.resize(n);
  Eigen::Index row = 0;
  for (const EstimationTarget& t : setup.targets)
    for (std::size_t i = 0; i < t.values.size(); ++i, ++row) {
      result.observed[row] = t.values[i];
      result.weights[row] = t.weights[i];
    }
  BoundedFitProblem problem;
  problem.observed = result.observed;
  problem.weights = result.weights;
  problem.start.resize(k);
  problem.lower.resize(k);
  problem.upper.resize(k);
  problem.linear.resize(static_cast<std::size_t>(k));
  bool any_prior = false;
  for (const EstimatedParameter& e : setup.parameters) any_prior |= e.prior.has_value();
  if (any_prior) {
    problem.prior = Eigen::VectorXd::Ones(k);
    problem.prior_weights = Eigen::VectorXd::Zero(k);
  }
  for (Eigen::Index j = 0; j < k; ++j) {
    const EstimatedParameter& e = setup.parameters[static_cast<std::size_t>(j)];
    problem.start[j] = e.start;
    problem.lower[j] = e.lower;
    problem.upper[j] = e.upper;
    problem.linear[static_cast<std::size_t>(j)] = !e.log;
    if (e.prior) {
      problem.prior[j] = *e.prior;
      problem.prior_weights[j] = e.prior_weight;
    }
  }
  problem.model_with_jacobian = [&](const Eigen::VectorXd& p, Eigen::MatrixXd* jac) {
    ++result.n_model_runs;
    SimulatedTargets s = simulate_targets(base, setup, p);
    if (jac) *jac = std::move(s.d_ln_p);
    return s.values;
  };
  BoundedFitSettings settings;
  settings.max_iterations = setup.max_iterations;
  settings.relative_step_tolerance = 1e-8;
  settings.relative_cost_tolerance = 1e-12;
  result.fit = fit_bounded_least_squares(problem, settings);
  result.css = composite_scaled_sensitivities(result.fit.jacobian, result.weights);

  auto name = [&](Eigen::Index j) {
    return setup.parameters[static_cast<std::size_t>(j)].parameter.name;
  };
  if (!result.fit.converged)
    result.warnings.push_back("the fit stopped after " + std::to_string(result.fit.n_iterations) +
                              " iterations without converging (raise [estimate].max_iterations)");
  for (Eigen::Index i = 0; i < k; ++i) {
    if (result.fit.at_bound[static_cast<std::size_t>(i)])
      result.warnings.push_back("parameter \"" + name(i) +
                                "\" ended on a bound: its interval is not meaningful");
    for (Eigen::Index j = i + 1; j < k; ++j) {
      const double r = result.fit.correlation(i, j);
      if (std::abs(r) > identifiability_correlation) {
        std::ostringstream s;
        s.precision(3);
        s << "parameters \"" << name(i) << "\" and \"" << name(j) << "\" are correlated (r = " << r
          << "): the measurements do not determine them separately";
        result.warnings.push_back(s.str());
      }
    }
  }
  return result;
}

}  // namespace aquiledger
