// The verified planner and the common rule against section counts at delay/rise 4 to 20 and
// the rule's errors, figures measured outside the project (the "outside measurements").
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <algorithm>
#include <cmath>
#include <vector>

#include "3_model/circuit.h"
#include "3_model/edges.h"
#include "5_plan/plan.h"
#include "5_plan/verify.h"
#include "4_sim/error_measure.h"
#include "4_sim/frequency_reference.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/input_file.h"

using rungs::model::Circuit;
using rungs::model::Shape;
using rungs::plan::LineVerdict;
using rungs::plan::Plan;
using rungs::plan::plan_verified;
using rungs::plan::verify_plan;

using rungs::testing::analytic_plan;

namespace {

constexpr double kRise = 1e-9;    // s, the drive's 10-90 % edge
constexpr double kBudget = 0.02;  // of the swing, as measured outside; the default tolerance

/// A 50 ohm line of delay `ratio` rise times, open at its far end, driven by a 0 to 1 V step
/// behind `source` ohms: the measured circuit, in pi sections with a 2 % budget.
Circuit open_line(double ratio, double source) {
  Circuit c;
  c.settings.tolerance = kBudget;
  c.settings.shape = Shape::pi;
  c.lines.push_back(rungs::testing::ideal_line("l", "a", "b", 50.0, ratio * kRise));
  c.drives.push_back(rungs::testing::step_drive("a", 0.0, 1.0, source, kRise));
  rungs::model::derive_edges(c);
  return c;
}


/// The verdict on the line cut into `sections`, the rest of `plan` as it is.
LineVerdict verdict_at(const Circuit& c, Plan plan, int sections) {
  plan.lines[0].sections = sections;
  return verify_plan(c, plan).lines[0];
}

/// The planner's N adequate and N-1 not: the planner's count is the smallest.
void check_minimal(const Circuit& c, const Plan& planned, const LineVerdict& at_n) {
  const int n = planned.lines[0].sections;
  const LineVerdict fewer = verdict_at(c, planned, n - 1);
  INFO("N = " << n << " errs " << at_n.error << "; N-1 errs " << fewer.error);
  CHECK(at_n.adequate);
  CHECK_FALSE(fewer.adequate);
}

/// The smallest count whose measured error plus the measure's accuracy is within the budget
/// (LineVerdict::adequate's definition), by trying every count from 1 on one exact reference;
/// 0 when none up to `most` is.
int smallest_adequate(const Circuit& c, const Plan& analytic, int most) {
  const rungs::sim::ReferenceOptions o = rungs::plan::reference_options(analytic);
  rungs::sim::ResponseWorkspace ws;
  const rungs::sim::Response exact = rungs::sim::exact_reference(c, o, &ws);
  REQUIRE(exact.error_estimate.within_target);
  for (int n = 1; n <= most; ++n) {
    const rungs::sim::LadderMeasurement e =
        rungs::sim::measure_ladder_error(c, exact, {rungs::sim::LadderSpec{n, Shape::pi}}, o, &ws);
    if (e.line_errors[0] + e.error_estimate <= kBudget) return n;
  }
  return 0;
}

}  // namespace

TEST_CASE("at delay/rise 4, 8 and 16 the verified planner's N meets the budget and N-1 does not") {
  // Outside measurements: a matched source and an open end need
  // 95, 264 and 736 sections at delay/rise 4, 8 and 16. Measured here: 95, 267 and 756.
  const struct {
    double ratio;
    int outside;
    double closeness;  // relative; 0 for exact equality; negative: not compared
  } cases[] = {
      {4.0, 95, 0.0},
      // 267 against 264: our budget holds with the measure's accuracy (about 0.05 % of swing,
      // a fortieth of the budget) added to the error, which near the budget falls about as
      // N^(-2/3), so it may take up to 4 % more sections than the error alone (257 here).
      {8.0, 264, 0.05},
      // 756 against 736. The error is not monotonic in N here: 756-777 pass, 778-829 fail,
      // 830 on pass; the search brackets 550 (fails) to 1100 (passes) and bisects to 830, and
      // only its look at twelve counts over the quarter below finds the band that passes.
      {16.0, 736, 0.05},
  };
  for (const auto& k : cases) {
    const Circuit c = open_line(k.ratio, 50.0);
    const auto [planned, verdict] = plan_verified(c, analytic_plan(c));
    const int n = planned.lines[0].sections;
    INFO("delay/rise " << k.ratio << ": N = " << n << ", measured outside " << k.outside);
    REQUIRE(verdict.reference_within_target);
    check_minimal(c, planned, verdict.lines[0]);
    if (k.closeness == 0.0) CHECK(n == k.outside);  // outside measurements
    if (k.closeness > 0.0)
      CHECK(n == Approx(k.outside).epsilon(k.closeness));  // outside measurements
    // Common practice (a tenth of the rise per section): 40, 80 and 160.
    CHECK(planned.lines[0].rule_sections == static_cast<int>(10.0 * k.ratio));
  }
}

