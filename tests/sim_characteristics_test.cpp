// The method-of-characteristics reference against textbook transients of lossless lines.
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

#include "3_model/resolve.h"
#include "4_sim/characteristics.h"
#include "1_syntax/parser.h"

using Catch::Matchers::WithinAbs;
using rungs::model::Circuit;
using rungs::model::Drive;
using rungs::model::ElementKind;
using rungs::model::Line;
using rungs::model::Load;
using rungs::model::LoadNetwork;
using rungs::model::NetworkKind;
using rungs::model::WaveKind;
using rungs::sim::drive_voltage;
using rungs::sim::find_node;
using rungs::sim::simulate_characteristics;
using rungs::sim::Waveforms;

using rungs::testing::element;
using rungs::testing::ideal_line;
using rungs::testing::load;
using rungs::testing::step_drive;

namespace {

constexpr double kDt = 1e-12;    // 1 ps steps: every delay below is a whole number of them
constexpr double kRise = 8e-12;  // 10-90 %: a 10 ps ramp, fast beside the 1 ns lines


Line line(const std::string& name, const std::string& near, const std::string& far, double z0,
          double delay) {
  return ideal_line(name, near, far, z0, delay);
}

Drive step(const std::string& node, double volts, double source, double rise = kRise) {
  return step_drive(node, 0.0, volts, source, rise);
}



/// The sample of `node` at time t (s), which must fall on the grid of kDt.
double at(const Waveforms& w, const std::string& node, double t) {
  const auto* n = find_node(w, node);
  REQUIRE(n != nullptr);
  const auto k = static_cast<std::size_t>(std::llround(t / kDt));
  REQUIRE(k < n->v.size());
  return n->v[k];
}

/// The largest |v - expected| of `node` over the samples with t0 <= t <= t1 (s).
template <class F>
double max_error(const Waveforms& w, const std::string& node, double t0, double t1, F expected) {
  const auto* n = find_node(w, node);
  REQUIRE(n != nullptr);
  double worst = 0.0;
  for (std::size_t k = 0; k < w.t.size(); ++k)
    if (w.t[k] >= t0 - kDt / 2 && w.t[k] <= t1 + kDt / 2)
      worst = std::max(worst, std::abs(n->v[k] - expected(w.t[k])));
  return worst;
}

/// Response of a first-order system with time constant tau to a unit linear ramp of duration
/// ramp, at time s >= ramp after the ramp starts, when the unit step response is
/// 1 - exp(-s/tau): the step response averaged over the ramp.
double first_order_ramp(double s, double tau, double ramp) {
  return 1.0 - tau / ramp * std::expm1(ramp / tau) * std::exp(-s / tau);
}

}  // namespace

TEST_CASE("a matched source into a 25 ohm load: Hayt & Buck, Example 10.11") {
  const std::string text =
      "line l a -> b ideal z0=50ohm delay=1ns\n"
      "drive a step 0V to 10V rise=8ps source=50ohm\n"
      "load b 25ohm\n";
  rungs::syntax::InputFile file{"t.rungs", text};
  rungs::syntax::Diagnostics d(file);
  const auto description = rungs::syntax::parse_description(d);
  const Circuit circuit = rungs::model::resolve(description, d);
  REQUIRE(d.render().empty());
  const Waveforms w = simulate_characteristics(circuit, 4e-9, kDt);

  const double v0 = 10.0, rg = 50.0, z0 = 50.0, rl = 25.0, delay = 1e-9, ramp = 10e-12;
  const double v1 = v0 * z0 / (rg + z0);
  const double gamma_l = (rl - z0) / (rl + z0);
  // Hayt & Buck, Engineering Electromagnetics, 8th ed., Example 10.11 (book): V1+ = 5 V,
  // Gamma_L = -1/3, load voltage 3.333 V (printed to four figures).
  CHECK_THAT(v1, WithinAbs(5.0, 1e-12));
  CHECK_THAT(gamma_l, WithinAbs(-1.0 / 3.0, 1e-12));
  CHECK_THAT(v1 * (1.0 + gamma_l), WithinAbs(3.333, 0.0005));
  // The simulated plateaus: V1+ at the source until the reflection returns, then V1+ (1 +
  // Gamma_L) at both ends, the matched source absorbing the reflection (same example).
  CHECK(max_error(w, "a", ramp, 2 * delay, [&](double) { return v1; }) < 1e-9);
  CHECK(max_error(w, "b", 0.0, delay, [](double) { return 0.0; }) < 1e-9);
  CHECK(max_error(w, "b", delay + ramp, 4e-9, [&](double) { return v1 * (1 + gamma_l); }) < 1e-9);
  CHECK(max_error(w, "a", 2 * delay + ramp, 4e-9, [&](double) { return v1 * (1 + gamma_l); }) <
        1e-9);
}

