// Microstrip: quasi-static analysis by Hammerstad & Jensen (IEEE MTT-S Digest 1980,
// pp. 407-409), with their finite-thickness correction.
#pragma once
#include "2_physics/per_length.h"

namespace rungs::physics {

/// Impedance (ohm) and effective permittivity of a microstrip line.
struct MicrostripFigures {
  double z0 = 0.0;
  double eps_eff = 0.0;
};

/// Strip `width` on a substrate `height` thick (metres), strip `thickness` (0 allowed),
/// substrate relative permittivity `er`. Hammerstad-Jensen 1980 closed forms; zero-thickness
/// Z0 is stated accurate to 0.01 % for u = W/h <= 1 and 0.03 % for u <= 1000, eps_eff to
/// 0.2 % for 0.01 <= u <= 100 and er <= 128.
MicrostripFigures microstrip_figures(double width, double height, double thickness, double er);

/// L' = Z0 sqrt(eps_eff)/c, C' = sqrt(eps_eff)/(Z0 c) from microstrip_figures.
PerLength microstrip_per_length(double width, double height, double thickness, double er);

/// Range of W/h and er where Hammerstad & Jensen (1980) state their eps_eff accuracy.
inline constexpr double kMicrostripMinAspect = 0.01;
inline constexpr double kMicrostripMaxAspect = 100.0;
inline constexpr double kMicrostripMaxEr = 128.0;

}  // namespace rungs::physics
