#include "postproc/parameter_estimation.hpp"

#include <cmath>
#include <sstream>
#include <stdexcept>

#include "postproc/observation_sampler.hpp"
#include "solver/adjoint_gradient.hpp"
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

  const ObservationSampler& sampler() const { return sampler_; }
  const SystemLayout& layout() const { return layout_; }
  const std::vector<std::size_t>& flow_positions() const { return flow_positions_; }
  /// True when parameter p scales the flow of the feature at list_features position `position`.
  bool acts_on(const ModelParameter& p, std::size_t position) const {
    if (is_cell_property(p.property)) return false;
    for (std::size_t f : p.features)
      if (feature_position(model_, p.property, f) == position) return true;
    return false;
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
  const Model& model_;
  const EstimationSetup& setup_;
  const std::vector<ModelParameter>& parameters_;
  SystemLayout layout_;
  ObservationSampler sampler_;
  std::vector<std::size_t> flow_positions_;
};

/// A target's simulated value at `time` is a linear combination of recorded channels: calls
/// term(state, channel, coefficient) for each. Linear interpolation in time between recorded
/// states (the last state after the end); a drawdown is state 0 minus that; a head
/// difference, bore minus other bore. Both the values with their sensitivities and the adjoint
/// gradient go through it.
template <class Term>
void for_each_target_term(const std::vector<double>& times, const EstimationTarget& t,
                          std::size_t channel, std::size_t other, double time, Term term) {
  const auto interpolate = [&](std::size_t c, double sign) {
    std::size_t i = 1;
    while (i < times.size() && times[i] < time) ++i;
    if (i >= times.size()) {
      term(times.size() - 1, c, sign);
      return;
    }
    const double t0 = times[i - 1], t1 = times[i];
    const double a = t1 > t0 ? (time - t0) / (t1 - t0) : 1.0;
    term(i - 1, c, sign * (1.0 - a));
    term(i, c, sign * a);
  };
  if (t.kind == TargetKind::drawdown) term(0, channel, 1.0);
  interpolate(channel, t.kind == TargetKind::drawdown ? -1.0 : 1.0);
  if (t.kind == TargetKind::head_difference) interpolate(other, -1.0);
}

/// Calls f(target, time, channel, other) for every measurement, in the set-up's order.
template <class F>
void for_each_measurement(const TargetRecorder& rec, const EstimationSetup& setup, F f) {
  std::size_t flow = 0;
  for (const EstimationTarget& t : setup.targets) {
    const std::size_t c =
        t.kind == TargetKind::flow ? rec.flow_channel(flow++) : rec.bore_channel(t.bore);
    for (double time : t.times) f(t, time, c, rec.bore_channel(t.other_bore));
  }
}

std::vector<ModelParameter> model_parameters(const EstimationSetup& setup) {
  std::vector<ModelParameter> parameters;
  for (const EstimatedParameter& e : setup.parameters) parameters.push_back(e.parameter);
  return parameters;
}

/// The objective's side of the adjoint gradient: the targets' channels recorded in the
/// forward run, then dPhi/d channel per state, spread back onto the heads.
class TargetAdjoint : public AdjointObjective {
 public:
  TargetAdjoint(const Model& model, const EstimationSetup& setup, const MeasuredTargets& measured,
                const std::vector<ModelParameter>& parameters)
      : model_(model),
        setup_(setup),
        measured_(measured),
        parameters_(parameters),
        rec_(model, setup, no_parameters_) {}