TEST_CASE("an open end doubles the arriving wave") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 1.0, 50.0));
  const Waveforms w = simulate_characteristics(c, 4e-9, kDt);
  const double ramp = 10e-12;
  // An open end doubles the arriving wave: a matched source into an open line gives the full
  // source voltage at the far end, twice the first wave (practice; every textbook).
  CHECK(max_error(w, "a", ramp, 2e-9, [](double) { return 0.5; }) < 1e-12);
  CHECK(max_error(w, "b", 1e-9 + ramp, 4e-9, [](double) { return 1.0; }) < 1e-12);
  CHECK(max_error(w, "a", 2e-9 + ramp, 4e-9, [](double) { return 1.0; }) < 1e-12);
}

TEST_CASE("a 25 ohm source into an open 50 ohm line follows the lattice diagram") {
  const double vs = 1.0, rs = 25.0, z0 = 50.0, delay = 1e-9, ramp = 10e-12;
  Circuit c;
  c.lines.push_back(line("l", "a", "b", z0, delay));
  c.drives.push_back(step("a", vs, rs));
  const Waveforms w = simulate_characteristics(c, 12e-9, kDt);

  // Lattice (bounce) diagram, Hayt & Buck, Engineering Electromagnetics, 8th ed., sec. 10.14
  // (section number from memory): the first wave V1 = Vs Z0/(Rs + Z0); each arrival at the
  // open end adds (1 + Gamma_L) times the wave, which is then multiplied by Gamma_L Gamma_s
  // per round trip.
  const double v1 = vs * z0 / (rs + z0);
  const double gamma_s = (rs - z0) / (rs + z0);
  const double gamma_l = 1.0;
  double wave = v1, far = 0.0;
  for (int n = 0; n < 5; ++n) {
    far += wave * (1.0 + gamma_l);
    wave *= gamma_l * gamma_s;
    const double t0 = (2 * n + 1) * delay + ramp, t1 = (2 * n + 3) * delay;
    INFO("far-end plateau " << n << " expected " << far);
    CHECK(max_error(w, "b", t0, t1, [&](double) { return far; }) < 1e-12);
    // The first two plateaus are 4/3 and 8/9 of the swing (same lattice diagram).
    if (n == 0) CHECK_THAT(far, WithinAbs(4.0 / 3.0, 1e-12));
    if (n == 1) CHECK_THAT(far, WithinAbs(8.0 / 9.0, 1e-12));
  }
  // At the source end: V1 until the first reflection returns, then V1 (1 + Gamma_L (1 +
  // Gamma_s)) (same diagram).
  CHECK(max_error(w, "a", ramp, 2 * delay, [&](double) { return v1; }) < 1e-12);
  CHECK(max_error(w, "a", 2 * delay + ramp, 4 * delay,
                  [&](double) { return v1 * (1 + gamma_l * (1 + gamma_s)); }) < 1e-12);
}

