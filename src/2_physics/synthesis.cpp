// Synthesis: the strip width for a wanted impedance, by bisection on log W.
#include "2_physics/synthesis.h"

#include <cmath>
#include <sstream>
#include <stdexcept>
#include <string>

#include "2_physics/microstrip.h"
#include "2_physics/stripline.h"

namespace rungs::physics {
namespace {

// The search interval of W over the height or spacing, as the header promises.
constexpr double kMinWidthRatio = 1e-4;
constexpr double kMaxWidthRatio = 1e4;
// Stop once Z0 is this close; tighter than the promised 1e-10 so that callers who compare
// against it with that tolerance never sit on the edge.
constexpr double kImpedanceTolerance = 1e-13;

// Bisection rather than Newton: Z0(W) falls monotonically but its slope spans decades over
// the interval, and a bracket cannot diverge. Working on ln(W/scale) halves the ratio of
// the bracket's ends each step, so about 60 steps reach the last bit of W.
template <typename ImpedanceOfWidth>
double bisect_width(ImpedanceOfWidth z0_of_width, double z0, double scale, const char* scale_name) {
  if (!(z0 > 0.0) || !std::isfinite(z0)) {
    throw std::domain_error("wanted impedance must be positive and finite");
  }
  double narrow = std::log(kMinWidthRatio);
  double wide = std::log(kMaxWidthRatio);
  const double z_narrow = z0_of_width(scale * std::exp(narrow));
  const double z_wide = z0_of_width(scale * std::exp(wide));
  if (!(z0 <= z_narrow && z0 >= z_wide)) {
    std::ostringstream message;
    message << "no width gives " << z0 << " ohm: widths of 1e-4 to 1e4 times the " << scale_name
            << " give " << z_wide << " to " << z_narrow << " ohm";
    throw std::domain_error(message.str());
  }
  double log_ratio = narrow;
  for (int step = 0; step < 200; ++step) {
    log_ratio = 0.5 * (narrow + wide);
    const double z = z0_of_width(scale * std::exp(log_ratio));
    if (std::abs(z - z0) <= kImpedanceTolerance * z0) break;
    // Halving has reached adjacent doubles; nothing closer can be represented.
    if (log_ratio == narrow || log_ratio == wide) break;
    (z > z0 ? narrow : wide) = log_ratio;
  }
  return scale * std::exp(log_ratio);
}

}  // namespace

double microstrip_width_for(double z0, double height, double thickness, double er) {
  return bisect_width(
      [&](double width) { return microstrip_figures(width, height, thickness, er).z0; }, z0, height,
      "substrate height");
}

double stripline_width_for(double z0, double spacing, double thickness, double er) {
  return bisect_width([&](double width) { return stripline_z0(width, spacing, thickness, er); }, z0,
                      spacing, "ground-plane spacing");
}

}  // namespace rungs::physics
