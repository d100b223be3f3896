// Parallel-plate line: per-length parameters of two plates of width W a gap d apart.
#pragma once
#include "2_physics/per_length.h"

namespace rungs::physics {

/// L' = mu0 d/W, C' = eps0 er W/d (Pozar 4th ed. Table 2.1), fringing neglected, so valid
/// for W much larger than d; metres; requires width > 0, gap > 0, er >= 1.
PerLength plates_per_length(double width, double gap, double er);

/// Below this W/d the fringing field that the formula neglects is no longer small
/// (common practice; about 10 % error in C' near W/d = 10).
inline constexpr double kPlatesMinAspect = 10.0;

}  // namespace rungs::physics
