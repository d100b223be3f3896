// Complete elliptic integral K and the ratio K(k)/K(k'), by the arithmetic-geometric mean.
#include "2_physics/elliptic.h"

#include <cmath>
#include <limits>
#include <stdexcept>

#include "2_physics/constants.h"

namespace rungs::physics {
namespace {

// AGM(1, b) for 0 <= b <= 1 (Abramowitz & Stegun 17.6: a' = (a + b)/2,
// b' = sqrt(a b)). The gap squares at each step, so five or six steps reach full precision
// for any b not extremely small; the step bound only guards against rounding that makes
// a and b trade the last bit instead of meeting.
double agm_from_one(double b) {
  if (b == 0.0) return 0.0;  // AGM(1, 0) = 0: the iteration would only crawl towards it.
  double a = 1.0;
  constexpr double kClose = 4.0 * std::numeric_limits<double>::epsilon();
  for (int step = 0; step < 64 && std::abs(a - b) > kClose * a; ++step) {
    const double next_a = 0.5 * (a + b);
    b = std::sqrt(a * b);
    a = next_a;
  }
  return 0.5 * (a + b);
}

}  // namespace

double elliptic_k(double k) {
  if (!(k >= 0.0 && k < 1.0)) throw std::domain_error("elliptic K needs a modulus in [0, 1)");
  // (1 - k)(1 + k) rather than 1 - k^2 spares the rounding of k^2; the larger loss near
  // k = 1 is in k itself, which is why elliptic_k_ratio takes k' from the caller.
  const double k_complement = std::sqrt((1.0 - k) * (1.0 + k));
  return kPi / (2.0 * agm_from_one(k_complement));
}

double elliptic_k_ratio(double k, double k_complement) {
  if (!(k >= 0.0 && k <= 1.0) || !(k_complement > 0.0 && k_complement <= 1.0)) {
    throw std::domain_error("elliptic K ratio needs 0 <= k <= 1 and 0 < k' <= 1");
  }
  // A loose check: a caller passing a modulus and something other than its complement has a
  // bug, while the last-bit disagreement of separately computed k and k' is expected.
  if (std::abs((k * k + k_complement * k_complement) - 1.0) > 1e-9) {
    throw std::domain_error("elliptic K ratio needs k^2 + k'^2 = 1");
  }
  // K(k) = pi/(2 AGM(1, k')) and K(k') = pi/(2 AGM(1, k)), so the pi/2 cancels.
  return agm_from_one(k) / agm_from_one(k_complement);
}

}  // namespace rungs::physics
