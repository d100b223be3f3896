// The ladder waveforms against an independent integration, and the error measure on known cases.
#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/characteristics.h"
#include "4_sim/error_measure.h"
#include "4_sim/frequency_reference.h"

using Catch::Matchers::WithinAbs;
using rungs::model::Circuit;
using rungs::model::Drive;
using rungs::model::ElementKind;
using rungs::model::Line;
using rungs::model::Load;
using rungs::model::NetworkKind;
using rungs::model::Shape;
using rungs::model::WaveKind;
using rungs::sim::compare_waveforms;
using rungs::sim::exact_reference;
using rungs::sim::LadderMeasurement;
using rungs::sim::LadderSpec;
using rungs::sim::measure_ladder_error;
using rungs::sim::ReferenceOptions;
using rungs::sim::Response;
using rungs::sim::WaveformError;

namespace {

/// One 50 ohm line from "a" to "b" driven by a step behind `source`, with a resistive load at
/// the far end unless `load` is zero (open).
Circuit single_line(double delay, double rise, double source, double load_ohms = 0.0) {
  const std::string near("a"), far("b");
  Circuit c;
  Line l;
  l.name = std::string("l");
  l.near = near;
  l.far = far;
  l.model = std::string("ideal");
  l.z0 = 50.0;
  l.delay = delay;
  c.lines.push_back(l);
  Drive d;
  d.node = near;
  d.kind = WaveKind::step;
  d.high = 1.0;
  d.rise = rise;
  d.source_resistance = source;
  c.drives.push_back(d);
  if (load_ohms > 0.0) {
    Load ld;
    ld.node = far;
    ld.network.kind = NetworkKind::single;
    ld.network.element = ElementKind::resistor;
    ld.network.value = load_ohms;
    c.loads.push_back(ld);
  }
  return c;
}

ReferenceOptions options(double window, double target) {
  ReferenceOptions o;
  o.window = window;
  o.target = target;
  return o;
}

/// The state derivative of an LC ladder driven through `source` ohms by vs(t), with a
/// resistive far-end load: Kirchhoff's laws for each series branch (L di/dt = drop - R i) and
/// each shunt node (C dv/dt = currents in - G v). The ladder is built as rungs emits it
/// (6_emit/ladder.h): pi = C/2 | L | C | ... | C/2; T = L/2 | C | L ... | C | L/2; L = (L, C) per
/// section. The near node of a T or L ladder has no capacitor, so its source resistance joins
/// the first series branch; the far node of a T ladder likewise joins the load to the last one.
struct LadderOde {
  Shape shape;
  int n;
  double l, c, r, g;  // per section
  double source, load;
  std::function<double(double)> vs;

  std::size_t size() const { return 2 * static_cast<std::size_t>(n) + 2; }

  /// x holds node voltages v[0..n] then branch currents i[0..n] (some unused per shape).
  void derivative(double t, const std::vector<double>& x, std::vector<double>& dx) const {
    const double* v = x.data();
    const double* i = x.data() + n + 1;
    double* dv = dx.data();
    double* di = dx.data() + n + 1;
    std::fill(dx.begin(), dx.end(), 0.0);
    const double u = vs(t);
    switch (shape) {
      case Shape::pi:  // nodes 0..n, branch k (1..n) from node k-1 to node k
        dv[0] = ((u - v[0]) / source - i[1] - 0.5 * g * v[0]) / (0.5 * c);
        for (int k = 1; k < n; ++k) dv[k] = (i[k] - i[k + 1] - g * v[k]) / c;
        dv[n] = (i[n] - 0.5 * g * v[n] - v[n] / load) / (0.5 * c);
        for (int k = 1; k <= n; ++k) di[k] = (v[k - 1] - v[k] - r * i[k]) / l;
        break;
      case Shape::l:  // nodes 1..n carry C; branch k (1..n) into node k; node 0 is the port
        di[1] = (u - (source + r) * i[1] - v[1]) / l;
        for (int k = 2; k <= n; ++k) di[k] = (v[k - 1] - v[k] - r * i[k]) / l;
        for (int k = 1; k < n; ++k) dv[k] = (i[k] - i[k + 1] - g * v[k]) / c;
        dv[n] = (i[n] - g * v[n] - v[n] / load) / c;
        break;
      case Shape::t:  // nodes 1..n carry C; branch 0 into node 1, k from k to k+1, n to the port
        di[0] = (u - (source + 0.5 * r) * i[0] - v[1]) / (0.5 * l);
        for (int k = 1; k < n; ++k) di[k] = (v[k] - v[k + 1] - r * i[k]) / l;
        di[n] = (v[n] - (load + 0.5 * r) * i[n]) / (0.5 * l);
        for (int k = 1; k <= n; ++k) dv[k] = (i[k - 1] - i[k] - g * v[k]) / c;
        break;
    }
  }

