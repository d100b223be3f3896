// The drives' waveforms as sums of steps and ramps, and their Laplace transforms in closed form.
#pragma once
#include <complex>
#include <optional>
#include <vector>

#include "3_model/circuit.h"

namespace rungs::sim {

/// At time `t` (s) a piecewise-linear waveform jumps by `step` (V) and its slope changes by
/// `slope` (V/s).
struct Kink {
  double t = 0.0;
  double step = 0.0;
  double slope = 0.0;
};

/// A piecewise-linear waveform, zero before its first kink: the sum of its kinks, or, with a
/// period p, that sum repeated every p from its first repetition on (the kinks lie within one
/// period from `start`).
struct KinkedWave {
  std::vector<Kink> kinks;
  std::optional<double> period;  // s
  double start = 0.0;            // s, where the repeated part begins
};

/// The change of a drive's open-circuit voltage from its level before t = 0 (its `low`; 0 V for
/// a dc drive), as drive_voltage gives it: a ramp of rise/0.8 from `at` for a step or dc drive;
/// for a pulse the ramp up, `width` at the top and the ramp down, repeated every `period` when
/// one is given. A repeated pulse that outlasts its period is cut where the next one starts, as
/// drive_voltage does. Throws std::invalid_argument when no rise time is known or a pulse has no
/// width, or when a period is not positive.
KinkedWave drive_change(const model::Drive& drive, const model::Settings& settings);

/// The wave's value at t (s), for tests and for checking the transform.
double wave_value(const KinkedWave& wave, double t);

/// The Laplace transform sum_k e^{-s t_k} (step_k / s + slope_k / s^2), divided by
/// 1 - e^{-s p} for a periodic wave (the sum of its repetitions). Needs Re s > 0.
std::complex<double> laplace_transform(const KinkedWave& wave, std::complex<double> s);

}  // namespace rungs::sim
