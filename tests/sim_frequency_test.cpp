// The frequency-domain reference against the lattice diagram, the characteristics run and
// closed-form lossy lines.
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "3_model/circuit.h"
#include "4_sim/characteristics.h"
#include "4_sim/frequency_network.h"
#include "4_sim/frequency_reference.h"

using Catch::Matchers::WithinAbs;
using rungs::model::Circuit;
using rungs::model::Drive;
using rungs::model::ElementKind;
using rungs::model::Line;
using rungs::model::Load;
using rungs::model::LoadNetwork;
using rungs::model::NetworkKind;
using rungs::model::Shape;
using rungs::model::WaveKind;
using rungs::sim::Complex;
using rungs::sim::exact_reference;
using rungs::sim::find_node;
using rungs::sim::FrequencyNetwork;
using rungs::sim::InitialState;
using rungs::sim::LadderSpec;
using rungs::sim::ReferenceOptions;
using rungs::sim::Response;
using rungs::sim::simulate_characteristics;
using rungs::sim::Waveforms;

using rungs::testing::combine;
using rungs::testing::element;
using rungs::testing::load;

namespace {

Line line(const std::string& name, const std::string& near, const std::string& far, double z0,
          double delay) {
  return rungs::testing::ideal_line(name, near, far, z0, delay);
}

Drive step(const std::string& node, double low, double high, double source, double rise,
           double at = 0.0) {
  return rungs::testing::step_drive(node, low, high, source, rise, at);
}

constexpr double kDt = 1e-12;  // the characteristics run's step: every delay is a multiple






ReferenceOptions options(double window, double target = 5e-4) {
  ReferenceOptions o;
  o.window = window;
  o.target = target;
  return o;
}

/// v(t) of `node` in a Response's total, interpolated linearly between its samples.
double value_at(const Waveforms& w, const std::string& node, double t) {
  const auto* n = find_node(w, node);
  REQUIRE(n != nullptr);
  const double dt = w.t[1] - w.t[0];
  const double x = t / dt;
  const auto j = static_cast<std::size_t>(std::floor(x));
  REQUIRE(j + 1 < n->v.size());
  return n->v[j] + (x - static_cast<double>(j)) * (n->v[j + 1] - n->v[j]);
}

/// The largest |v_frequency - v_characteristics| over every node and every sample of the
/// frequency reference within both runs, the characteristics run interpolated linearly
/// between its 1 ps samples.
double largest_difference(const Waveforms& frequency, const Waveforms& characteristics) {
  double worst = 0.0;
  for (const auto& node : frequency.nodes) {
    const auto* other = find_node(characteristics, node.node);
    REQUIRE(other != nullptr);
    for (std::size_t j = 0; j < frequency.t.size(); ++j) {
      const double x = frequency.t[j] / kDt;
      const auto k = static_cast<std::size_t>(std::floor(x));
      if (k + 1 >= other->v.size()) break;
      const double v = other->v[k] + (x - static_cast<double>(k)) * (other->v[k + 1] - other->v[k]);
      worst = std::max(worst, std::abs(node.v[j] - v));
    }
  }
  return worst;
}

/// Runs both references over `window` and checks they agree within 0.2 % of `swing`, the
/// accuracy asked of the reference here, and that the frequency reference's own estimate
/// is met.
void check_against_characteristics(const Circuit& c, double window, double swing) {
  const Response r = exact_reference(c, options(window));
  INFO("frequencies " << r.grid.frequencies << ", estimated error " << r.error_estimate.estimate());
  CHECK(r.error_estimate.within_target);
  const Waveforms f = r.total();
  const Waveforms m = simulate_characteristics(c, window, kDt);
  const double difference = largest_difference(f, m) / swing;
  INFO("largest difference " << difference << " of the swing");
  CHECK(difference < 2e-3);
}

}  // namespace

