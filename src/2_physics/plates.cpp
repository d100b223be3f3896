// Parallel-plate line: L' and C' of two wide plates, fringing neglected (Pozar Table 2.1).
#include "2_physics/plates.h"

#include <stdexcept>

#include "2_physics/constants.h"

namespace rungs::physics {

PerLength plates_per_length(double width, double gap, double er) {
  if (!(width > 0.0)) throw std::domain_error("plates width must be positive");
  if (!(gap > 0.0)) throw std::domain_error("plates gap must be positive");
  if (!(er >= 1.0)) throw std::domain_error("plates er must be at least 1");
  return PerLength{.l = kMu0 * gap / width, .c = kEps0 * er * width / gap};
}

}  // namespace rungs::physics