  double near_voltage(double t, const std::vector<double>& x) const {
    const double* i = x.data() + n + 1;
    if (shape == Shape::pi) return x[0];
    return vs(t) - source * (shape == Shape::l ? i[1] : i[0]);
  }
  double far_voltage(const std::vector<double>& x) const {
    const double* i = x.data() + n + 1;
    return shape == Shape::t ? load * i[n] : x[static_cast<std::size_t>(n)];
  }
};

/// Classical fourth-order Runge-Kutta (any numerical analysis text) from rest.
std::array<std::vector<double>, 2> integrate(const LadderOde& ode, double dt,
                                             const std::vector<double>& times) {
  std::vector<double> x(ode.size(), 0.0), k1(x.size()), k2(x.size()), k3(x.size()), k4(x.size()),
      y(x.size());
  std::array<std::vector<double>, 2> out;
  double t = 0.0;
  for (const double target : times) {
    while (t < target - 1e-6 * dt) {
      const double h = std::min(dt, target - t);
      ode.derivative(t, x, k1);
      for (std::size_t j = 0; j < x.size(); ++j) y[j] = x[j] + 0.5 * h * k1[j];
      ode.derivative(t + 0.5 * h, y, k2);
      for (std::size_t j = 0; j < x.size(); ++j) y[j] = x[j] + 0.5 * h * k2[j];
      ode.derivative(t + 0.5 * h, y, k3);
      for (std::size_t j = 0; j < x.size(); ++j) y[j] = x[j] + h * k3[j];
      ode.derivative(t + h, y, k4);
      for (std::size_t j = 0; j < x.size(); ++j)
        x[j] += h / 6.0 * (k1[j] + 2.0 * k2[j] + 2.0 * k3[j] + k4[j]);
      t += h;
    }
    out[0].push_back(ode.near_voltage(t, x));
    out[1].push_back(ode.far_voltage(x));
  }
  return out;
}

}  // namespace

TEST_CASE("ladder waveforms match a direct integration of the ladder's circuit equations") {
  const double delay = 1e-9, rise = 150e-12, window = 6e-9;
  Circuit c = single_line(delay, rise, 50.0, 100.0);
  c.lines[0].length = 0.2;
  c.lines[0].per_length.r = 50.0;  // 10 ohm in all
  c.lines[0].per_length.g = 0.01;  // 2 mS in all
  const Response exact = exact_reference(c, options(window, 5e-4));
  const int n = 8;
  for (const Shape shape : {Shape::pi, Shape::t, Shape::l}) {
    INFO("shape " << static_cast<int>(shape));
    const Response ladder = rungs::sim::frequency_response(c, {LadderSpec{n, shape}}, exact.grid,
                                                           options(window, 5e-4));
    LadderOde ode{shape,
                  n,
                  50.0 * delay / n,
                  delay / 50.0 / n,
                  10.0 / n,
                  2e-3 / n,
                  50.0,
                  100.0,
                  [&](double t) { return rungs::sim::drive_voltage(c.drives[0], c.settings, t); }};
    std::vector<double> times;
    for (std::size_t j = 0; j < ladder.t.size(); j += 16) times.push_back(ladder.t[j]);
    const auto direct = integrate(ode, 0.25e-12, times);
    double worst = 0.0;
    for (std::size_t m = 0; m < times.size(); ++m)
      for (std::size_t end = 0; end < 2; ++end)
        worst = std::max(worst, std::abs(ladder.v[0][end][16 * m] - direct[end][m]));
    // Both solve the same circuit; the inversion's corners and RK4's (dt w)^4 stay within
    // the reference's budget, 0.2 % of the 1 V swing.
    CHECK(worst < 2e-3);
    CHECK(ladder.error_estimate.estimate() < 1e-3);
  }
}

