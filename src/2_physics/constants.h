// Physical constants, CODATA 2018 (SI). CODATA 2022 differs in eps0's 8th figure.
#pragma once

namespace rungs::physics {

inline constexpr double kPi = 3.14159265358979323846;
/// Speed of light in vacuum, m/s (exact by definition of the metre).
inline constexpr double kSpeedOfLight = 299792458.0;
/// Vacuum permeability mu0, H/m (CODATA 2018).
inline constexpr double kMu0 = 1.25663706212e-6;
/// Vacuum permittivity eps0, F/m (CODATA 2018).
inline constexpr double kEps0 = 8.8541878128e-12;
/// Impedance of free space eta0 = mu0 c, ohm (CODATA 2018: 376.730313668).
inline constexpr double kEta0 = kMu0 * kSpeedOfLight;

}  // namespace rungs::physics
