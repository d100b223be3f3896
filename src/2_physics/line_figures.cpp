// Lossless figures of a quasi-TEM line (impedance, velocity, permittivity) from L' and C'.
#include "2_physics/per_length.h"

#include <cmath>

#include "2_physics/constants.h"

namespace rungs::physics {

double characteristic_impedance(const PerLength& p) {
  return std::sqrt(p.l / p.c);
}

double phase_velocity(const PerLength& p) {
  return 1.0 / std::sqrt(p.l * p.c);
}

double effective_permittivity(const PerLength& p) {
  // (c/v)^2 = c^2 L'C', written without the square root so that it is exact for the
  // per-length values the models build from sqrt(eps_eff).
  return kSpeedOfLight * kSpeedOfLight * p.l * p.c;
}

PerLength per_length_from_z0_velocity(double z0, double velocity) {
  // Z0 = sqrt(L'/C') and v = 1/sqrt(L'C') solved for L' and C'.
  return PerLength{.l = z0 / velocity, .c = 1.0 / (z0 * velocity)};
}

}  // namespace rungs::physics
