// Hantush (1961) partial penetration: the cosine series against an independent scipy
// computation with image sinks (tests/data/pumping/partial_penetration_reference.py), and the
// facts it must obey.
#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>
#include <optional>

#include "postproc/analytical_solutions.hpp"
#include "postproc/partial_penetration.hpp"
#include "postproc/pumping_test_fit.hpp"
#include "postproc/well_test_models.hpp"

using namespace aquiledger;

namespace {
constexpr double pi = std::numbers::pi;

struct PartialPenetrationCase {
  double transmissivity, storativity, ratio, thickness, r, d, l, d_obs, l_obs, t, reference;
};

PartialPenetration screens_of(const PartialPenetrationCase& c) {
  return {c.thickness, c.d, c.l, c.d_obs, c.l_obs, 0.0};
}
}  // namespace

TEST_CASE("Hantush's partial-penetration series matches image sinks integrated by scipy",
          "[partial_penetration]") {
  // 4 pi T s / Q from tests/data/pumping/partial_penetration_reference.py (/usr/bin/python3,
  // scipy.integrate.quad of the continuous point sink with images in z; Carslaw and Jaeger,
  // 1959, from memory): a different representation from the series. r / b from 0.02 to 1,
  // screens at the top, middle and base, piezometers, K_z / K_r from 0.05 to 1, u from 0.9
  // to 1e-7.
  const PartialPenetrationCase cases[] = {
      {200.0, 0.0002, 1.0, 30.0, 6.0, 0.0, 10.0, 25.0, 25.0, 1e-05, 6.21389973163412e-05},
      {200.0, 0.0002, 1.0, 30.0, 6.0, 0.0, 10.0, 25.0, 25.0, 0.001, 2.27180262492167},
      {200.0, 0.0002, 1.0, 30.0, 6.0, 0.0, 10.0, 25.0, 25.0, 0.1, 6.8680809551362},
      {200.0, 0.0002, 0.1, 30.0, 1.5, 10.0, 20.0, 0.0, 5.0, 1e-05, 4.83238781053577e-06},
      {200.0, 0.0002, 0.1, 30.0, 1.5, 10.0, 20.0, 0.0, 5.0, 0.001, 1.53482716091966},
      {200.0, 0.0002, 0.1, 30.0, 1.5, 10.0, 20.0, 0.0, 5.0, 0.1, 6.13619484493442},
      {200.0, 0.0002, 0.3, 30.0, 30.0, 20.0, 30.0, 22.0, 28.0, 0.001, 1.58747614274282},
      {200.0, 0.0002, 0.3, 30.0, 30.0, 20.0, 30.0, 22.0, 28.0, 0.1, 5.99254164539625},
      {200.0, 0.0002, 0.3, 30.0, 30.0, 20.0, 30.0, 22.0, 28.0, 1.0, 8.29310299072714},
      {200.0, 0.0002, 1.0, 30.0, 0.6, 5.0, 15.0, 10.0, 10.0, 1e-06, 5.75608808824608},
      {200.0, 0.0002, 1.0, 30.0, 0.6, 5.0, 15.0, 10.0, 10.0, 0.0001, 15.4935320841579},
      {200.0, 0.0002, 1.0, 30.0, 0.6, 5.0, 15.0, 10.0, 10.0, 0.01, 20.1880367504275},
      {200.0, 0.0002, 0.05, 30.0, 12.0, 0.0, 6.0, 0.0, 6.0, 0.0001, 3.29117756968214},
      {200.0, 0.0002, 0.05, 30.0, 12.0, 0.0, 6.0, 0.0, 6.0, 0.01, 12.6413270643762},
      {200.0, 0.0002, 0.05, 30.0, 12.0, 0.0, 6.0, 0.0, 6.0, 1.0, 17.2440768677362},
  };
  for (const PartialPenetrationCase& c : cases) {
    const double s = hantush_partial_penetration_drawdown(1.0, c.transmissivity, c.storativity,
                                                          c.ratio, c.r, c.t, screens_of(c));
    INFO("r " << c.r << " ratio " << c.ratio << " t " << c.t);
    CHECK(4.0 * pi * c.transmissivity * s == Approx(c.reference).epsilon(1e-9));
  }
}

TEST_CASE("a fully penetrating screen gives Theis, and the screens are reciprocal",
          "[partial_penetration]") {
  const double t_aq = 150.0, s_aq = 3e-4, b = 25.0, r = 4.0;
  for (double t : {1e-4, 1e-2, 1.0}) {
    const double theis = theis_drawdown(1.0, t_aq, s_aq, r, t);
    // Either well screened through the whole aquifer: every term's sin(n pi l / b) -
    // sin(n pi d / b) vanishes, and the drawdown is Theis's (1935) (Hantush, 1961).
    CHECK(hantush_partial_penetration_drawdown(1.0, t_aq, s_aq, 0.2, r, t,
                                               {b, 5.0, 12.0, 0.0, b, 0.0}) == theis);
    CHECK(hantush_partial_penetration_drawdown(1.0, t_aq, s_aq, 0.2, r, t,
                                               {b, 0.0, b, 7.0, 7.0, 0.0}) == theis);
    // Reciprocity (the Green's function of the diffusion equation is symmetric; a fact of the
    // trade): pumping screen A and watching screen B gives the drawdown of the reverse.
    const double ab =
        hantush_partial_penetration_drawdown(1.0, t_aq, s_aq, 0.2, r, t, {b, 2.0, 9.0, 15.0, 24.0});
    const double ba =
        hantush_partial_penetration_drawdown(1.0, t_aq, s_aq, 0.2, r, t, {b, 15.0, 24.0, 2.0, 9.0});
    CHECK(ab == Approx(ba).epsilon(1e-12));
  }
}

