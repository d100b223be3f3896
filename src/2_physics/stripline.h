// Stripline centred between two ground planes: Cohn's exact zero-thickness impedance with
// Wheeler's finite-thickness correction.
#pragma once
#include "2_physics/per_length.h"

namespace rungs::physics {

/// Characteristic impedance (ohm) of a strip `width` wide and `thickness` thick centred
/// between ground planes `spacing` apart (metres), in a homogeneous dielectric er.
/// Zero thickness: Z0 = eta0/(4 sqrt er) K(k)/K(k'), k = sech(pi W/2b) (Cohn, IRE Trans.
/// MTT-2, 1954), exact. Thickness t > 0 scales it by the ratio of Wheeler's finite-thickness
/// formula at t and at 0 (Wheeler, IEEE Trans. MTT-26, 1978), so t -> 0 is exactly Cohn.
double stripline_z0(double width, double spacing, double thickness, double er);

/// L' = Z0 sqrt(er)/c, C' = sqrt(er)/(Z0 c): a homogeneous dielectric, so eps_eff = er.
PerLength stripline_per_length(double width, double spacing, double thickness, double er);

/// Above this t/b the strip is no longer thin beside the plane spacing, and the thickness
/// correction is used outside the thin-strip case it was made for (common practice; the
/// limit is ours, not a figure stated by Wheeler 1978).
inline constexpr double kStriplineMaxThicknessRatio = 0.25;

}  // namespace rungs::physics