  void state(const StepInfo* info, std::span<const double> head) override {
    periods_.push_back(info ? info->period : 0);
    rec_.state(info, head, no_sensitivities_);
  }
  void run_done() override {
    simulated.setZero(setup_.n_measurements());
    dphi_.assign(rec_.rows.size(), std::vector<double>(rec_.rows.front().size(), 0.0));
    Eigen::Index row = 0;
    for_each_measurement(
        rec_, setup_,
        [&](const EstimationTarget& t, double time, std::size_t c, std::size_t other) {
          for_each_target_term(rec_.times, t, c, other, time,
                               [&](std::size_t k, std::size_t ch, double a) {
                                 simulated[row] += a * rec_.rows[k][ch];
                               });
          // Phi = sum w (observed - simulated)^2: dPhi/d simulated = -2 w r.
          const double d =
              -2.0 * measured_.weights[row] * (measured_.observed[row] - simulated[row]);
          for_each_target_term(
              rec_.times, t, c, other, time,
              [&](std::size_t k, std::size_t ch, double a) { dphi_[k][ch] += a * d; });
          ++row;
        });
    // A flow channel is -q, and a parameter of that feature scales q: d channel / d ln p = -q.
    explicit_gradient.setZero(static_cast<Eigen::Index>(parameters_.size()));
    for (std::size_t j = 0; j < parameters_.size(); ++j)
      for (std::size_t f = 0; f < rec_.flow_positions().size(); ++f)
        if (rec_.acts_on(parameters_[j], rec_.flow_positions()[f]))
          for (std::size_t k = 0; k < dphi_.size(); ++k)
            explicit_gradient[static_cast<Eigen::Index>(j)] +=
                dphi_[k][rec_.flow_channel(f)] * rec_.rows[k][rec_.flow_channel(f)];
  }
  void add_head_gradient(std::size_t k, std::span<const double> head,
                         std::span<double> g) override {
    const std::vector<double>& d = dphi_[k];
    for (std::size_t b = 0; b < model_.observations.size(); ++b)
      if (d[rec_.bore_channel(b)] != 0.0)
        rec_.sampler().add_transposed(b, d[rec_.bore_channel(b)], g);
    for (std::size_t f = 0; f < rec_.flow_positions().size(); ++f) {
      const double df = d[rec_.flow_channel(f)];
      if (df == 0.0) continue;
      for (const CellStressFlow& c :
           feature_cell_flows(model_, rec_.layout(), periods_[k], head, rec_.flow_positions()[f]))
        g[static_cast<std::size_t>(c.cell.value)] -= df * c.q.slope;
    }
  }

  Eigen::VectorXd simulated, explicit_gradient;

 private:
  const Model& model_;
  const EstimationSetup& setup_;
  const MeasuredTargets& measured_;
  const std::vector<ModelParameter>& parameters_;
  const std::vector<ModelParameter> no_parameters_;
  const HeadSensitivities no_sensitivities_;
  TargetRecorder rec_;
  std::vector<std::size_t> periods_;
  std::vector<std::vector<double>> dphi_;
};

/// Adds the priors to Phi and maps dPhi/d ln p to the fit's variables x (ln p, or p).
ObjectiveGradient in_fit_variables(const EstimationSetup& setup, const Eigen::VectorXd& values,
                                   const MeasuredTargets& measured, Eigen::VectorXd simulated,
                                   const Eigen::VectorXd& d_ln_p) {
  ObjectiveGradient out;
  const Eigen::VectorXd r = measured.observed - simulated;
  out.objective = (r.array().square() * measured.weights.array()).sum();
  out.gradient.resize(values.size());
  for (Eigen::Index j = 0; j < values.size(); ++j) {
    const EstimatedParameter& e = setup.parameters[static_cast<std::size_t>(j)];
    const double x = e.log ? std::log(values[j]) : values[j];
    out.gradient[j] = e.log ? d_ln_p[j] : d_ln_p[j] / values[j];  // d ln p / dp = 1 / p
    if (e.prior) {
      const double prior = e.log ? std::log(*e.prior) : *e.prior;
      out.objective += e.prior_weight * (prior - x) * (prior - x);
      out.gradient[j] -= 2.0 * e.prior_weight * (prior - x);
    }
  }
  out.simulated = std::move(simulated);
  return out;
}

}  // namespace

MeasuredTargets measured_targets(const EstimationSetup& setup) {
  MeasuredTargets m;
  m.observed.resize(setup.n_measurements());
  m.weights.resize(setup.n_measurements());
  Eigen::Index row = 0;
  for (const EstimationTarget& t : setup.targets)
    for (std::size_t i = 0; i < t.values.size(); ++i, ++row) {
      m.observed[row] = t.values[i];
      m.weights[row] = t.weights[i];
    }
  return m;
}

ObjectiveGradient adjoint_objective_gradient(const Model& base, const EstimationSetup& setup,
                                             const Eigen::VectorXd& values) {
  const Model model = model_with_parameters(
      base, setup, std::vector<double>(values.data(), values.data() + values.size()));
  const std::vector<ModelParameter> parameters = model_parameters(setup);
  const MeasuredTargets measured = measured_targets(setup);
  TargetAdjoint objective(model, setup, measured, parameters);
  const AdjointRun run = run_with_adjoint_gradient(model, parameters, objective);
  if (!run.run.converged) throw std::runtime_error("the run did not converge: " + run.run.failure);
  return in_fit_variables(setup, values, measured, objective.simulated,
                          run.gradient + objective.explicit_gradient);
}