TEST_CASE("the waveform comparison measures a delayed edge and an overshoot") {
  // An edge from 0 to 1 V over 1 ns, and the same 20 ps later with a 30 mV bump after it.
  std::vector<double> t, exact, ladder;
  const auto edge = [](double s) { return s <= 0.0 ? 0.0 : s >= 1e-9 ? 1.0 : s / 1e-9; };
  for (int j = 0; j <= 5000; ++j) {
    const double tj = j * 1e-12;
    t.push_back(tj);
    exact.push_back(edge(tj - 1e-9));
    const double bump = tj > 2.1e-9 && tj < 2.4e-9 ? 0.03 : 0.0;
    ladder.push_back(edge(tj - 1.02e-9) + bump);
  }
  const WaveformError w = compare_waveforms(t, exact, ladder, 1.0);
  // A ramp of slope 1 V/ns shifted by 20 ps stands 20 mV off; the bump adds 30 mV where the
  // ramps agree (arithmetic).
  CHECK_THAT(w.error, WithinAbs(0.03, 1e-9));
  REQUIRE(w.delay_error);
  CHECK_THAT(*w.delay_error, WithinAbs(20e-12, 1e-15));
  CHECK_THAT(w.overshoot_error, WithinAbs(0.03, 1e-9));
  // Halved swing: the same waveforms err twice as much as a fraction of it.
  CHECK_THAT(compare_waveforms(t, exact, ladder, -0.5).error, WithinAbs(0.06, 1e-9));
}

TEST_CASE("the delay is measured on the first edge of a stepped waveform") {
  // A matched source's near end: half the swing when the edge leaves, the rest when the open
  // end's reflection returns (lattice diagram; practice). 50 % of the final value lies on the
  // plateau, so the delay is taken at half the first step.
  std::vector<double> t, exact, ladder;
  const auto edge = [](double s) { return s <= 0.0 ? 0.0 : s >= 0.5e-9 ? 1.0 : s / 0.5e-9; };
  for (int j = 0; j <= 6000; ++j) {
    const double tj = j * 1e-12;
    t.push_back(tj);
    exact.push_back(0.5 * edge(tj - 1e-9) + 0.5 * edge(tj - 3e-9));
    ladder.push_back(0.5 * edge(tj - 1.01e-9) + 0.5 * edge(tj - 3.03e-9));
  }
  const WaveformError w = compare_waveforms(t, exact, ladder, 1.0);
  REQUIRE(w.delay_error);
  CHECK_THAT(*w.delay_error, WithinAbs(10e-12, 1e-15));
  CHECK_THAT(w.error, WithinAbs(0.03, 1e-9));  // 30 ps at 1 V/ns on the second step
}