TEST_CASE("a charged line switched into a matched load gives half its voltage for two delays") {
  const double v0 = 10.0, z0 = 50.0, delay = 1e-9, closes = 0.5e-9;
  Circuit c;
  Line l = line("pfl", "sw", "end", z0, delay);
  l.charged = v0;
  c.lines.push_back(l);
  Load switched = load("sw", element(ElementKind::resistor, z0));
  switched.at = closes;
  c.loads.push_back(switched);
  const Waveforms w = simulate_characteristics(c, 4e-9, kDt);
  // A line charged to V0 discharged into its own impedance delivers V0/2 for twice its delay
  // (practice: the pulse-forming line of every textbook on pulsed power).
  CHECK(max_error(w, "sw", 0.0, closes - kDt, [&](double) { return v0; }) < 1e-12);
  CHECK(max_error(w, "sw", closes, closes + 2 * delay - kDt, [&](double) { return v0 / 2; }) <
        1e-12);
  CHECK(max_error(w, "sw", closes + 2 * delay, 4e-9, [](double) { return 0.0; }) < 1e-12);
  // The far end holds V0 until the -V0/2 wave arrives and doubles there to cancel it (same).
  CHECK(max_error(w, "end", 0.0, closes + delay - kDt, [&](double) { return v0; }) < 1e-12);
  CHECK(max_error(w, "end", closes + delay, 4e-9, [](double) { return 0.0; }) < 1e-12);
}

TEST_CASE("a shorted end reflects the wave inverted") {
  Circuit c;
  c.lines.push_back(line("stub", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 1.0, 50.0));
  Load shorted;
  shorted.node = "b";
  shorted.network.kind = NetworkKind::short_circuit;
  c.loads.push_back(shorted);
  const Waveforms w = simulate_characteristics(c, 4e-9, kDt);
  // Gamma = (0 - Z0)/(0 + Z0) = -1 at a short (REFERENCES.md, Reflections; every textbook):
  // the source end sees V1 = 0.5 V for one round trip, then nothing.
  CHECK(max_error(w, "a", 10e-12, 2e-9, [](double) { return 0.5; }) < 1e-12);
  CHECK(max_error(w, "a", 2e-9 + 10e-12, 4e-9, [](double) { return 0.0; }) < 1e-12);
  CHECK(max_error(w, "b", 0.0, 4e-9, [](double) { return 0.0; }) < 1e-12);
}

TEST_CASE("a capacitive load charges as 1 - exp(-t/(Z0 C)) after the wave arrives") {
  const double z0 = 50.0, cap = 10e-12, delay = 1e-9, ramp = 10e-12, tau = z0 * cap;
  Circuit c;
  c.lines.push_back(line("l", "a", "b", z0, delay));
  c.drives.push_back(step("a", 1.0, z0));
  c.loads.push_back(load("b", element(ElementKind::capacitor, cap)));
  const Waveforms w = simulate_characteristics(c, delay + 10 * tau, kDt);
  // Analytic first-order response: the line seen from the load is its open-circuit voltage
  // 2 V1 = 1 V behind Z0 (Thevenin), so the capacitor charges as 1 - exp(-t/(Z0 C)) (the RC
  // step response of every circuits textbook), here averaged over the 10 ps ramp.
  CHECK(max_error(w, "b", 0.0, delay, [](double) { return 0.0; }) < 1e-12);
  CHECK(max_error(w, "b", delay + ramp, delay + 10 * tau,
                  [&](double t) { return first_order_ramp(t - delay, tau, ramp); }) < 1e-5);
}

