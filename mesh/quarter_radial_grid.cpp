#include "mesh/quarter_radial_grid.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace aquiledger {

std::vector<double> quarter_radial_widths(const QuarterRadialGridSpec& spec) {
  if (!(spec.inner > 0.0 && spec.growth > 1.0 && spec.extent > spec.inner) ||
      !std::isfinite(spec.extent))
    throw std::invalid_argument(
        "quarter radial grid: needs inner > 0, growth > 1 and a finite extent > inner");
  std::vector<double> widths{0.5 * spec.inner};
  double w = spec.inner, sum = 0.5 * spec.inner, centre = 0.0;
  std::vector<double> anchors = spec.anchors;
  std::sort(anchors.begin(), anchors.end());
  for (double a : anchors) {
    const double d = a - centre;  // to cover by centre-to-centre spacings
    if (!(d >= w) || !std::isfinite(a)) continue;
    // n cells with widths w q, ..., w q^n put the last centre at centre + spacing(n, q).
    const auto spacing = [&](int n, double q) {
      double s = 0.5 * w, wi = w;
      for (int i = 1; i <= n; ++i) {
        wi *= q;
        s += i < n ? wi : 0.5 * wi;
      }
      return s;
    };
    const auto ratio = [&](int n) {  // spacing(n, q) = d by bisection on q in [0.5, 4]
      double lo = 0.5, hi = 4.0;
      for (int it = 0; it < 200; ++it) {
        const double mid = 0.5 * (lo + hi);
        (spacing(n, mid) < d ? lo : hi) = mid;
      }
      return 0.5 * (lo + hi);
    };
    int n = 1;
    while (spacing(n, spec.growth) < d) ++n;
    double q = ratio(n);
    if (n > 1) {  // n - 1 cells growing faster, if that is nearer the growth asked for
      const double q_fewer = ratio(n - 1);
      if (q < 1.0 ||
          std::abs(std::log(q_fewer / spec.growth)) < std::abs(std::log(q / spec.growth)))
        q = q_fewer, n = n - 1;
    }
    for (int i = 1; i <= n; ++i) {
      w *= q;
      widths.push_back(w);
      sum += w;
    }
    centre = a;
  }
  while (sum < spec.extent) {
    w *= spec.growth;
    widths.push_back(w);
    sum += w;
  }
  return widths;
}

RectilinearGrid quarter_radial_grid(const QuarterRadialGridSpec& spec) {
  std::vector<double> dx = quarter_radial_widths(spec);
  std::vector<double> dy(dx.rbegin(), dx.rend());  // north to south: the half cell last
  return RectilinearGrid(std::move(dx), std::move(dy), 0.0, 0.0);
}

double quarter_radial_x_factor(const RectilinearGrid&, int col) { return col == 0 ? 0.5 : 1.0; }

double quarter_radial_y_factor(const RectilinearGrid& grid, int row) {
  return row == grid.n_rows() - 1 ? 0.5 : 1.0;
}

}  // namespace aquiledger