TEST_CASE(
    "the section counts measured outside the project meet the 2 % budget, one less does not") {
  // Measured outside the project: pi sections, a linear-ramp edge, a
  // matched source and an open end need 12 sections at delay/rise 1 and 37 at delay/rise 2
  // for a 2 % budget. At delay/rise 2, 36 sections err within 0.02 % of the budget, closer than
  // this check resolves; 35 lie clear of it.
  const double rise = 1e-9;
  const struct {
    double ratio;
    int enough;
    int too_few;
  } cases[] = {{1.0, 12, 11}, {2.0, 37, 35}};
  for (const auto& k : cases) {
    const double delay = k.ratio * rise;
    const Circuit c = single_line(delay, rise, 50.0);
    const ReferenceOptions o = options(4 * delay + 4 * rise, 5e-4);
    const Response exact = exact_reference(c, o);
    REQUIRE(exact.error_estimate.within_target);
    const LadderMeasurement good = measure_ladder_error(c, exact, {LadderSpec{k.enough, Shape::pi}}, o);
    const LadderMeasurement bad = measure_ladder_error(c, exact, {LadderSpec{k.too_few, Shape::pi}}, o);
    INFO("delay/rise " << k.ratio << ": " << good.error << " at " << k.enough << ", " << bad.error
                       << " at " << k.too_few << ", accuracy " << good.error_estimate);
    CHECK(good.error + good.error_estimate < 0.02);
    CHECK(bad.error - bad.error_estimate > 0.02);
    // The open far end sees the larger error (it carries the doubled wave).
    CHECK(good.ends.size() == 2);
    CHECK(good.ends[1].far);
    CHECK(good.line_errors[0] == good.error);
  }
}

TEST_CASE("the error measure's own accuracy estimate covers a finer run's answer") {
  const double rise = 1e-9, delay = 2e-9;
  const Circuit c = single_line(delay, rise, 50.0);
  const ReferenceOptions coarse = options(4 * delay + 4 * rise, 2e-3);
  const ReferenceOptions fine = options(4 * delay + 4 * rise, 1e-4);
  const Response e1 = exact_reference(c, coarse);
  const Response e2 = exact_reference(c, fine);
  for (const int n : {20, 36, 80}) {
    const LadderMeasurement a = measure_ladder_error(c, e1, {LadderSpec{n, Shape::pi}}, coarse);
    const LadderMeasurement b = measure_ladder_error(c, e2, {LadderSpec{n, Shape::pi}}, fine);
    INFO("n " << n << ": " << a.error << " +- " << a.error_estimate << " against " << b.error);
    CHECK(std::abs(a.error - b.error) < 1.5 * a.error_estimate + b.error_estimate);
    CHECK(a.error_estimate < 2e-3 * 1.5);
  }
}

TEST_CASE("the ladder error falls toward zero as N^(-2/3), the rate behind (delay/rise)^1.5") {
  const Circuit c = single_line(2e-9, 0.5e-9, 25.0, 200.0);
  const ReferenceOptions o = options(12e-9, 5e-4);
  const Response exact = exact_reference(c, o);
  std::vector<double> errors;
  for (const int n : {40, 160, 640}) {
    const LadderMeasurement e = measure_ladder_error(c, exact, {LadderSpec{n, Shape::t}}, o);
    INFO("n " << n << ": " << e.error);
    errors.push_back(e.error);
  }
  // A ladder of N sections of delay tau = T/N has phase N theta(w) = wT + a w^3 + ..., with
  // a = T tau^2 / 24 from theta = 2 asin(w tau / 2) (DESIGN.md, Physics). That cubic term
  // spreads a corner of the edge over the Airy time (3a)^(1/3), proportional to T N^(-2/3),
  // so the error at a corner falls as N^(-2/3) (calc); at a fixed error N then grows as
  // (delay/rise)^1.5, the growth the counts measured outside the project show. Quadrupling N
  // divides the error by 4^(2/3) = 2.52.
  for (std::size_t k = 1; k < errors.size(); ++k)
    CHECK_THAT(errors[k - 1] / errors[k],
               Catch::Matchers::WithinRel(std::pow(4.0, 2.0 / 3.0), 0.15));
  CHECK(errors.back() < 0.01);
}