TEST_CASE("the frequency reference follows Hayt & Buck, Example 10.11") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 0.0, 10.0, 50.0, 8e-12));
  c.loads.push_back(load("b", element(ElementKind::resistor, 25.0)));
  const Response r = exact_reference(c, options(4e-9, 2e-4));
  REQUIRE(r.error_estimate.within_target);
  const Waveforms w = r.total();
  // Hayt & Buck, Engineering Electromagnetics, 8th ed., Example 10.11 (book): V0 = 10 V,
  // Rg = Z0 = 50 ohm, R_L = 25 ohm: V1+ = 5 V at the source until the reflection returns,
  // then 3.333 V at both ends (Gamma_L = -1/3, the matched source absorbing the reflection).
  // Allowed: the printed four figures, and 0.2 % of the 10 V swing beside the corners.
  for (const double t : {0.2e-9, 0.9e-9, 1.5e-9, 1.95e-9})
    CHECK_THAT(value_at(w, "a", t), WithinAbs(5.0, 0.02));
  for (const double t : {0.2e-9, 0.95e-9}) CHECK_THAT(value_at(w, "b", t), WithinAbs(0.0, 0.02));
  for (const double t : {1.1e-9, 2.5e-9, 3.9e-9})
    CHECK_THAT(value_at(w, "b", t), WithinAbs(3.333, 0.02));
  for (const double t : {2.1e-9, 3.0e-9, 3.9e-9})
    CHECK_THAT(value_at(w, "a", t), WithinAbs(3.333, 0.02));
}

TEST_CASE("a mismatched cascade agrees with the method of characteristics") {
  Circuit c;
  c.lines.push_back(line("first", "a", "m", 50.0, 1e-9));
  c.lines.push_back(line("second", "m", "b", 75.0, 0.7e-9));
  c.drives.push_back(step("a", 0.0, 1.0, 25.0, 80e-12));
  check_against_characteristics(c, 10e-9, 1.0);
}

TEST_CASE("a branch with R, L and C loads, series and parallel, agrees with characteristics") {
  Circuit c;
  c.lines.push_back(line("trunk", "drv", "tap", 50.0, 1e-9));
  c.lines.push_back(line("left", "tap", "r1", 50.0, 0.5e-9));
  c.lines.push_back(line("right", "tap", "r2", 75.0, 0.8e-9));
  c.drives.push_back(step("drv", 0.0, 3.3, 25.0, 150e-12, 0.2e-9));
  // 10k || 4p; 50 + 1n in series; and a nested (20 || 30 nH) + 2 pF.
  c.loads.push_back(
      load("r1", combine(NetworkKind::parallel, {element(ElementKind::resistor, 10e3),
                                                 element(ElementKind::capacitor, 4e-12)})));
  c.loads.push_back(
      load("r2", combine(NetworkKind::series, {element(ElementKind::resistor, 50.0),
                                               element(ElementKind::capacitor, 1e-9)})));
  c.loads.push_back(
      load("tap", combine(NetworkKind::series,
                          {combine(NetworkKind::parallel, {element(ElementKind::resistor, 20.0),
                                                           element(ElementKind::inductor, 30e-9)}),
                           element(ElementKind::capacitor, 2e-12)})));
  check_against_characteristics(c, 12e-9, 3.3);
}

TEST_CASE("several drives, a repeated pulse and a dc drive superpose as in characteristics") {
  Circuit c;
  c.lines.push_back(line("bus", "a", "b", 50.0, 1.2e-9));
  c.lines.push_back(line("stub", "b", "c", 60.0, 0.4e-9));
  c.drives.push_back(step("a", 0.0, 1.0, 50.0, 100e-12));
  Drive pulse = step("b", 0.0, 1.8, 40.0, 100e-12, 0.5e-9);
  pulse.kind = WaveKind::pulse;
  pulse.width = 1e-9;
  pulse.period = 3e-9;
  c.drives.push_back(pulse);
  Drive dc = step("c", 0.0, 2.0, 100.0, 200e-12, 1.5e-9);
  dc.kind = WaveKind::dc;
  c.drives.push_back(dc);
  check_against_characteristics(c, 10e-9, 1.0);
}