TEST_CASE("the companion models' error falls as the square of the step") {
  const double z0 = 50.0, cap = 10e-12, delay = 1e-9, ramp = 10e-12, tau = z0 * cap;
  const auto error_at = [&](double dt) {
    Circuit c;
    c.lines.push_back(line("l", "a", "b", z0, delay));
    c.drives.push_back(step("a", 1.0, z0));
    c.loads.push_back(load("b", element(ElementKind::capacitor, cap)));
    const Waveforms w = simulate_characteristics(c, delay + 10 * tau, dt);
    return max_error(w, "b", delay + ramp, delay + 10 * tau,
                     [&](double t) { return first_order_ramp(t - delay, tau, ramp); });
  };
  // The trapezoidal rule is second order (Dommel 1969 for its use here; any numerical
  // analysis text): doubling the step multiplies the error by about 4. Its local error is
  // dt^3 v'''/12; during the ramp v''' = -1/(ramp tau^2) for a unit swing, so the error
  // gathered by the ramp's end, the largest, is about (dt/tau)^2/12 (derived here, not
  // taken from a book; the exponential tail afterwards adds less).
  const double fine = error_at(1e-12), coarse = error_at(2e-12);
  CHECK(coarse / fine == Approx(4.0).epsilon(0.05));
  CHECK(fine == Approx(std::pow(1e-12 / tau, 2) / 12).epsilon(0.1));
}

TEST_CASE("an inductive load decays as exp(-t Z0/L) after the wave arrives") {
  const double z0 = 50.0, ind = 25e-9, delay = 1e-9, ramp = 10e-12, tau = ind / z0;
  Circuit c;
  c.lines.push_back(line("l", "a", "b", z0, delay));
  c.drives.push_back(step("a", 1.0, z0));
  c.loads.push_back(load("b", element(ElementKind::inductor, ind)));
  const Waveforms w = simulate_characteristics(c, delay + 10 * tau, kDt);
  // Analytic first-order response: 1 V behind Z0 (Thevenin, as above) into L gives
  // exp(-t Z0/L) across the inductor (the RL step response of every circuits textbook),
  // averaged over the ramp: 1 minus the capacitor's ramp response.
  CHECK(max_error(w, "b", delay + ramp, delay + 10 * tau,
                  [&](double t) { return 1.0 - first_order_ramp(t - delay, tau, ramp); }) < 1e-5);
}

TEST_CASE("a series R + C load steps to R/(R + Z0) and charges with (R + Z0) C") {
  const double z0 = 50.0, r = 25.0, cap = 4e-12, delay = 1e-9, ramp = 10e-12;
  const double tau = (r + z0) * cap;
  LoadNetwork series;
  series.kind = NetworkKind::series;
  series.parts = {element(ElementKind::resistor, r), element(ElementKind::capacitor, cap)};
  Circuit c;
  c.lines.push_back(line("l", "a", "b", z0, delay));
  c.drives.push_back(step("a", 1.0, z0));
  c.loads.push_back(load("b", series));
  const Waveforms w = simulate_characteristics(c, delay + 10 * tau, kDt);
  // Analytic first-order response of 1 V behind Z0 into R in series with C (every circuits
  // textbook): v = 1 - Z0/(R + Z0) exp(-t/((R + Z0) C)), averaged over the ramp.
  CHECK(max_error(w, "b", delay + ramp, delay + 10 * tau, [&](double t) {
          return 1.0 - z0 / (r + z0) * (1.0 - first_order_ramp(t - delay, tau, ramp));
        }) < 1e-5);
}

TEST_CASE("two lines of equal Z0 in cascade behave as one line of the summed delay") {
  const auto build = [](bool split) {
    Circuit c;
    if (split) {
      c.lines.push_back(line("first", "a", "mid", 50.0, 0.6e-9));
      c.lines.push_back(line("second", "mid", "b", 50.0, 0.4e-9));
    } else {
      c.lines.push_back(line("whole", "a", "b", 50.0, 1.0e-9));
    }
    c.drives.push_back(step("a", 1.0, 25.0, 100e-12));
    c.loads.push_back(load("b", element(ElementKind::resistor, 100.0)));
    return simulate_characteristics(c, 12e-9, kDt);
  };
  const Waveforms split = build(true), whole = build(false);
  const auto& one = find_node(whole, "b")->v;
  // Gamma = (Z0 - Z0)/(Z0 + Z0) = 0 where equal impedances meet (every textbook): the
  // junction is invisible, so both ends match sample for sample.
  for (const char* node : {"a", "b"}) {
    INFO(node);
    const auto& ref = find_node(whole, node)->v;
    CHECK(max_error(split, node, 0.0, 12e-9, [&](double t) {
            return ref[static_cast<std::size_t>(std::llround(t / kDt))];
          }) < 1e-12);
  }
  CHECK(one.back() > 0.5);  // the comparison above is of a live waveform, not of zeros
}

