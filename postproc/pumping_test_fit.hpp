#pragma once
// Interpreting a pumping test: one model fitted to the drawdowns of every observation well at
// once, the choice between models by AICc, and a suggested classification of the aquifer.
// Pure numerics, no I/O (the test file is read by io/model_file/pumping_test_reader.hpp).

#include <optional>
#include <string>
#include <vector>

#include "postproc/bounded_least_squares.hpp"
#include "postproc/well_test_models.hpp"

namespace aquiledger {

/// A well's open interval as elevations (L, the datum of [aquifer]): a screen from top down to
/// bottom, or a piezometer's tip (top == bottom).
struct WellScreen {
  double top = 0.0;     ///< L
  double bottom = 0.0;  ///< L, <= top
};

/// The drawdown series measured in one observation (or the pumped) well.
struct ObservationSeries {
  std::string name;
  double distance = 0.0;          ///< L, radial distance from the pumped well
  double radius = 0.0;            ///< L, well radius (0 when not given)
  std::vector<ImageWell> images;  ///< straight boundaries seen from this well
  /// Degrees clockwise from north of the well seen from the pumped well; needed (by the
  /// numerical model) when the test has straight lines (PumpingTest::lines).
  std::optional<double> bearing;
  std::vector<double> times;      ///< T since the start of the test, increasing
  std::vector<double> drawdowns;  ///< L, positive downwards
  /// The well's screen or piezometer tip; without one the well is screened through the
  /// whole aquifer (when the test has screen data at all).
  std::optional<WellScreen> screen;
};

/// The aquifer's vertical geometry, when the test file gives it ([aquifer]): with a top above
/// the static level the aquifer is confined at first and becomes a water-table one where the
/// head falls below its top (switching cells; parameters T, S, Sy); without a top (or with
/// the static level at or below it) it is a water-table aquifer (parameters T, Sy).
struct TestAquiferGeometry {
  bool has_top = false;
  double top = 0.0;           ///< L, bottom of the confining bed (when has_top)
  double bottom = 0.0;        ///< L, base of the aquifer
  double static_level = 0.0;  ///< L, the head before pumping, same datum
  /// True when the aquifer starts confined (a top above the static level).
  bool starts_confined() const { return has_top && static_level > top; }
  /// L, the saturated thickness before pumping: top - bottom when confined, else
  /// static_level - bottom. T = K times this, S = Ss times this.
  double thickness() const { return (starts_confined() ? top : static_level) - bottom; }
};

/// [aquifer].leakance: a leaky confining bed over a source bed whose head stays at the static
/// level (Hantush and Jacob, 1955), for the numerical model.
struct TestLeakance {
  bool fitted = true;  ///< fitted (leakance = "fit"), else held at value
  double value = 0.0;  ///< 1/T, K' / b' of the confining bed when held
};

/// What a straight line in the aquifer is ([[boundary]] of the test file).
enum class TestLineKind {
  barrier,   ///< no flow across the line
  recharge,  ///< the head stays at the static level on the line
  zone,      ///< beyond the line the aquifer has its own T and S (fitted)
};

/// A straight line in the aquifer, for the numerical model: lines are parallel or
/// perpendicular to each other, at most one zone line, the wells on the pumped well's side of
/// every barrier and recharge line.
struct TestLine {
  TestLineKind kind = TestLineKind::barrier;
  double distance = 0.0;  ///< L, from the pumped well to the line, perpendicular to it
  double bearing = 0.0;   ///< degrees clockwise from north of that perpendicular
};

/// A pumping test as read from its file.
struct PumpingTest {
  std::string title;
  std::string length_unit = "m";
  std::string time_unit = "d";
  std::vector<RateStep> schedule;  ///< sorted by start; rate 0 = recovery
  PumpedWellRadii pumped_well;     ///< the pumped well's radii (0 when not given)
  /// The aquifer's geometry ([aquifer]), used by the numerical model only.
  std::optional<TestAquiferGeometry> aquifer;
  std::optional<TestLeakance> leakance;  ///< the numerical model's leakage, when given
  std::vector<ObservationSeries> wells;
  /// Straight boundaries and zone lines ([[boundary]]), used by the numerical model only.
  std::vector<TestLine> lines;
  /// The pumped well's screen; without one it is screened through the whole aquifer.
  std::optional<WellScreen> pumped_screen;
  /// K_z / K_r (-) of the partial-penetration model when held ([aquifer].anisotropy_ratio);
  /// fitted when empty.
  std::optional<double> anisotropy_ratio;
  int n_observations() const;
  /// True when the pumped well or an observation well has a screen (needs `aquifer`).
  bool has_screens() const;
  /// True when some screen (the pumped well's or a well's) leaves part of the aquifer out.
  bool has_partial_screens() const;
};

/// The screens of the pumped well and of `well` as depths below the aquifer's top, for
/// Hantush's (1961) model (postproc/partial_penetration.hpp), with the held K_z / K_r (0 when
/// fitted). A thickness of 0 when the test has no screen data or no aquifer geometry.
PartialPenetration partial_penetration_of(const PumpingTest& test, const ObservationSeries& well);

/// One model fitted to all wells.
struct ModelFit {
  WellTestModel model = WellTestModel::theis;
  std::vector<std::string> parameter_names;  ///< in the order of fit.parameters
  BoundedFitResult fit;
  std::vector<std::vector<double>> fitted;  ///< L, per well and time (every time, also unused)
  std::vector<std::vector<bool>> used;      ///< per well and time: part of the fit
  int n_used = 0;                           ///< observations in the fit
  double aicc = 0.0;                        ///< Hurvich and Tsai (1989), over n_used
  double rms_residual = 0.0;                ///< L
  /// The fitted model's drawdown (L) per well at curve_times (T, since the start of the test;
  /// 80 evenly spaced in ln t after pumping began) for the charts: filled by models without a
  /// closed form (the numerical one); empty otherwise (the charts evaluate the closed form).
  std::vector<std::vector<double>> curve_times, curve;
  /// What the fit's model was: for the numerical model its grid and steps; empty otherwise.
  std::string description;
};

/// The interpretation: every candidate fitted, the chosen one, the derivative per well and
/// the wording of the classification (a suggestion, never a verdict).
struct PumpingTestInterpretation {
  std::vector<ModelFit> candidates;
  std::size_t chosen = 0;  ///< index into candidates
  bool automatic = false;  ///< chosen by AICc among the candidates
  std::string choice_reason;
  std::vector<std::vector<double>> derivatives;  ///< L, ds/d ln t of the measured drawdowns
  std::vector<std::string> classification;       ///< sentences for a professional to weigh
  const ModelFit& chosen_fit() const { return candidates[chosen]; }
};

/// Start values (Cooper-Jacob from the late slope of the first well) and bounds of a model.
struct ParameterGuess {
  std::vector<double> start, lower, upper;
};
ParameterGuess guess_parameters(const PumpingTest& test, WellTestModel model);

/// Fits one model to every well at once (unit weights). The Cooper-Jacob line is fitted only
/// to the points whose u = r^2 S / (4 T t) is below 0.01 (Cooper and Jacob, 1946) with the
/// Theis start values. Throws std::invalid_argument when too few points remain, or when
/// Papadopulos and Cooper (1967) lacks the pumped well's radii or a well is closer than r_w.
/// WellTestModel::numerical fits the program's flow model (numerical_well_test.hpp) from
/// these start values and bounds.
ModelFit fit_pumping_test(const PumpingTest& test, WellTestModel model);

/// The models `auto` compares: each fitted to the same points, so AICc is comparable
/// (Cooper-Jacob is an approximation of Theis, not a competing model, and is left out).
/// Hantush's (1961) partial penetration joins them, after Theis, when a screen leaves part of
/// the aquifer out.
std::vector<WellTestModel> automatic_candidates(const PumpingTest& test);

/// With a model: that model alone. Without (`auto`): every candidate, keeping the one with
/// the lowest AICc unless a simpler model is within 2 of it (Burnham and Anderson, 2002;
/// common practice).
PumpingTestInterpretation interpret_pumping_test(const PumpingTest& test,
                                                 std::optional<WellTestModel> model);

/// What the logarithmic derivative of one well's drawdowns over a constant-rate step looks
/// like, read as a hydrogeologist reads it on a log-log chart (Bourdet et al., 1989).
enum class DerivativeShape {
  too_few_points,  ///< too few points (or too short a record) to read a shape
  plateau,         ///< levels off: radial flow (Theis, 1935; Cooper and Jacob, 1946)
  dip_and_return,  ///< a trough, then a return: delayed yield (Neuman, 1974), double porosity
  falls_off,       ///< falls towards zero: leakage (Hantush and Jacob, 1955) or a recharge line
  rises_late,      ///< a plateau, then a rise: a barrier (Ferris et al., 1962, images)
  unclear,         ///< none of these
};

/// The reading of one well's derivative: an early unit slope (well-bore storage, Papadopulos
/// and Cooper, 1967) and the shape of what follows it.
struct DerivativeReading {
  bool unit_slope_start = false;  ///< ds/d ln t about equal to s over the early record
  DerivativeShape shape = DerivativeShape::too_few_points;
  double smoothing = 0.0;  ///< Bourdet's window L (in ln t) chosen from the data's scatter
};

/// Reads the shape of the logarithmic derivative of drawdowns `drawdowns` (L) at times
/// `times` (T since the start of a constant-rate step, increasing, > 0). The smoothing window
/// is chosen from the scatter of the drawdowns, the derivative is summarised by medians over
/// bins of ln t, and the shape is read from those medians (docs/pumping-tests.md).
DerivativeReading read_derivative_shape(const std::vector<double>& times,
                                        const std::vector<double>& drawdowns);

/// Sentences suggesting what the fitted storativity and the derivative's shape may mean.
/// Ranges of storativity are common practice: about 1e-5..1e-3 confined, 0.01..0.3 water
/// table (specific yield).
std::vector<std::string> classify_aquifer(const PumpingTest& test, const ModelFit& fit);

}  // namespace aquiledger