TEST_CASE("a load switched in after the wave arrives agrees with characteristics") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 0.0, 1.0, 50.0, 100e-12));
  // An inductor in series keeps the node's voltage continuous where the switch closes, so both
  // runs see corners only (an ideal switch onto a resistor makes a true jump). Its time
  // constant L/(R + Z0) = 0.67 ns spans many 1 ps steps: the characteristics run's trapezoidal
  // start from rest acts about half a step early, an error of half a step times the slope.
  Load switched = load("b", combine(NetworkKind::series, {element(ElementKind::resistor, 25.0),
                                                          element(ElementKind::inductor, 50e-9)}));
  switched.at = 2.5e-9;
  c.loads.push_back(switched);
  c.loads.push_back(load("a", element(ElementKind::capacitor, 1e-12)));
  Load second = load("b", element(ElementKind::inductor, 40e-9));
  second.at = 4.0e-9;
  c.loads.push_back(second);
  check_against_characteristics(c, 10e-9, 1.0);
}

TEST_CASE("a charged line discharging through a switched load agrees with characteristics") {
  // Charged to 10 V and open at both ends, the line holds still until the switch closes; the
  // series inductor keeps the switched node's voltage continuous (no true jump), and its time
  // constant of 0.67 ns keeps the characteristics run's half-step switching error small.
  Circuit c;
  Line pfl = line("pfl", "sw", "end", 50.0, 1e-9);
  pfl.charged = 10.0;
  c.lines.push_back(pfl);
  Load switched = load("sw", combine(NetworkKind::series, {element(ElementKind::resistor, 25.0),
                                                           element(ElementKind::inductor, 50e-9)}));
  switched.at = 0.5e-9;
  c.loads.push_back(switched);
  const Response r = exact_reference(c, options(8e-9));
  CHECK(r.initial == InitialState::rest);  // a charged line starts from rest, as under uic
  CHECK(r.excitations.size() == 1);
  CHECK(r.excitations[0].swing == 10.0);
  check_against_characteristics(c, 8e-9, 10.0);
}

TEST_CASE("a switch that closes over a ramp lets the line's end fall along it") {
  // A line charged to V0 = 10 V, switched into its own impedance through a switch whose
  // voltage falls linearly from V0 to 0 over tau. Until the discharge wave returns (2T after
  // closing), the line's end is a source V0 behind Z0 (lattice diagram; e.g. Hayt & Buck,
  // 8th ed., sec. 10.13 for the charged line), so the current is (V0 - e(t))/(2 Z0) with
  // e(t) = V0 (1 - (t - t0)/tau): the end falls linearly from V0 to V0/2 over tau, then holds.
  Circuit c;
  Line pfl = line("pfl", "far", "sw", 50.0, 10e-9);
  pfl.charged = 10.0;
  c.lines.push_back(pfl);
  rungs::model::LoadNetwork open;
  open.kind = NetworkKind::open;
  c.loads.push_back(load("far", open));
  Load switched = load("sw", element(ElementKind::resistor, 50.0));
  const double t0 = 5e-9, tau = 2e-9;
  switched.at = t0;
  c.loads.push_back(switched);
  ReferenceOptions o = options(30e-9);
  o.closing = {0.0, tau};
  const Response r = exact_reference(c, o);
  CHECK(r.error_estimate.within_target);
  REQUIRE(r.switch_voltages.size() == 1);
  CHECK(r.switch_voltages[0] == Approx(10.0).epsilon(1e-3));  // the open voltage at t0
  const auto w = r.total();
  const auto* end = rungs::sim::find_node(w, "sw");
  REQUIRE(end != nullptr);
  for (const double f : {0.0, 0.25, 0.5, 0.75, 1.0, 2.0, 5.0}) {
    const double t = t0 + f * tau;
    const std::size_t j = static_cast<std::size_t>(std::lround(t / (w.t[1] - w.t[0])));
    const double expected = f < 1.0 ? 10.0 - 5.0 * f : 5.0;
    INFO("at t0 + " << f << " tau");
    CHECK(std::abs(end->v[j] - expected) < 0.01);  // 0.1 % of V0
  }
}