ObjectiveGradient forward_objective_gradient(const Model& base, const EstimationSetup& setup,
                                             const Eigen::VectorXd& values) {
  const SimulatedTargets s = simulate_targets(base, setup, values);
  const MeasuredTargets measured = measured_targets(setup);
  // J^T W r in ln p: dPhi/d ln p = -2 sum_i w_i r_i dy_i/d ln p.
  const Eigen::VectorXd d_ln_p =
      -2.0 * s.d_ln_p.transpose() *
      (measured.weights.array() * (measured.observed - s.values).array()).matrix();
  return in_fit_variables(setup, values, measured, s.values, d_ln_p);
}

SimulatedTargets simulate_targets(const Model& base, const EstimationSetup& setup,
                                  const Eigen::VectorXd& values) {
  const Model model = model_with_parameters(
      base, setup, std::vector<double>(values.data(), values.data() + values.size()));
  const std::vector<ModelParameter> parameters = model_parameters(setup);
  TargetRecorder rec(model, setup, parameters);
  const SensitivityRun run = run_with_sensitivities(model, parameters, rec);
  if (!run.run.converged) throw std::runtime_error("the run did not converge: " + run.run.failure);
  const std::size_t p = parameters.size();
  SimulatedTargets out;
  out.values.setZero(setup.n_measurements());
  out.d_ln_p.setZero(setup.n_measurements(), static_cast<Eigen::Index>(p));
  Eigen::Index row = 0;
  for_each_measurement(
      rec, setup, [&](const EstimationTarget& t, double time, std::size_t c, std::size_t other) {
        for_each_target_term(
            rec.times, t, c, other, time, [&](std::size_t k, std::size_t ch, double a) {
              out.values[row] += a * rec.rows[k][ch];
              for (std::size_t j = 0; j < p; ++j)
                out.d_ln_p(row, static_cast<Eigen::Index>(j)) += a * rec.rows[k][ch + 1 + j];
            });
        ++row;
      });
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
  EstimationResult result;
  const MeasuredTargets measured = measured_targets(setup);
  result.observed = measured.observed;
  result.weights = measured.weights;
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
  // A run always yields the sensitivities, so the last one is kept: the fit asks for the
  // Jacobian at a trial point it has just evaluated and accepted (bounded_least_squares.cpp),
  // which then costs no second run (the same values, bit for bit).
  Eigen::VectorXd last_p;
  SimulatedTargets last_run;
  problem.model_with_jacobian = [&](const Eigen::VectorXd& p, Eigen::MatrixXd* jac) {
    if (last_p.size() != p.size() || last_p != p) {
      ++result.n_model_runs;
      last_run = simulate_targets(base, setup, p);
      last_p = p;
    }
    if (jac) *jac = last_run.d_ln_p;
    return last_run.values;
  };
  BoundedFitSettings settings;
  settings.max_iterations = setup.max_iterations;
  settings.relative_step_tolerance = 1e-8;
  settings.relative_cost_tolerance = 1e-12;
  result.fit = fit_bounded_least_squares(problem, settings);
  result.css = composite_scaled_sensitivities(result.fit.jacobian, result.weights);
  const bool adjoint =
      setup.gradient == GradientMethod::adjoint ||
      (setup.gradient == GradientMethod::automatic && k > setup.n_measurement_times());
  result.gradient_method = adjoint ? "adjoint" : "forward";
  if (adjoint) {  // one more run and its backward pass
    result.gradient = adjoint_objective_gradient(base, setup, result.fit.parameters).gradient;
  } else {  // the fit's last Jacobian and residuals, at the estimates: -2 J^T W r
    const Eigen::VectorXd d_ln_p =
        -2.0 * result.fit.jacobian.transpose() *
        (measured.weights.array() * result.fit.residuals.array()).matrix();
    result.gradient =
        in_fit_variables(setup, result.fit.parameters, measured, result.fit.simulated, d_ln_p)
            .gradient;
  }

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
