// Two-wire (twin-lead) line: per-length parameters from wire size and spacing.
#pragma once
#include "2_physics/per_length.h"

namespace rungs::physics {

/// L' = (mu0/pi) acosh(D/d), C' = pi eps0 er / acosh(D/d), with d the wire diameter and D
/// the centre-to-centre spacing in metres (Pozar 4th ed. Table 2.1; Hayt & Buck sec. 13.1.4,
/// eqs. 20-21, written there with radius a = d/2). Exact for perfectly conducting round
/// wires in a homogeneous dielectric, proximity effect included; L' is the external
/// inductance (the wires' internal inductance is left out). Requires 0 < wire < spacing,
/// er >= 1.
PerLength twin_per_length(double wire, double spacing, double er);

}  // namespace rungs::physics