TEST_CASE("a zero-resistance drive, shorts and a line end on ground agree with characteristics") {
  Circuit c;
  c.lines.push_back(line("feed", "a", "b", 50.0, 1e-9));
  c.lines.push_back(line("shorted", "b", "s", 30.0, 0.3e-9));
  c.lines.push_back(line("grounded", "b", "0", 70.0, 0.45e-9));
  c.drives.push_back(step("a", 0.0, 1.0, 0.0, 120e-12));
  Load shorted;
  shorted.node = "s";
  shorted.network.kind = NetworkKind::short_circuit;
  c.loads.push_back(shorted);
  // A short switched in before any wave reaches its node: no jump, and the end reflects
  // inverted from then on, through the forced-node path of a closed switch.
  c.lines.push_back(line("late", "b", "z", 50.0, 0.8e-9));
  Load late = shorted;
  late.node = std::string("z");
  late.at = 0.3e-9;
  c.loads.push_back(late);
  check_against_characteristics(c, 8e-9, 1.0);
}

TEST_CASE("a long cascade, solved by the sparse factorization, agrees with characteristics") {
  Circuit c;
  const int count = 60;  // 61 nodes: more than the dense solver takes
  for (int k = 0; k < count; ++k)
    c.lines.push_back(line(fmt::format("l{}", k), fmt::format("n{}", k), fmt::format("n{}", k + 1),
                           k % 2 == 0 ? 50.0 : 60.0, 0.05e-9));
  c.drives.push_back(step("n0", 0.0, 1.0, 50.0, 100e-12));
  c.loads.push_back(load("n60", element(ElementKind::resistor, 55.0)));
  check_against_characteristics(c, 10e-9, 1.0);
}

TEST_CASE("a settled start holds each drive's low level as the DC state") {
  // Step from 1 V to 3 V behind 25 ohm, a lossless 50 ohm line, 75 ohm load: the DC state is
  // the divider 1 V * 75/(25 + 75) = 0.75 V at both ends (Ohm's law; a lossless line is a short
  // at DC), and the change from it is the characteristics run of a 0 V to 2 V step from rest.
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 1.0, 3.0, 25.0, 100e-12, 0.3e-9));
  c.loads.push_back(load("b", element(ElementKind::resistor, 75.0)));
  const Response r = exact_reference(c, options(8e-9));
  CHECK(r.initial == InitialState::settled);
  const Waveforms w = r.total();
  // Within the aliasing bound: the change (1.5 V at the end) recurs damped by e^{-sigma P}.
  CHECK_THAT(w.nodes[0].v[0], WithinAbs(0.75, 1.5 * r.error_estimate.aliasing));
  CHECK_THAT(w.nodes[1].v[0], WithinAbs(0.75, 1.5 * r.error_estimate.aliasing));
  Circuit change = c;
  change.drives[0].low = 0.0;
  change.drives[0].high = 2.0;
  Waveforms m = simulate_characteristics(change, 8e-9, kDt);
  for (auto& node : m.nodes)
    for (double& v : node.v) v += 0.75;
  CHECK(largest_difference(w, m) / 2.0 < 2e-3);
  // At rest instead, the low level is switched on at t = 0 as in the characteristics run.
  ReferenceOptions rest = options(8e-9, 2e-2);
  rest.initial = InitialState::rest;
  const Response jumped = exact_reference(c, rest);
  CHECK(jumped.initial == InitialState::rest);
  CHECK_THAT(jumped.total().nodes[1].v.back(), WithinAbs(3.0 * 0.75, 0.02));
}

