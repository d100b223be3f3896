// The verified planner: the smallest section counts that meet the budget, measured against the
// exact reference.
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <string>

#include "3_model/circuit.h"
#include "3_model/edges.h"
#include "5_plan/plan.h"
#include "5_plan/verify.h"
#include "4_sim/error_measure.h"
#include "4_sim/frequency_reference.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/input_file.h"

using rungs::model::Circuit;
using rungs::model::Drive;
using rungs::model::ElementKind;
using rungs::model::Line;
using rungs::model::Load;
using rungs::model::NetworkKind;
using rungs::model::Shape;
using rungs::model::WaveKind;
using rungs::plan::Plan;
using rungs::plan::plan_verified;
using rungs::plan::Verification;
using rungs::plan::verify_plan;

using rungs::testing::ideal_line;
using rungs::testing::step_drive;

using rungs::testing::analytic_plan;

namespace {


/// A 0 to 1 V step behind `source` ohms at node "a", with a 10-90 % edge of `rise`.
Drive drive(double rise, double source) { return step_drive("a", 0.0, 1.0, source, rise); }

Line line(const std::string& name, const std::string& near, const std::string& far, double z0,
          double delay) {
  return ideal_line(name, near, far, z0, delay);
}


}  // namespace

TEST_CASE("the verified planner finds the counts measured outside the project, one less fails") {
  // Measured outside the project: pi sections, a linear-ramp edge, a
  // matched source and an open end need 12 sections at delay/rise 1 and 37 at delay/rise 2
  // for a 2 % budget. The planner counts a ladder adequate when its error plus the measure's
  // own accuracy is within the budget.
  const double rise = 1e-9;
  const struct {
    double ratio;
    int expected;
  } cases[] = {{1.0, 12}, {2.0, 37}};
  for (const auto& k : cases) {
    Circuit c;
    c.lines.push_back(line("l", "a", "b", 50.0, k.ratio * rise));
    c.drives.push_back(drive(rise, 50.0));
    rungs::model::derive_edges(c);
    const Plan analytic = analytic_plan(c);
    const auto [plan, verdict] = plan_verified(c, analytic);
    INFO("delay/rise " << k.ratio << ": analytic " << analytic.lines[0].sections << ", verified "
                       << plan.lines[0].sections << " erring " << verdict.lines[0].error
                       << " +- " << verdict.error_estimate);
    CHECK(plan.lines[0].sections == k.expected);
    CHECK(verdict.reference_within_target);
    CHECK(verdict.lines[0].adequate);
    CHECK(verdict.lines[0].error + verdict.error_estimate <= 0.02);
    // The figures that follow from the count follow the new one (the plan's own formulas).
    CHECK(plan.lines[0].section_l == Approx(50.0 * k.ratio * rise / k.expected));
    CHECK(plan.elements ==
          rungs::plan::ladder_elements(k.expected, Shape::pi, false, false));

    Plan fewer = plan;
    fewer.lines[0].sections = k.expected - 1;
    const Verification less = verify_plan(c, fewer);
    INFO("one less errs " << less.lines[0].error << " +- " << less.error_estimate);
    CHECK_FALSE(less.lines[0].adequate);
    // The search also looks two below its answer (the error need not fall monotonically).
    fewer.lines[0].sections = k.expected - 2;
    CHECK_FALSE(verify_plan(c, fewer).lines[0].adequate);
    // The common rule (a tenth of the rise per section; practice) gives 10 and 20 here, both
    // short of the budget.
    CHECK(plan.lines[0].rule_sections == static_cast<int>(10 * k.ratio));
    CHECK(verdict.lines[0].rule_error > 0.02);
  }
}

TEST_CASE("sections= is verified, not changed") {
  // 5 sections at delay/rise 1 fall well short of the 12 measured outside the project.
  Circuit c;
  c.lines.push_back(line("l", "a", "b", 50.0, 1e-9));
  c.lines[0].sections = 5;
  c.drives.push_back(drive(1e-9, 50.0));
  rungs::model::derive_edges(c);
  const Plan analytic = analytic_plan(c);
  REQUIRE(analytic.lines[0].fixed);
  const auto [plan, verdict] = plan_verified(c, analytic);
  CHECK(plan.lines[0].sections == 5);
  CHECK(plan.lines[0].elements == analytic.lines[0].elements);
  CHECK_FALSE(verdict.lines[0].adequate);
  CHECK(verdict.lines[0].error > 0.02);
  REQUIRE(verdict.lines[0].delay_error);
}

TEST_CASE("a two-line cascade planned together meets the budget at every end") {
  // A matched 50 ohm source into a 1 ns 50 ohm line, then a 0.7 ns 75 ohm line into 100 ohm:
  // the junction reflects (Gamma = 0.2) and so does the load (Gamma = 1/7), so each line's
  // ladder shapes the waves the other sees (lattice diagram).
  Circuit c;
  c.lines.push_back(line("first", "a", "m", 50.0, 1e-9));
  c.lines.push_back(line("second", "m", "b", 75.0, 0.7e-9));
  c.drives.push_back(drive(0.8e-9, 50.0));
  Load ld;
  ld.node = std::string("b");
  ld.network.kind = NetworkKind::single;
  ld.network.element = ElementKind::resistor;
  ld.network.value = 100.0;
  c.loads.push_back(ld);
  rungs::model::derive_edges(c);
  const Plan analytic = analytic_plan(c);
  const auto [plan, verdict] = plan_verified(c, analytic);
  REQUIRE(verdict.lines.size() == 2);
  for (std::size_t k = 0; k < 2; ++k) {
    INFO("line " << k << ": " << plan.lines[k].sections << " sections erring "
                 << verdict.lines[k].error << " +- " << verdict.error_estimate);
    CHECK(verdict.lines[k].adequate);
  }
  // Measured afresh, every end of the circuit with both ladders in place is within 2 %.
  rungs::sim::ReferenceOptions o;
  o.window = plan.window;
  o.target = 0.02 / 20.0;
  const rungs::sim::Response exact = rungs::sim::exact_reference(c, o);
  const rungs::sim::LadderMeasurement e = rungs::sim::measure_ladder_error(
      c, exact,
      {rungs::sim::LadderSpec{plan.lines[0].sections, Shape::pi},
       rungs::sim::LadderSpec{plan.lines[1].sections, Shape::pi}},
      o);
  REQUIRE(e.ends.size() == 4);
  for (const auto& end : e.ends) {
    INFO("end " << end.node << ": " << end.worst.error);
    CHECK(end.worst.error + e.error_estimate <= 0.02);
  }
}
