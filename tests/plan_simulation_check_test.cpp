// Comparing a simulator's run with the check's waveforms: the grid it is measured on, the
// split of its error, which part is over, and the advice the report gives.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

#include "5_plan/simulation_check.h"
#include "7_report/simulation_report.h"
#include "circuit_builders.h"

using namespace rungs;
using rungs::testing::ideal_line;

namespace {

/// One line a -> b with a 2 % budget, and its plan.
struct Case {
  model::Circuit circuit;
  plan::Plan plan;
  Case() {
    circuit.name = "case";
    circuit.lines.push_back(ideal_line("t", "a", "b", 50.0, 1e-9));
    plan.lines.resize(1);
    plan.lines[0].tolerance = 0.02;
    plan.lines[0].sections = 10;
    plan.time_step = 100e-12;
  }
};

/// The check's traces at b on a uniform grid of 1 ns: exact 0.1 V/ns, the ladder the same with
/// a bump of `bump` V at 4 ns; swing 1 V.
plan::EndTraces traces_at_b(double bump) {
  plan::EndTraces e{.node = "b", .t = {}, .exact = {}, .ladder = {}, .swing = 1.0};
  for (int j = 0; j <= 10; ++j) {
    e.t.push_back(j * 1e-9);
    e.exact.push_back(0.1 * j);
    e.ladder.push_back(0.1 * j + (j == 4 ? bump : 0.0));
  }
  return e;
}

/// A simulator's plot of b at uneven times, `v(t)` at each.
sim::RawPlot plot_of(const std::vector<double>& t, double (*v)(double)) {
  sim::RawPlot plot;
  plot.name = "Transient Analysis";
  plot.variables = {"time", "V(B)"};
  plot.values = {t, {}};
  for (const double x : t) plot.values[1].push_back(v(x));
  return plot;
}

double ramp(double t) {
  return 0.1 * t * 1e9;
}
double ramp_with_spike(double t) {
  return ramp(t) + (std::abs(t - 7.5e-9) < 1e-15 ? 0.03 : 0.0);
}

const std::vector<double> kUneven = {0.0, 0.3e-9, 2.5e-9, 3.1e-9, 6e-9, 7.5e-9, 8.5e-9, 10e-9};

}  // namespace

TEST_CASE("a simulated waveform is interpolated onto the reference's grid and split in two") {
  const Case c;
  const std::vector<plan::EndTraces> traces = {traces_at_b(0.005)};
  // The simulator follows the exact ramp at its own uneven points: interpolated linearly onto
  // the 1 ns grid it is the ramp itself, so it errs nothing against the exact line, and what it
  // adds to the ladder is minus the ladder's own bump.
  const auto ends = plan::compare_simulation(c.circuit, c.plan, traces, plot_of(kUneven, ramp));
  REQUIRE(ends.size() == 1);
  CHECK(ends[0].node == "b");
  CHECK(ends[0].simulated_error == Approx(0.0).margin(1e-15));
  CHECK(ends[0].ladder_error == Approx(0.005));
  CHECK(ends[0].simulation_error == Approx(0.005));
  CHECK(ends[0].simulation_at == Approx(4e-9));
  CHECK(ends[0].budget == 0.02);
  CHECK(plan::verdict_of(ends[0]) == plan::SimulationVerdict::within);

  // A spike of 30 mV at the simulator's point 7.5 ns, between the grid's 7 and 8 ns: it counts
  // through the straight lines to its neighbours, 2/3 of it at 7 ns (1 ns of the 1.5 ns from
  // 6 ns) and 1/2 at 8 ns.
  const auto spiked =
      plan::compare_simulation(c.circuit, c.plan, traces, plot_of(kUneven, ramp_with_spike));
  CHECK(spiked[0].simulated_error == Approx(0.02));
  CHECK(spiked[0].simulation_error == Approx(0.02));
  CHECK(spiked[0].simulation_at == Approx(7e-9));
}