TEST_CASE("a lossy line's DC state divides through its series resistance") {
  // 50 ohm source, 10 ohm of line resistance, 40 ohm load: 0.5 V at the near end, 0.4 V at the
  // far end for a 1 V level (Ohm's law).
  Circuit c;
  Line l = line("l", "a", "b", 50.0, 1e-9);
  l.length = 0.2;
  l.per_length.r = 50.0;
  c.lines.push_back(l);
  c.drives.push_back(step("a", 1.0, 2.0, 50.0, 100e-12, 0.5e-9));
  c.loads.push_back(load("b", element(ElementKind::resistor, 40.0)));
  const Response r = exact_reference(c, options(40e-9, 1e-3));
  const Waveforms w = r.total();
  CHECK_THAT(w.nodes[0].v.front(), WithinAbs(0.5, r.error_estimate.aliasing));
  CHECK_THAT(w.nodes[1].v.front(), WithinAbs(0.4, r.error_estimate.aliasing));
  // After the step to 2 V the circuit settles to twice that (the final value theorem,
  // lim s V(s) as s -> 0, any table of transforms).
  CHECK_THAT(w.nodes[0].v.back(), WithinAbs(1.0, 2e-3));
  CHECK_THAT(w.nodes[1].v.back(), WithinAbs(0.8, 2e-3));
}

TEST_CASE("a distortionless line delivers the delayed edge attenuated by exp(-alpha l)") {
  // Heaviside's condition R'/L' = G'/C' makes gamma = sqrt(L'C') (s + R'/L') and
  // Zc = sqrt(L'/C') for every s (Pozar, Microwave Engineering, 4th ed., sec. 2.7, the
  // distortionless line, recalled from memory): a matched line passes the edge unchanged but
  // for exp(-alpha l), alpha = R'/(2 Z0) + G' Z0/2 (Pozar eq. 2.85; exact here).
  const double z0 = 50.0, delay = 2e-9, length = 0.4, rise = 200e-12;
  const double v = length / delay, lp = z0 / v, cp = 1.0 / (z0 * v);
  const double rp = 5.0, gp = cp * rp / lp;
  Circuit c;
  Line l = line("l", "a", "b", z0, delay);
  l.length = length;
  l.per_length = {lp, cp, rp, gp};
  c.lines.push_back(l);
  c.drives.push_back(step("a", 0.0, 1.0, z0, rise, 0.5e-9));
  c.loads.push_back(load("b", element(ElementKind::resistor, z0)));
  const Response r = exact_reference(c, options(6e-9));
  REQUIRE(r.error_estimate.within_target);
  const Waveforms w = r.total();
  const double alpha = rp / (2.0 * z0) + gp * z0 / 2.0;
  const double ramp = rise / 0.8;
  double worst = 0.0;
  for (std::size_t j = 0; j < w.t.size(); ++j) {
    const double s = w.t[j] - 0.5e-9 - delay;
    const double edge = s <= 0.0 ? 0.0 : s >= ramp ? 1.0 : s / ramp;
    worst = std::max(worst, std::abs(w.nodes[1].v[j] - 0.5 * std::exp(-alpha * length) * edge));
  }
  CHECK(worst < 2e-3 * 0.5);
}

TEST_CASE("each source's response is the circuit driven by it alone") {
  Circuit both;
  both.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  both.drives.push_back(step("a", 0.0, 1.0, 30.0, 100e-12));
  both.drives.push_back(step("b", 0.0, -2.0, 80.0, 150e-12, 1.3e-9));
  const Response r = exact_reference(both, options(6e-9, 1e-3));
  REQUIRE(r.excitations.size() == 2);
  CHECK(r.excitations[1].swing == -2.0);
  // Superposition (any circuits text): the second drive alone, the first replaced by its
  // source resistance.
  Circuit alone = both;
  alone.drives.erase(alone.drives.begin());
  alone.loads.push_back(load("a", element(ElementKind::resistor, 30.0)));
  const Response single = rungs::sim::frequency_response(alone, {}, r.grid, options(6e-9, 1e-3));
  double worst = 0.0;
  for (std::size_t i = 0; i < 2; ++i)
    for (std::size_t j = 0; j < r.t.size(); ++j)
      worst = std::max(worst, std::abs(r.v[1][i][j] - single.v[0][i][j]));
  CHECK(worst < 1e-12);
}

