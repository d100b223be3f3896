// Per-unit-length parameters of a quasi-TEM line and the lossless figures derived from them.
#pragma once

namespace rungs::physics {

/// Series L' (H/m), shunt C' (F/m), series R' (ohm/m), shunt G' (S/m).
struct PerLength {
  double l = 0.0;
  double c = 0.0;
  double r = 0.0;
  double g = 0.0;
};

/// Lossless characteristic impedance sqrt(L'/C'), ohm.
double characteristic_impedance(const PerLength& p);
/// Lossless phase velocity 1/sqrt(L'C'), m/s.
double phase_velocity(const PerLength& p);
/// Effective relative permittivity (c/v)^2, dimensionless.
double effective_permittivity(const PerLength& p);
/// L' and C' of a line with the given impedance (ohm) and velocity (m/s); R' = G' = 0.
PerLength per_length_from_z0_velocity(double z0, double velocity);

}  // namespace rungs::physics