TEST_CASE("which part of a simulated error is over, and the advice for each") {
  const Case c;
  plan::SimulatedEnd end;
  end.node = "b";
  end.budget = 0.02;
  end.simulated_error = 0.019;
  end.ladder_error = 0.018;
  end.simulation_error = 0.004;
  CHECK(plan::verdict_of(end) == plan::SimulationVerdict::within);
  CHECK(report::simulation_failures(c.circuit, c.plan, {end}).empty());

  end.simulated_error = 0.021;  // over, with the simulation within its 0.5 % share
  CHECK(plan::verdict_of(end) == plan::SimulationVerdict::ladder_over);
  CHECK(report::simulation_failures(c.circuit, c.plan, {end}) ==
        std::vector<std::string>{
            "node b: the simulated deck errs 2.1 % of the swing, over its 2 % budget (the "
            "ladder's own error 1.8 %, the simulation's 0.4 % at 0 ns); the ladder leaves the "
            "simulation less than its share of 0.5 %: more sections: give t tolerance=1.5%"});

  // An estimated ladder that is over the budget on its own is told to be measured instead.
  plan::SimulatedEnd alone = end;
  alone.ladder_error = 0.025;
  alone.simulated_error = 0.026;
  CHECK(report::simulation_failures(c.circuit, c.plan, {alone})
            .front()
            .find("; the ladder alone is over the budget: more sections: plan without --analytic, "
                  "which measures the counts") != std::string::npos);
  Case measured;
  measured.plan.measured = true;
  CHECK(report::simulation_failures(measured.circuit, measured.plan, {alone})
            .front()
            .find("more sections: give t tolerance=1.5%") != std::string::npos);

  end.simulation_error = 0.007;  // over its share of 0.25 x 2 %
  end.simulation_at = 12.5e-9;
  CHECK(plan::verdict_of(end) == plan::SimulationVerdict::simulation_over);
  // A step that would bring 0.7 % to the 0.5 % share if the error fell only as fast as the
  // step, with a margin of 0.8: 0.8 x 100 ps x 0.5/0.7 = 57.1 ps, cut to two figures.
  CHECK(plan::suggested_step(end, 100e-12) == Approx(57e-12));
  CHECK(report::simulation_failures(c.circuit, c.plan, {end}) ==
        std::vector<std::string>{
            "node b: the simulated deck errs 2.1 % of the swing, over its 2 % budget (the "
            "ladder's own error 1.8 %, the simulation's 0.7 % at 12.5 ns); the simulation is "
            "over its share of 0.5 %: write set step 57ps in the description (the deck's "
            "maximum step is 100ps)"});
  Case gear;
  gear.circuit.settings.method = model::IntegrationMethod::gear;
  CHECK(report::simulation_failures(gear.circuit, gear.plan, {end})
            .front()
            .find("(the deck's maximum step is 100ps), or set method trap, which errs less at the "
                  "same step") != std::string::npos);
}

TEST_CASE("times are written as the description language takes them") {
  CHECK(report::time_setting(5.1e-12) == "5.1ps");
  CHECK(report::time_setting(1.3e-11) == "13ps");
  CHECK(report::time_setting(2e-9) == "2ns");
  CHECK(report::time_setting(7.5e-13) == "750fs");
  CHECK(report::time_setting(4.4e-6) == "4.4us");
}

TEST_CASE("a plot that lacks a saved node, or its time, cannot be compared") {
  const Case c;
  const std::vector<plan::EndTraces> traces = {traces_at_b(0.0)};
  sim::RawPlot no_b = plot_of(kUneven, ramp);
  no_b.variables[1] = "v(c)";
  CHECK_THROWS_WITH(plan::compare_simulation(c.circuit, c.plan, traces, no_b),
                    "the simulator's results hold no v(b), which the deck saves");
  sim::RawPlot no_time = plot_of(kUneven, ramp);
  no_time.variables[0] = "frequency";
  CHECK_THROWS_WITH(plan::compare_simulation(c.circuit, c.plan, traces, no_time),
                    "the simulator's plot 'Transient Analysis' has no time points");
}

TEST_CASE("the charts' traces take the simulator's waveform on their own grid") {
  plan::PlanCurves curves;
  plan::NodeTraces b;
  b.node = "b";
  b.t = {0.0, 1e-9, 2e-9};
  curves.loads.push_back(b);
  plan::add_simulated(curves, plot_of(kUneven, ramp));
  REQUIRE(curves.loads[0].simulated.size() == 3);
  for (std::size_t j = 0; j < 3; ++j)
    CHECK(curves.loads[0].simulated[j] == Approx(ramp(b.t[j])).margin(1e-15));
}