TEST_CASE("a circuit splits into parts that respond as they do together") {
  Circuit c;
  c.lines.push_back(line("a1", "a", "b", 50.0, 1e-9));
  c.lines.push_back(line("c1", "c", "d", 60.0, 0.5e-9));
  c.lines.push_back(line("a2", "b", "0", 50.0, 0.3e-9));  // ground joins nothing
  c.lines.push_back(line("c2", "0", "e", 50.0, 0.3e-9));
  c.drives.push_back(step("c", 0.0, 1.0, 25.0, 100e-12));
  c.drives.push_back(step("a", 0.0, 2.0, 50.0, 100e-12));
  c.loads.push_back(load("d", element(ElementKind::resistor, 100.0)));
  c.loads.push_back(load("lonely", element(ElementKind::resistor, 100.0)));
  const auto parts = rungs::sim::connected_parts(c);
  REQUIRE(parts.size() == 4);
  CHECK(parts[0].lines == std::vector<std::size_t>{0, 2});
  CHECK(parts[0].drives == std::vector<std::size_t>{1});
  CHECK(parts[1].lines == std::vector<std::size_t>{1});
  CHECK(parts[1].drives == std::vector<std::size_t>{0});
  CHECK(parts[1].loads == std::vector<std::size_t>{0});
  CHECK(parts[2].lines == std::vector<std::size_t>{3});
  CHECK(parts[3].lines.empty());
  CHECK(parts[3].loads == std::vector<std::size_t>{1});
  // Superposition (any circuits text): parts joined by nothing do not affect one another.
  const Response whole = exact_reference(c, options(4e-9, 1e-3));
  const Response part =
      rungs::sim::frequency_response(parts[1].circuit, {}, whole.grid, options(4e-9, 1e-3));
  const auto i = whole.node_index("d");
  REQUIRE(i);
  double worst = 0.0;
  for (std::size_t j = 0; j < whole.t.size(); ++j)
    worst = std::max(worst, std::abs(whole.v[0][*i][j] - part.v[0][1][j]));
  CHECK(worst < 1e-12);
}

TEST_CASE("the nodal solution stays finite with a 100000-section ladder far above cutoff") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 10e-9));
  c.drives.push_back(step("a", 0.0, 1.0, 50.0, 100e-12));
  c.loads.push_back(load("b", element(ElementKind::capacitor, 1e-12)));
  const int n = 100000;
  // f_c = 1/(pi sqrt(LC)) per section (REFERENCES.md): ten times that.
  const double w = 10.0 * 2.0 * n / 10e-9;
  for (const Shape shape : {Shape::pi, Shape::t, Shape::l}) {
    FrequencyNetwork network(c, {LadderSpec{n, shape}}, InitialState::automatic);
    Eigen::MatrixXcd v;
    network.solve(Complex(1e8, w), 0, Eigen::MatrixXcd(), v);
    CHECK(std::isfinite(std::abs(v(0, 0))));
    CHECK(std::isfinite(std::abs(v(1, 0))));
    CHECK(std::abs(v(1, 0)) < 1e-200);  // nothing passes e^{-N theta}
  }
}

TEST_CASE("the frequency reference refuses what it cannot solve") {
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step("a", 0.0, 1.0, 0.0, 100e-12));
  Circuit two = c;
  two.drives.push_back(step("a", 0.0, 1.0, 0.0, 100e-12));
  CHECK_THROWS_AS(exact_reference(two, options(4e-9)), std::invalid_argument);
  Circuit no_delay = c;
  no_delay.lines[0].delay = 0.0;
  CHECK_THROWS_AS(exact_reference(no_delay, options(4e-9)), std::invalid_argument);
  CHECK_THROWS_AS(exact_reference(c, options(0.0)), std::invalid_argument);
  Circuit charged = c;
  charged.lines[0].charged = 5.0;
  ReferenceOptions settled = options(4e-9);
  settled.initial = InitialState::settled;
  CHECK_THROWS_AS(exact_reference(charged, settled), std::invalid_argument);
  CHECK_THROWS_AS(FrequencyNetwork(c, {LadderSpec{0, Shape::pi}}, InitialState::automatic),
                  std::invalid_argument);
}
