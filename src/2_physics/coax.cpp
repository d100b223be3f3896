// Coaxial line: L' and C' from the two diameters and the dielectric (Pozar Table 2.1).
#include "2_physics/coax.h"

#include <cmath>
#include <stdexcept>

#include "2_physics/constants.h"

namespace rungs::physics {

PerLength coax_per_length(double inner, double outer, double er) {
  // Negated comparisons so that NaN fails them too.
  if (!(inner > 0.0)) throw std::domain_error("coax inner diameter must be positive");
  if (!(outer > inner)) throw std::domain_error("coax outer diameter must exceed the inner");
  if (!(er >= 1.0)) throw std::domain_error("coax er must be at least 1");
  // Only the ratio enters, so diameters serve as well as the radii of Pozar's b/a.
  const double log_ratio = std::log(outer / inner);
  return PerLength{.l = kMu0 / (2.0 * kPi) * log_ratio, .c = 2.0 * kPi * kEps0 * er / log_ratio};
}

}  // namespace rungs::physics
