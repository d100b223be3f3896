// Synthesis: the strip width that gives a wanted impedance, by inverting the analysis.
#pragma once

namespace rungs::physics {

/// Width (m) of a microstrip of the given height, thickness and er whose
/// microstrip_figures().z0 equals `z0` to 1e-10 relative, found by bracketing bisection on
/// log W (Z0 falls monotonically with W). Throws std::domain_error when no width in
/// [1e-4 h, 1e4 h] gives z0.
double microstrip_width_for(double z0, double height, double thickness, double er);

/// Width (m) of a centred stripline with ground-plane spacing `spacing` whose stripline_z0
/// equals `z0`; same method and limits as microstrip_width_for.
double stripline_width_for(double z0, double spacing, double thickness, double er);

}  // namespace rungs::physics
