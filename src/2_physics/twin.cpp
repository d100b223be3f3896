// Two-wire line: L' and C' of two round wires, by the exact acosh form (Pozar Table 2.1).
#include "2_physics/twin.h"

#include <cmath>
#include <stdexcept>

#include "2_physics/constants.h"

namespace rungs::physics {

PerLength twin_per_length(double wire, double spacing, double er) {
  if (!(wire > 0.0)) throw std::domain_error("twin wire diameter must be positive");
  if (!(spacing > wire)) throw std::domain_error("twin spacing must exceed the wire diameter");
  if (!(er >= 1.0)) throw std::domain_error("twin er must be at least 1");
  // acosh(D/2a) rather than its wide-spacing limit ln(D/a): the exact form keeps the
  // proximity effect of close wires (Hayt & Buck sec. 13.1, eqs. 20-21).
  const double shape = std::acosh(spacing / wire);
  return PerLength{.l = kMu0 / kPi * shape, .c = kPi * kEps0 * er / shape};
}

}  // namespace rungs::physics