TEST_CASE("the smallest adequate counts at delay/rise 4, 8 and 16 are the outside measurements'",
          "[slow]") {
  // Outside measurements: 95, 264 and 736 sections, growing as
  // (delay/rise)^1.5. Every count from 1 up is tried, so this is the smallest count that
  // meets the budget, whatever the planner's search does. Measured: 95, 267 and 756.
  const struct {
    double ratio;
    int outside;
    double closeness;  // relative; 0 for exact equality
  } cases[] = {{4.0, 95, 0.0}, {8.0, 264, 0.05}, {16.0, 736, 0.05}};  // 5 %: as above
  std::vector<int> smallest;
  for (const auto& k : cases) {
    const Circuit c = open_line(k.ratio, 50.0);
    const Plan analytic = analytic_plan(c);
    const int m = smallest_adequate(c, analytic, 2 * k.outside);
    REQUIRE(m > 0);
    INFO("delay/rise " << k.ratio << ": smallest adequate " << m << ", measured outside "
                       << k.outside);
    if (k.closeness == 0.0)
      CHECK(m == k.outside);  // outside measurements
    else
      CHECK(m == Approx(k.outside).epsilon(k.closeness));  // outside measurements
    // The project's own verdict agrees that m is where the budget is first met.
    CHECK(verdict_at(c, analytic, m).adequate);
    CHECK_FALSE(verdict_at(c, analytic, m - 1).adequate);
    smallest.push_back(m);
  }
  // Outside measurements: the count grows as (delay/rise)^1.5. Their 95 and 736 give 1.48;
  // measured 1.50 from 95 and 756.
  const double exponent = std::log(static_cast<double>(smallest[2]) / smallest[0]) / std::log(4.0);
  CHECK(exponent == Approx(1.5).margin(0.05));
}

TEST_CASE("a 10 ohm source into an open line at delay/rise 20 needs about 2300 sections",
          "[slow]") {
  // Outside measurements: "about 2,300" against the rule's 200.
  // Measured: N = 2343. The band is 5 %: "about" read to two figures (+-50, 2.2 %) plus the
  // few % our accuracy margin may add (see above). Every count from 1 up, tried outside this
  // test (two minutes): the error alone first meets the budget at 2148, with the margin at
  // 2343, so the planner's count is the smallest here.
  const Circuit c = open_line(20.0, 10.0);
  const auto [planned, verdict] = plan_verified(c, analytic_plan(c));
  const int n = planned.lines[0].sections;
  INFO("N = " << n);
  REQUIRE(verdict.reference_within_target);
  check_minimal(c, planned, verdict.lines[0]);
  CHECK(n == Approx(2300).epsilon(0.05));  // outside measurements
  // Common practice (a tenth of the rise per section) gives 200, far short.
  CHECK(planned.lines[0].rule_sections == 200);
  CHECK(verdict.lines[0].rule_error > kBudget);
}

TEST_CASE("the common rule's errors over the measured cases start at 2 % of the swing") {
  // Outside measurements: across a wider set of terminations,
  // the counts of the common rule (common practice: a tenth of the rise per section) err by 2 %
  // to 12 % of the swing. The set here is their own cases. Measured rule errors:
  // matched source, open end, delay/rise 1, 2, 4, 8, 16: 2.13, 2.77, 3.45, 4.47, 6.69 %;
  // 10 ohm source, open end, delay/rise 20: 10.09 %. The smallest (2.13 %, matched source at
  // delay/rise 1) reproduces their 2 %; the largest (10.09 %, the 10 ohm source)
  // does not reproduce their 12 %, so that end is held only as a bound. Other terminations do
  // not close the gap: at delay/rise 1 to 20, a matched source into a short errs 1.46-3.79 %,
  // into a matched load 1.14-3.35 %, into 1 pF 1.79-5.74 %, both ends below theirs;
  // a 10 ohm source into an open end errs 4.38-11.17 % (the largest at delay/rise 16).
  const struct {
    double ratio;
    double source;
  } cases[] = {{1.0, 50.0}, {2.0, 50.0}, {4.0, 50.0}, {8.0, 50.0}, {16.0, 50.0}, {20.0, 10.0}};
  std::vector<double> errors;
  for (const auto& k : cases) {
    const Circuit c = open_line(k.ratio, k.source);
    const rungs::plan::Verification v = verify_plan(c, analytic_plan(c));
    REQUIRE(v.reference_within_target);
    errors.push_back(v.lines[0].rule_error);
    INFO("delay/rise " << k.ratio << ", source " << k.source << " ohm: rule errs "
                       << errors.back());
    // Outside measurements: every case within 2 % to 12 %, give or take 0.3 % of the swing.
    CHECK(errors.back() >= 0.02 - 0.003);
    CHECK(errors.back() <= 0.12 + 0.003);
  }
  // Outside measurements: the smallest rule error is 2 %, within 0.3 % of the swing.
  CHECK(*std::min_element(errors.begin(), errors.end()) == Approx(0.02).margin(0.003));
}
