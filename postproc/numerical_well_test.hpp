#pragma once
// The numerical model of a pumping test, for where closed forms end: the program's own flow
// model on a radial-telescoping quarter grid (mesh/quarter_radial_grid.hpp) centred on the
// pumped well, with the test's rate schedule as stress periods and the observation wells at
// their distances, fitted by the estimation machinery (forward sensitivities and the bounded
// Levenberg-Marquardt of parameter_estimation.hpp). Pure numerics, no I/O
// (docs/pumping-tests.md, "The numerical model").
#include <string>
#include <vector>

#include "mesh/well_centred_grid.hpp"
#include "postproc/estimation_setup.hpp"
#include "postproc/pumping_test_fit.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// The discretisation of the numerical model. With the defaults, on a Theis (1935) test (two
/// wells at 25 and 80 m, 4 decades of pumping and of recovery), the drawdowns at the true T
/// and S are within 1 % of the slope Q / (4 pi T) per unit ln t of Theis (measured 0.90 %;
/// tests/postproc/test_numerical_well_test.cpp), which bounds the error of the fitted S to
/// about 1 % (a drawdown error e shifts ln S by about e / (Q / (4 pi T)), Cooper and Jacob,
/// 1946); measured on the fit: T +0.12 %, S -0.23 %. The error budget is in
/// docs/pumping-tests.md.
struct NumericalTestSettings {
  /// -, the well's cell width over the nearest well's distance. Measured worst drawdown error
  /// over Q / (4 pi T) on the test above: 0.25 -> 2.4 %, 0.1 -> 0.90 %.
  double inner_fraction = 0.1;
  double width_growth = 1.1;  ///< -, ratio of consecutive cell widths
  /// -, ratio of consecutive time steps in a rate step (backward Euler lags by about half a
  /// step: measured 0.24 % of Q / (4 pi T) less error per 0.01 less growth).
  double step_growth = 1.02;
  /// -, first time step over the first measurement after the rate change (0.1 -> 1.7 %,
  /// 0.01 -> 0.90 % with the other defaults).
  double first_step_fraction = 0.01;
  /// -, the far edge over the radius of influence sqrt(2.25 T t_end / S) of the test's length
  /// (Cooper and Jacob, 1946: where their straight line reaches zero drawdown). The no-flow
  /// edge acts as an image well at least 6 such radii away, u = r^2 S / (4 T t) >= 20, whose
  /// Theis drawdown W(20) < 1e-10 is negligible.
  double extent_factor = 3.0;
  int max_steps_per_period = 4000;  ///< a guard on the step count
  /// Fit first on the coarse model of coarse_numerical_settings and start the fit on this
  /// one from its optimum: that fit then needs few runs (measured in docs/pumping-tests.md,
  /// "Cost").
  bool coarse_first = true;
  /// Levenberg-Marquardt iterations of a fit on this model (EstimationSetup::max_iterations);
  /// the coarse pass's are fewer, as it only gives the start (measured: on a switching
  /// aquifer its last 30 of 50 iterations lowered the cost by under 1e-3).
  int max_fit_iterations = 50;
};

/// The coarse model of the fit's first pass: the well's cell at least a quarter of the
/// nearest well's distance, widths growing by at least 1.2, steps by at least 1.1, the first
/// step at least 0.05 of the first measurement (about 5 times fewer steps and 3 times fewer
/// cells than the defaults), at most 12 fit iterations; coarse_first false.
NumericalTestSettings coarse_numerical_settings(const NumericalTestSettings& fine);

/// Names of the numerical model's parameters: transmissivity and storativity (confined, no
/// geometry), with specific_yield (switching), or transmissivity and specific_yield (water
/// table).
std::vector<std::string> numerical_parameter_names(const PumpingTest& test);

/// The radius (L) whose head the well's cell of `geometry` (its width `inner`, L) holds,
/// measured by a steady solve (numerical_well_test.cpp). numerical_test_model sizes the
/// well's cell from it when the casing's storage is modelled, so that the cell holds the head
/// at the well's radius.
double numerical_well_cell_radius(const WellCentredGrid& geometry, double inner);

/// The flow model of the test with parameters p (in the order of numerical_parameter_names;
/// T in L2/T, S and Sy -) on a grid reaching extent_factor radii of influence for
/// (T_grid, S_grid): wells as observations on the x axis, one stress period per rate step
/// (up to the last observation), time 0 the start of pumping.
Model numerical_test_model(const PumpingTest& test, const std::vector<double>& p,
                           double grid_transmissivity, double grid_storativity,
                           const NumericalTestSettings& settings = {});

/// The estimation of p on that model: multipliers of K, Ss and Sy on every cell (so the
/// quarter grid's halved conductivities stay halved), targets the drawdowns of every well
/// after pumping began. The model's values are the start (multipliers 1).
EstimationSetup numerical_test_setup(const PumpingTest& test, const Model& model,
                                     const std::vector<double>& lower_over_start,
                                     const std::vector<double>& upper_over_start);

/// Fits the numerical model to every well (unit weights) from the start values and bounds of
/// start and lower/upper (as guess_parameters gives them), first on the coarse model when
/// settings.coarse_first. When the fitted T and S put the
/// radius of influence beyond a third of the grid, the grid is rebuilt for them and the fit
/// repeated (at most twice). Throws std::invalid_argument for a test the model cannot take
/// (a well closer than a tenth of its distance to the next, too few drawdowns) and
/// std::runtime_error when a run does not converge.
ModelFit fit_numerical_pumping_test(const PumpingTest& test, const std::vector<double>& start,
                                    const std::vector<double>& lower,
                                    const std::vector<double>& upper,
                                    const NumericalTestSettings& settings = {});

}  // namespace aquiledger