TEST_CASE("a wave splits at a junction of three lines by the parallel impedance") {
  const double z0 = 50.0, ramp = 10e-12;
  Circuit c;
  c.lines.push_back(line("trunk", "a", "tap", z0, 1e-9));
  c.lines.push_back(line("left", "tap", "x", z0, 0.5e-9));
  c.lines.push_back(line("right", "tap", "y", z0, 0.7e-9));
  c.drives.push_back(step("a", 1.0, z0));
  c.loads.push_back(load("x", element(ElementKind::resistor, z0)));
  c.loads.push_back(load("y", element(ElementKind::resistor, z0)));
  const Waveforms w = simulate_characteristics(c, 4e-9, kDt);
  // At a junction the arriving wave sees the other lines in parallel, Z0/2 here, so
  // Gamma = (Z0/2 - Z0)/(Z0/2 + Z0) = -1/3 and each branch carries V1 (1 + Gamma) (every
  // textbook on transmission lines). Matched ends take it without further reflection.
  const double v1 = 0.5, gamma = (z0 / 2 - z0) / (z0 / 2 + z0);
  CHECK(max_error(w, "tap", 1e-9 + ramp, 4e-9, [&](double) { return v1 * (1 + gamma); }) < 1e-12);
  CHECK(max_error(w, "x", 1.5e-9 + ramp, 4e-9, [&](double) { return v1 * (1 + gamma); }) < 1e-12);
  CHECK(max_error(w, "y", 1.7e-9 + ramp, 4e-9, [&](double) { return v1 * (1 + gamma); }) < 1e-12);
  CHECK(max_error(w, "a", 2e-9 + ramp, 4e-9, [&](double) { return v1 * (1 + gamma); }) < 1e-12);
}

TEST_CASE("a delay between samples is interpolated within a quarter step of the edge") {
  const double delay = 1.0005e-9, rise = 80e-12, ramp = rise / 0.8;
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, delay));
  Drive d = step("a", 1.0, 50.0, rise);
  d.at = 0.5e-12;  // corners half a step off the grid: the worst case for interpolation
  c.drives.push_back(d);
  const Waveforms w = simulate_characteristics(c, 3e-9, kDt);
  // Until the reflection returns (3 delays), the open far end shows the source voltage one
  // delay late (Bergeron: v + Z0 i travels unchanged; the open end doubles it). Linear
  // interpolation of the history is exact on the ramp's straight parts; across a corner that
  // falls between samples it errs by at most a quarter of one step's change, reached when
  // the corner sits half a step from the samples and is looked up there (both here).
  const double one_step_change = kDt / ramp;
  const double err = max_error(w, "b", 0.0, 3e-9,
                               [&](double t) { return drive_voltage(d, c.settings, t - delay); });
  CHECK(err <= 0.25 * one_step_change * (1 + 1e-9));
  CHECK(err > 0.2 * one_step_change);  // the half-step case does reach the bound
  CHECK_THAT(at(w, "b", 2e-9), WithinAbs(1.0, 1e-12));
}

