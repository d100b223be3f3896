// Microstrip: Hammerstad & Jensen (1980) closed forms for Z0 and eps_eff, thickness included.
#include "2_physics/microstrip.h"

#include <cmath>
#include <stdexcept>

#include "2_physics/constants.h"

namespace rungs::physics {
namespace {

// Impedance of the strip with air as dielectric, u = W/h (Hammerstad & Jensen 1980: Z01(u)
// with its f(u); stated accurate to 0.01 % for u <= 1).
double air_impedance(double u) {
  const double f = 6.0 + (2.0 * kPi - 6.0) * std::exp(-std::pow(30.666 / u, 0.7528));
  return kEta0 / (2.0 * kPi) * std::log(f / u + std::sqrt(1.0 + (2.0 / u) * (2.0 / u)));
}

// Zero-thickness effective permittivity, with the exponent a(u) b(er) (Hammerstad & Jensen
// 1980).
double zero_thickness_eps_eff(double u, double er) {
  const double u4 = u * u * u * u;
  const double a = 1.0 + std::log((u4 + (u / 52.0) * (u / 52.0)) / (u4 + 0.432)) / 49.0 +
                   std::log(1.0 + std::pow(u / 18.1, 3.0)) / 18.7;
  const double b = 0.564 * std::pow((er - 0.9) / (er + 3.0), 0.053);
  return (er + 1.0) / 2.0 + (er - 1.0) / 2.0 * std::pow(1.0 + 10.0 / u, -a * b);
}

}  // namespace

MicrostripFigures microstrip_figures(double width, double height, double thickness, double er) {
  if (!(width > 0.0)) throw std::domain_error("microstrip width must be positive");
  if (!(height > 0.0)) throw std::domain_error("microstrip height must be positive");
  if (!(thickness >= 0.0)) throw std::domain_error("microstrip thickness must not be negative");
  if (!(er >= 1.0)) throw std::domain_error("microstrip er must be at least 1");
  const double u = width / height;
  if (thickness == 0.0) {
    // The thickness terms below are 0 * infinity at t = 0; their limit is 0.
    const double eps_eff = zero_thickness_eps_eff(u, er);
    return MicrostripFigures{.z0 = air_impedance(u) / std::sqrt(eps_eff), .eps_eff = eps_eff};
  }
  // Thickness widens the strip: by du1 in air and by the smaller dur in the dielectric
  // (Hammerstad & Jensen 1980, after Wheeler; t normalised to h, 1/coth^2 = tanh^2).
  const double t = thickness / height;
  const double tanh_term = std::tanh(std::sqrt(6.517 * u));
  const double du1 = t / kPi * std::log(1.0 + 4.0 * std::exp(1.0) * tanh_term * tanh_term / t);
  const double dur = 0.5 * (1.0 + 1.0 / std::cosh(std::sqrt(er - 1.0))) * du1;
  const double u1 = u + du1;
  const double ur = u + dur;
  // The paper's thick-strip Z0 and eps_eff. They are one picture: Z01(u1)/sqrt(eps_eff)
  // equals Z01(ur)/sqrt(eps_eff(ur)), the air line of width u1 filled to eps_eff.
  const double eps_r_line = zero_thickness_eps_eff(ur, er);
  const double z_air_ur = air_impedance(ur);
  const double z_ratio = air_impedance(u1) / z_air_ur;
  return MicrostripFigures{.z0 = z_air_ur / std::sqrt(eps_r_line),
                           .eps_eff = eps_r_line * z_ratio * z_ratio};
}

PerLength microstrip_per_length(double width, double height, double thickness, double er) {
  const MicrostripFigures figures = microstrip_figures(width, height, thickness, er);
  // Quasi-TEM: the velocity is c/sqrt(eps_eff) and the impedance Z0.
  return per_length_from_z0_velocity(figures.z0, kSpeedOfLight / std::sqrt(figures.eps_eff));
}

}  // namespace rungs::physics