TEST_CASE("the partial-penetration effect fades beyond 1.5 b sqrt(K_r / K_z)",
          "[partial_penetration]") {
  // Hantush (1961): beyond r = 1.5 b sqrt(K_r / K_z) the drawdown is that of a fully
  // penetrating well (common practice). At that distance the largest term is
  // 2 K0(1.5 pi) = 0.0117 (scipy.special.k0), against W(u) >= 2 at late time.
  const double t_aq = 200.0, s_aq = 2e-4, b = 30.0;
  for (double ratio : {1.0, 0.1}) {
    const double r = 1.5 * b / std::sqrt(ratio);
    for (const PartialPenetration& screens :
         {PartialPenetration{b, 0.0, 10.0, 25.0, 25.0}, PartialPenetration{b, 10.0, 20.0, 0.0, 6.0},
          PartialPenetration{b, 24.0, 30.0, 24.0, 30.0}}) {
      for (double t : {0.1, 10.0}) {
        const double theis = theis_drawdown(1.0, t_aq, s_aq, r, t);
        const double s =
            hantush_partial_penetration_drawdown(1.0, t_aq, s_aq, ratio, r, t, screens);
        // Measured: at most 0.72 % (a 6 m screen at the base watched at the base, t = 0.1 d).
        CHECK(std::abs(s - theis) < 0.01 * theis);
        // A fifth of that distance away the screens matter: the rule is not met trivially.
        const double near_theis = theis_drawdown(1.0, t_aq, s_aq, 0.2 * r, t);
        const double near =
            hantush_partial_penetration_drawdown(1.0, t_aq, s_aq, ratio, 0.2 * r, t, screens);
        if (screens.observed_top != 0.0 || screens.pumped_top != 10.0)
          CHECK(std::abs(near - near_theis) > 0.05 * near_theis);
      }
    }
  }
}

namespace {

/// A test whose drawdowns are Hantush's (1961) for T = 200 m2/d, S = 2e-4, K_z / K_r = 0.2 in
/// a confined aquifer 30 m thick (top -5 m): the pumped well screened over the top 10 m,
/// 1000 m3/d for 0.5 d then recovery to 1 d; a piezometer at 8 m with its tip 25 m deep and a
/// well at 20 m screened 15 to 21 m deep.
PumpingTest partial_penetration_test(std::optional<double> held_ratio) {
  PumpingTest test;
  test.schedule = {{0.0, 1000.0}, {0.5, 0.0}};
  TestAquiferGeometry aquifer;
  aquifer.has_top = true;
  aquifer.top = -5.0;
  aquifer.bottom = -35.0;
  aquifer.static_level = 2.0;
  test.aquifer = aquifer;
  test.pumped_screen = WellScreen{-5.0, -15.0};
  test.anisotropy_ratio = held_ratio;
  ObservationSeries piezometer, well;
  piezometer.name = "piezometer";
  piezometer.distance = 8.0;
  piezometer.screen = WellScreen{-30.0, -30.0};
  well.name = "well";
  well.distance = 20.0;
  well.screen = WellScreen{-20.0, -26.0};
  test.wells = {piezometer, well};
  const std::vector<double> truth{200.0, 2e-4, 0.2};
  for (ObservationSeries& w : test.wells)
    for (int i = 0; i < 24; ++i) {
      const double t = 1e-4 * std::pow(1e4, i / 23.0);
      w.times.push_back(t);
      w.drawdowns.push_back(schedule_drawdown(WellTestModel::hantush_partial_penetration, truth,
                                              test.schedule, w.distance, t, {}, {},
                                              partial_penetration_of(test, w)));
    }
  return test;
}

}  // namespace

TEST_CASE("noise-free partial-penetration tests are recovered to 0.5 %", "[partial_penetration]") {
  for (std::optional<double> held : {std::optional<double>{0.2}, std::optional<double>{}}) {
    const PumpingTest test = partial_penetration_test(held);
    const ModelFit fit = fit_pumping_test(test, WellTestModel::hantush_partial_penetration);
    REQUIRE(fit.parameter_names.size() == (held ? 2u : 3u));
    CHECK(fit.fit.parameters[0] == Approx(200.0).epsilon(0.005));
    CHECK(fit.fit.parameters[1] == Approx(2e-4).epsilon(0.005));
    if (!held) CHECK(fit.fit.parameters[2] == Approx(0.2).epsilon(0.005));
  }
}

TEST_CASE("auto weighs partial penetration; the numerical model refuses partial screens",
          "[partial_penetration]") {
  const PumpingTest test = partial_penetration_test(0.2);
  const std::vector<WellTestModel> candidates = automatic_candidates(test);
  CHECK(std::find(candidates.begin(), candidates.end(),
                  WellTestModel::hantush_partial_penetration) != candidates.end());
  const PumpingTestInterpretation auto_fit = interpret_pumping_test(test, std::nullopt);
  CHECK(auto_fit.chosen_fit().model == WellTestModel::hantush_partial_penetration);
  CHECK_THROWS_WITH(fit_pumping_test(test, WellTestModel::numerical),
                    Catch::Contains("two-dimensional"));
  // Without screens the candidates are those of a fully penetrating test.
  PumpingTest full = test;
  full.pumped_screen.reset();
  for (ObservationSeries& w : full.wells) w.screen.reset();
  full.anisotropy_ratio.reset();
  const std::vector<WellTestModel> plain = automatic_candidates(full);
  CHECK(std::find(plain.begin(), plain.end(), WellTestModel::hantush_partial_penetration) ==
        plain.end());
}
