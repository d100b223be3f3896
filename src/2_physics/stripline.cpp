// Stripline: Cohn's exact zero-thickness impedance, scaled by Wheeler's thickness correction.
#include "2_physics/stripline.h"

#include <cmath>
#include <stdexcept>

#include "2_physics/constants.h"
#include "2_physics/elliptic.h"

namespace rungs::physics {
namespace {

// Beyond this x = pi W/2b, k = sech x is below 1e-8, so k^2 is under the rounding of 1
// and the leading terms K(k) = pi/2, K(k') = ln(4/k) (A&S 17.3.11, 17.3.26; numbers
// recalled) are exact in double precision; they also hold where cosh x overflows (x > 710,
// W above about 450 b).
constexpr double kWideStripX = 20.0;

// sqrt(er) Z0 of a zero-thickness strip (Cohn, IRE Trans. MTT-2, 1954).
double cohn_air_impedance(double w_over_b) {
  const double x = kPi * w_over_b / 2.0;
  if (x > kWideStripX) {
    // ln(4/sech x) = ln(4 cosh x) = x + ln 2 + ln(1 + e^(-2x)), free of overflow.
    const double log_four_over_k = x + std::log(2.0) + std::log1p(std::exp(-2.0 * x));
    return kEta0 / 4.0 * (kPi / 2.0) / log_four_over_k;
  }
  // k and k' each from its own function: 1 - k^2 would lose k' for narrow strips and
  // 1 - k'^2 would lose k for wide ones.
  return kEta0 / 4.0 * elliptic_k_ratio(1.0 / std::cosh(x), std::tanh(x));
}

// The logarithm in Wheeler's stripline formula (Wheeler, IEEE Trans. MTT-26, 1978),
// Z0 = (30/sqrt er) ln{...}; only ratios of it are used, so the 30/sqrt(er) is left out.
double wheeler_log(double width, double spacing, double thickness) {
  const double x = thickness / spacing;
  const double core = spacing - thickness;
  double widening = 0.0;  // dW; at t = 0 the formula's x ln x is 0 * infinity, limit 0.
  if (x > 0.0) {
    // Effective added width of a thick strip: dW/(b - t) = x/(pi(1 - x)) {1 - ln[...]/2},
    // m = 2/(1 + (2/3) x/(1 - x)).
    const double m = 2.0 / (1.0 + (2.0 / 3.0) * x / (1.0 - x));
    const double near = x / (2.0 - x);
    const double far = std::pow(0.0796 * x / (width / spacing + 1.1 * x), m);
    widening = core * x / (kPi * (1.0 - x)) * (1.0 - 0.5 * std::log(near * near + far));
  }
  const double q = (8.0 / kPi) * core / (width + widening);
  // (4/pi)(b - t)/W' = q/2.
  return std::log(1.0 + 0.5 * q * (q + std::sqrt(q * q + 6.27)));
}

}  // namespace

double stripline_z0(double width, double spacing, double thickness, double er) {
  if (!(width > 0.0)) throw std::domain_error("stripline width must be positive");
  if (!(spacing > 0.0)) throw std::domain_error("stripline spacing must be positive");
  if (!(thickness >= 0.0 && thickness < spacing)) {
    throw std::domain_error("stripline thickness must be at least 0 and below the spacing");
  }
  if (!(er >= 1.0)) throw std::domain_error("stripline er must be at least 1");
  const double cohn = cohn_air_impedance(width / spacing) / std::sqrt(er);
  if (thickness == 0.0) return cohn;
  // Wheeler's thickness effect as a ratio, so that the zero-thickness value stays Cohn's
  // exact one (Wheeler's own is within about 0.5 % of it) and t -> 0 is continuous.
  return cohn * wheeler_log(width, spacing, thickness) / wheeler_log(width, spacing, 0.0);
}

PerLength stripline_per_length(double width, double spacing, double thickness, double er) {
  // A homogeneous dielectric: TEM, velocity c/sqrt(er).
  return per_length_from_z0_velocity(stripline_z0(width, spacing, thickness, er),
                                     kSpeedOfLight / std::sqrt(er));
}

}  // namespace rungs::physics
