// Coaxial line: per-length parameters from its diameters and dielectric.
#pragma once
#include "2_physics/per_length.h"

namespace rungs::physics {

/// L' = mu0/(2 pi) ln(b/a), C' = 2 pi eps0 er / ln(b/a) (Pozar, Microwave Engineering,
/// 4th ed., Table 2.1). `inner` is the inner-conductor diameter, `outer` the dielectric
/// (shield inside) diameter, both in metres; requires 0 < inner < outer, er >= 1. L' is the
/// external inductance: the conductors' internal inductance is left out.
PerLength coax_per_length(double inner, double outer, double er);

}  // namespace rungs::physics
