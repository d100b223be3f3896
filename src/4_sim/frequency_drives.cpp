// Drive waveforms as kinks (steps and slope changes) and their closed-form Laplace transforms.
#include "4_sim/frequency_drives.h"

#include <cmath>
#include <stdexcept>

#include <fmt/format.h>

#include "3_model/circuit_checks.h"
#include "4_sim/two_port.h"

namespace rungs::sim {

namespace {

using Complex = std::complex<double>;

/// The value and slope just before time `t` of the kinks of one repetition (the shape before
/// it is cut at the end of its period).
struct ValueSlope {
  double value = 0.0;
  double slope = 0.0;
};

ValueSlope just_before(const std::vector<Kink>& kinks, double t) {
  ValueSlope v;
  for (const Kink& k : kinks)
    if (k.t < t) {
      v.value += k.step + k.slope * (t - k.t);
      v.slope += k.slope;
    }
  return v;
}

}  // namespace

KinkedWave drive_change(const model::Drive& drive, const model::Settings& settings) {
  const double ramp = model::simulated_ramp(drive, settings);
  const bool pulse = drive.kind == model::WaveKind::pulse;
  if (pulse && drive.period && !(*drive.period > 0.0))
    throw std::invalid_argument(
        fmt::format("the pulse on '{}' needs a positive period", drive.node));
  const double low = drive.kind == model::WaveKind::dc ? 0.0 : drive.low;
  const double swing = drive.high - low;
  KinkedWave wave;
  // One edge from t0: a ramp of `ramp` seconds is a slope change up at t0 and down at its end;
  // a ramp of zero time is a step.
  const auto edge = [&](double t0, double change) {
    if (ramp > 0.0) {
      wave.kinks.push_back({t0, 0.0, change / ramp});
      wave.kinks.push_back({t0 + ramp, 0.0, -change / ramp});
    } else {
      wave.kinks.push_back({t0, change, 0.0});
    }
  };
  edge(drive.at, swing);
  if (!pulse) return wave;
  edge(drive.at + ramp + *drive.width, -swing);
  if (!drive.period) return wave;
  // drive_voltage repeats the waveform of [at, at + period): close one repetition there.
  const double end = drive.at + *drive.period;
  std::vector<Kink> cut;
  for (const Kink& k : wave.kinks)
    if (k.t < end) cut.push_back(k);
  const ValueSlope left = just_before(wave.kinks, end);
  if (left.value != 0.0 || left.slope != 0.0) cut.push_back({end, -left.value, -left.slope});
  wave.kinks = std::move(cut);
  wave.period = *drive.period;
  wave.start = drive.at;
  return wave;
}

double wave_value(const KinkedWave& wave, double t) {
  if (wave.period && t >= wave.start) t = wave.start + std::fmod(t - wave.start, *wave.period);
  double v = 0.0;
  for (const Kink& k : wave.kinks)
    if (k.t <= t) v += k.step + k.slope * (t - k.t);
  return v;
}

Complex laplace_transform(const KinkedWave& wave, Complex s) {
  // L{u(t - a)} = e^{-sa}/s and L{(t - a) u(t - a)} = e^{-sa}/s^2 (any table of transforms).
  const Complex inv_s = reciprocal(s);
  Complex sum = 0.0;
  for (const Kink& k : wave.kinks) {
    const Complex term = (k.step + k.slope * inv_s) * inv_s;
    // Most edges start at t = 0, where the delay factor is one: the exp is most of the cost.
    sum += k.t == 0.0 ? term : std::exp(-s * k.t) * term;
  }
  // A train repeated every p is the single period times sum_n e^{-snp} = 1/(1 - e^{-sp}).
  if (wave.period) sum *= reciprocal(-expm1(-s * *wave.period));
  return sum;
}

}  // namespace rungs::sim
