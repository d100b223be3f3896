// The damped-FFT inverse Laplace transform against transforms with known inverses.
#include <catch2/catch.hpp>

#include <cmath>
#include <complex>
#include <numbers>
#include <stdexcept>
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/characteristics.h"
#include "4_sim/frequency_drives.h"
#include "4_sim/inverse_laplace.h"
#include "4_sim/two_port.h"

using rungs::model::Drive;
using rungs::model::Settings;
using rungs::model::WaveKind;
using rungs::sim::Complex;
using rungs::sim::drive_change;
using rungs::sim::drive_voltage;
using rungs::sim::KinkedWave;
using rungs::sim::laplace_transform;
using rungs::sim::LaplaceGrid;
using rungs::sim::LaplaceInverter;
using rungs::sim::make_laplace_grid;
using rungs::sim::wave_value;

namespace {

/// Inverts F over `grid` with all and with half the frequencies; returns the largest error
/// against f over the window (first half of the period) and the K vs K/2 estimate.
template <class Transform, class Exact>
std::pair<double, double> invert_and_compare(const LaplaceGrid& grid, Transform transform,
                                             Exact exact) {
  std::vector<Complex> spectrum(grid.frequencies);
  for (std::size_t k = 0; k < grid.frequencies; ++k) spectrum[k] = transform(grid.s(k));
  LaplaceInverter inverter(grid);
  std::vector<double> g;
  const std::size_t samples = grid.fft_size() / 2 + 1;
  std::vector<double> fine(samples), coarse(samples);
  inverter.damped(spectrum, grid.frequencies, g);
  inverter.undamp(g, fine);
  inverter.damped(spectrum, grid.frequencies / 2, g);
  inverter.undamp(g, coarse);
  double error = 0.0, estimate = 0.0;
  for (std::size_t j = 0; j < samples; ++j) {
    const double t = grid.time_step() * static_cast<double>(j);
    error = std::max(error, std::abs(fine[j] - exact(t)));
    estimate = std::max(estimate, std::abs(fine[j] - coarse[j]));
  }
  return {error, estimate};
}

Drive drive(WaveKind kind, double low, double high, double rise, double at,
            const std::string& node = "a") {
  Drive d;
  d.node = node;
  d.kind = kind;
  d.low = low;
  d.high = high;
  d.rise = rise;
  d.at = at;
  d.source_resistance = 50.0;
  return d;
}

}  // namespace

TEST_CASE("a damped sine comes back from its transform") {
  // L{e^{-at} sin(bt)} = b / ((s + a)^2 + b^2) (any table of transforms). f(0) = 0 but
  // f'(0) = b: one corner at t = 0, which the truncation at band B rounds by about
  // b/(2 pi^2 B) = 6e-4 here.
  const double a = 1e8, b = 2.0 * std::numbers::pi * 3e8;
  const LaplaceGrid grid = make_laplace_grid(50e-9, 16000, 1e-6);
  const auto [error, estimate] = invert_and_compare(
      grid, [&](Complex s) { return b / ((s + a) * (s + a) + b * b); },
      [&](double t) { return std::exp(-a * t) * std::sin(b * t); });
  CHECK(error > 2e-4);  // the corner is there: no free accuracy
  // The K/2 inversion estimates the error to within a small factor (Crump 1976 argues the
  // same for his series, recalled from memory).
  CHECK(estimate > 0.5 * error);
  CHECK(estimate < 4.0 * error + 1e-9);
}

