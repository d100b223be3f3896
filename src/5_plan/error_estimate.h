// Closed-form estimates of how far a lumped LC ladder's response stands from the exact line.
#pragma once
#include "3_model/circuit.h"

namespace rungs::plan {

/// The knee frequency of an edge, 0.5 / t_r (t_r the 10-90 % rise time, s): the band that
/// holds the edge's significant content (Johnson & Graham, High-Speed Digital Design, 1993,
/// p. 2). Hz.
double knee_frequency(double rise);

/// Cutoff of one section of series L and shunt C, f_c = 1/(pi sqrt(L C)), with sqrt(L C) the
/// section's delay (s). Hz.
double section_cutoff(double section_delay);

/// The two parts of the predicted waveform error, each as a fraction of the swing.
struct LadderErrorEstimate {
  double dispersion = 0.0;  // delay error of the whole ladder at the knee, over the ramp time
  double impedance = 0.0;   // reflection from the ladder's image impedance at the knee
  double total() const { return dispersion + impedance; }
};

/// Predicted error of an N-section ladder of a line with one-way `delay` (s) driven by a
/// linear ramp of 10-90 % time `rise` (s), evaluated at the knee frequency:
/// - dispersion: a periodic ladder of sections with delay tau = delay/N has phase
///   theta = 2 asin(w tau / 2) per section, from cos(theta) = 1 - w^2 L C / 2 (Brillouin, Wave
///   Propagation in Periodic Structures, 1946). The ladder's delay error at w is
///   N (theta - w tau) / w; a ramp of slope swing/(rise/0.8) shifted by it errs by that
///   shift over rise/0.8.
/// - impedance: constant-k image impedances Z_T = Z0 sqrt(1 - x^2) and
///   Z_pi = Z0 / sqrt(1 - x^2), x = f/f_c (Zobel, BSTJ 1923); the reflection |Z_i - Z0| /
///   (Z_i + Z0) where the ladder meets a line-matched end. An L section shows Z_T at one end
///   and Z_pi at the other, so it takes the worse.
/// At or above cutoff (x >= 1) the ladder passes nothing and the estimate is 1 (the whole
/// swing); the total never exceeds 1.
LadderErrorEstimate estimate_ladder_error(double delay, double rise, int sections,
                                          model::Shape shape);

/// The smallest N whose estimated total error is within `tolerance` (fraction of the swing),
/// found by bisection (the estimate falls monotonically with N). At most kMaxSections.
int analytic_sections(double delay, double rise, double tolerance, model::Shape shape);

/// The common rule: each section at most a tenth of the rise time in delay, so
/// N = ceil(10 delay / rise) (common practice), at least 1.
int rule_of_thumb_sections(double delay, double rise);

/// No line is cut into more sections than this.
inline constexpr int kMaxSections = 10'000'000;
/// The most ladder elements a deck may hold: about 4 GB of netlist, beyond what a simulator
/// could load and run.
inline constexpr long long kMaxDeckElements = 50'000'000;

}  // namespace rungs::plan
