// The analytic ladder error estimate and the section counts derived from it.
#include "5_plan/error_estimate.h"

#include <algorithm>
#include <cmath>

#include "2_physics/constants.h"
#include "3_model/edges.h"

namespace rungs::plan {

using physics::kPi;

double knee_frequency(double rise) { return 0.5 / rise; }

double section_cutoff(double section_delay) { return 1.0 / (kPi * section_delay); }

LadderErrorEstimate estimate_ladder_error(double delay, double rise, int sections,
                                          model::Shape shape) {
  const double w = 2.0 * kPi * knee_frequency(rise);
  const double tau = delay / sections;
  const double x = knee_frequency(rise) / section_cutoff(tau);  // = w tau / 2
  if (x >= 1.0) return {1.0, 0.0};

  LadderErrorEstimate e;
  // Phase per section minus the exact w tau; asin keeps it exact near cutoff where the
  // series x^3/24 would understate it.
  const double theta = 2.0 * std::asin(x);
  const double delay_error = sections * (theta - w * tau) / w;
  const double ramp = model::ramp_time(rise);
  e.dispersion = delay_error / ramp;

  const double root = std::sqrt(1.0 - x * x);
  auto reflection = [](double ratio) { return std::abs(ratio - 1.0) / (ratio + 1.0); };
  const double t_reflection = reflection(root);
  const double pi_reflection = reflection(1.0 / root);
  switch (shape) {
    case model::Shape::t: e.impedance = t_reflection; break;
    case model::Shape::pi: e.impedance = pi_reflection; break;
    case model::Shape::l: e.impedance = std::max(t_reflection, pi_reflection); break;
  }
  // Neither part can exceed the whole swing in a way the estimate could claim.
  e.dispersion = std::min(e.dispersion, 1.0);
  e.impedance = std::min(e.impedance, 1.0 - e.dispersion);
  return e;
}

int analytic_sections(double delay, double rise, double tolerance, model::Shape shape) {
  auto fits = [&](int n) {
    return estimate_ladder_error(delay, rise, n, shape).total() <= tolerance;
  };
  if (fits(1)) return 1;
  int low = 1, high = 2;  // invariant: low does not fit
  while (!fits(high)) {
    low = high;
    if (high >= kMaxSections) return kMaxSections;
    high = std::min(2 * high, kMaxSections);
  }
  while (high - low > 1) {
    const int mid = low + (high - low) / 2;
    (fits(mid) ? high : low) = mid;
  }
  return high;
}

int rule_of_thumb_sections(double delay, double rise) {
  // A small relative slack keeps 1.2 ns / 0.12 ns at 10 sections, not 11 by rounding.
  return std::max(1, static_cast<int>(std::ceil(10.0 * delay / rise * (1.0 - 1e-12))));
}

}  // namespace rungs::plan