TEST_CASE("the drives' transforms invert to the waveforms of drive_voltage") {
  Settings settings;
  Drive pulse = drive(WaveKind::pulse, 0.0, 1.8, 100e-12, 0.5e-9);
  pulse.width = 2e-9;
  Drive train = pulse;
  train.period = 4e-9;
  Drive cut_train = pulse;
  cut_train.period = 2.1e-9;  // shorter than the pulse: drive_voltage cuts each one there
  const Drive cases[] = {drive(WaveKind::step, 0.5, 3.3, 350e-12, 1e-9), pulse, train, cut_train,
                         drive(WaveKind::dc, 0.0, 10.0, 200e-12, 2e-9)};
  const LaplaceGrid grid = make_laplace_grid(12e-9, 24000, 1e-9);
  for (const Drive& d : cases) {
    INFO("kind " << static_cast<int>(d.kind) << " period " << d.period.value_or(0.0));
    const KinkedWave wave = drive_change(d, settings);
    const double low = d.kind == WaveKind::dc ? 0.0 : d.low;
    // The kinks reproduce drive_voltage (4_sim/characteristics.h) exactly, less the low level.
    for (double t = 0.0; t < 12e-9; t += 7.3e-12)
      REQUIRE_THAT(wave_value(wave, t) + low,
                   Catch::Matchers::WithinAbs(drive_voltage(d, settings, t), 1e-12));
    // L{u(t - a)} = e^{-as}/s and L{(t - a) u(t - a)} = e^{-as}/s^2 (any table of transforms):
    // the inversion of their sum returns the wave to within the truncation of its corners,
    // about J/(2 pi^2 B) for a slope change J and band B (here J = 1.8 V/125 ps, B = 1 THz),
    // except beside the jumps of the cut train (Gibbs), checked apart below.
    const auto [error, estimate] = invert_and_compare(
        grid, [&](Complex s) { return laplace_transform(wave, s); },
        [&](double t) { return wave_value(wave, t); });
    const double swing = d.high - low;
    if (d.period && *d.period < 2.1e-9 + 1e-15) {
      CHECK(error > 0.05 * swing);     // a true jump rings at 9 % (Gibbs), whatever the band
      CHECK(estimate > 0.02 * swing);  // and the estimate says so
    } else {
      CHECK(error < 1e-3 * swing);
      CHECK(estimate > 0.5 * error);
    }
  }
}

TEST_CASE("a sampled wave cut at a time transforms like its closed form") {
  // f(t) = 1 + t/T: cut at t_c it is the kinks {0: step 1, slope 1/T} and
  // {t_c: step -(1 + t_c/T), slope -1/T}, whose transform laplace_transform gives exactly.
  const LaplaceGrid grid = make_laplace_grid(10e-9, 2000, 1e-6);
  const double big_t = 5e-9;
  LaplaceInverter inverter(grid);
  std::vector<double> g(grid.fft_size());
  for (std::size_t j = 0; j < g.size(); ++j) {
    const double t = grid.time_step() * static_cast<double>(j);
    g[j] = std::exp(-grid.sigma * t) * (1.0 + t / big_t);
  }
  for (const double cut : {3e-9, 3e-9 + 0.37 * grid.time_step()}) {
    std::vector<Complex> e;
    inverter.transform_until(g, cut, e);
    KinkedWave closed;
    closed.kinks = {{0.0, 1.0, 1.0 / big_t}, {cut, -(1.0 + cut / big_t), -1.0 / big_t}};
    double worst = 0.0;
    for (std::size_t k = 0; k < grid.frequencies; k += 7) {
      const Complex exact = laplace_transform(closed, grid.s(k));
      worst =
          std::max(worst, std::abs(e[k] - exact) / std::abs(laplace_transform(closed, grid.s(0))));
    }
    // Linear interpolation of e^{-sigma t} f(t) errs by h^2 |g''|/8 per unit time.
    INFO("cut " << cut);
    CHECK(worst < 1e-6);
  }
}

TEST_CASE("inversion grids refuse what they cannot represent") {
  CHECK_THROWS_AS(make_laplace_grid(0.0, 100, 1e-6), std::invalid_argument);
  CHECK_THROWS_AS(make_laplace_grid(1e-9, 100, 1.5), std::invalid_argument);
  CHECK_THROWS_AS(make_laplace_grid(1e-9, 0, 1e-6), std::invalid_argument);
  const LaplaceGrid grid = make_laplace_grid(1e-9, 100, 1e-6, 2);
  CHECK(grid.period == 2e-9);
  CHECK(grid.fft_size() == 400);
  CHECK_THAT(grid.aliasing(), Catch::Matchers::WithinRel(1e-6, 1e-12));
  Drive no_width = drive(WaveKind::pulse, 0.0, 1.0, 1e-10, 0.0);
  CHECK_THROWS_AS(drive_change(no_width, Settings{}), std::invalid_argument);
  Drive no_rise = drive(WaveKind::step, 0.0, 1.0, 0.0, 0.0);
  no_rise.rise.reset();
  CHECK_THROWS_AS(drive_change(no_rise, Settings{}), std::invalid_argument);
}