TEST_CASE("drive edges follow the design's definition of rise, width and period") {
  rungs::model::Settings settings;
  Drive p;
  p.node = "p";
  p.kind = WaveKind::pulse;
  p.low = 0.0;
  p.high = 1.8;
  p.rise = 100e-12;
  p.at = 1e-9;
  p.width = 2e-9;
  p.period = 10e-9;
  const double ramp = 100e-12 / 0.8;
  // DESIGN.md, "Edges": rise is the 10-90 % time of a linear ramp that starts at `at`, so the
  // ramp's 0-100 % time is rise/0.8; a pulse stays high for width and repeats every period.
  CHECK_THAT(drive_voltage(p, settings, p.at + 0.1 * ramp), WithinAbs(0.18, 1e-12));
  CHECK_THAT(drive_voltage(p, settings, p.at + 0.9 * ramp), WithinAbs(1.62, 1e-12));
  CHECK_THAT(0.8 * ramp, WithinAbs(*p.rise, 1e-24));
  CHECK_THAT(drive_voltage(p, settings, 0.5e-9), WithinAbs(0.0, 1e-12));
  CHECK_THAT(drive_voltage(p, settings, p.at + ramp + 1e-9), WithinAbs(1.8, 1e-12));
  CHECK_THAT(drive_voltage(p, settings, p.at + ramp + 2e-9 + ramp / 2), WithinAbs(0.9, 1e-12));
  CHECK_THAT(drive_voltage(p, settings, 6e-9), WithinAbs(0.0, 1e-12));
  CHECK_THAT(drive_voltage(p, settings, p.at + 10e-9 + ramp + 1e-9), WithinAbs(1.8, 1e-12));

  // A dc drive is 0 V until `at`, then ramps to its level (DESIGN.md, the drive examples).
  Drive dc = p;
  dc.kind = WaveKind::dc;
  dc.high = 10.0;
  dc.rise.reset();
  settings.rise = 1e-9;
  CHECK(drive_voltage(dc, settings, 0.9e-9) == 0.0);
  CHECK_THAT(drive_voltage(dc, settings, 1e-9 + 1.25e-9 / 2), WithinAbs(5.0, 1e-12));
  CHECK_THAT(drive_voltage(dc, settings, 5e-9), WithinAbs(10.0, 1e-12));
}

TEST_CASE("a zero-resistance drive into a matched line arrives unchanged one delay later") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  Drive p = step("a", 1.8, 0.0, 100e-12);
  p.kind = WaveKind::pulse;
  p.width = 0.5e-9;
  p.period = 1.5e-9;
  c.drives.push_back(p);
  c.loads.push_back(load("b", element(ElementKind::resistor, 50.0)));
  const Waveforms w = simulate_characteristics(c, 6e-9, kDt);
  // A matched line only delays what it is given (Bergeron: v + Z0 i reaches the far end
  // unchanged; with no reflection that is the whole wave). The forced node is the drive.
  CHECK(max_error(w, "a", 0.0, 6e-9, [&](double t) { return drive_voltage(p, c.settings, t); }) <
        1e-12);
  CHECK(max_error(w, "b", 0.0, 6e-9,
                  [&](double t) { return drive_voltage(p, c.settings, t - 1e-9); }) < 1e-12);
  CHECK_THAT(at(w, "b", 1e-9 + 0.125e-9 + 0.25e-9), WithinAbs(1.8, 1e-12));
}

TEST_CASE("lossy lines and steps longer than a delay are refused") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 1.0, 50.0));
  Circuit lossy = c;
  lossy.lines[0].per_length.r = 2.0;
  CHECK_THROWS_AS(simulate_characteristics(lossy, 1e-9, kDt), std::invalid_argument);
  lossy = c;
  lossy.lines[0].per_length.g = 1e-5;
  CHECK_THROWS_AS(simulate_characteristics(lossy, 1e-9, kDt), std::invalid_argument);
  CHECK_THROWS_AS(simulate_characteristics(c, 4e-9, 2e-9), std::invalid_argument);
  CHECK_THROWS_AS(simulate_characteristics(c, 4e-9, 0.0), std::invalid_argument);
  CHECK_NOTHROW(simulate_characteristics(c, 0.0, kDt));
}
