// The verified planner: measured section counts.
#include "plan/verify.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <stdexcept>

#include "physics/resolve.h"
#include "plan/ladder_error.h"
#include "sim/error_measure.h"
#include "sim/frequency_reference.h"

namespace rungs::plan {

using sim::LadderSpec;

sim::ReferenceOptions reference_options(const Plan& plan) {
  double tolerance = std::numeric_limits<double>::infinity();
  for (const LinePlan& lp : plan.lines)
    if (lp.tolerance > 0.0) tolerance = std::min(tolerance, lp.tolerance);
  if (!std::isfinite(tolerance)) tolerance = 0.02;
  sim::ReferenceOptions o;
  o.window = plan.window;
  o.target = tolerance / 20.0;
  return o;
}

std::vector<LadderSpec> ladder_specs(const Plan& plan, bool rule) {
  std::vector<LadderSpec> out;
  for (const LinePlan& lp : plan.lines)
    out.push_back(LadderSpec{std::max(1, rule ? lp.rule_sections : lp.sections), lp.shape});
  return out;
}

namespace {

bool meets(double error, double accuracy, double tolerance) {
  return error + accuracy <= tolerance;
}

/// The largest error at any line end of the circuit, with the lines that have a ladder in
/// `ladders` cut and the rest exact, and the figure's estimated accuracy (as
/// sim::measure_ladder_error computes both, which takes every line as a ladder).
struct Measured {
  double error = 0.0;
  double accuracy = 0.0;
};

Measured measure_partial(const physics::Circuit& circuit, const sim::Response& exact,
                         const std::vector<std::optional<LadderSpec>>& ladders,
                         const sim::ReferenceOptions& options, sim::ResponseWorkspace& ws) {
  const sim::Response lad = sim::frequency_response(circuit, ladders, exact.grid, options, &ws);
  Measured m;
  std::vector<std::size_t> nodes;
  for (const physics::Line& line : circuit.lines)
    for (const std::string* name : {&line.near, &line.far}) {
      if (physics::is_ground(*name)) continue;
      if (auto i = exact.node_index(*name)) nodes.push_back(*i);
    }
  std::sort(nodes.begin(), nodes.end());
  nodes.erase(std::unique(nodes.begin(), nodes.end()), nodes.end());
  double trunc_worst = 0.0;
  for (const std::size_t i : nodes)
    for (std::size_t c = 0; c < exact.sources.size(); ++c) {
      const double swing = exact.sources[c].swing;
      if (!(std::abs(swing) > 0.0)) continue;
      m.error = std::max(
          m.error, sim::compare_waveforms(exact.t, exact.v[c][i], lad.v[c][i], swing).error);
      double trunc = 0.0;
      for (std::size_t j = 0; j < exact.coarse[c][i].size(); ++j) {
        const double fine = lad.v[c][i][2 * j] - exact.v[c][i][2 * j];
        const double coarse = lad.coarse[c][i][j] - exact.coarse[c][i][j];
        trunc = std::max(trunc, std::abs(fine - coarse));
      }
      trunc_worst = std::max(trunc_worst, trunc / std::abs(swing));
    }
  m.accuracy = trunc_worst + exact.accuracy.aliasing + lad.accuracy.aliasing;
  return m;
}


Verification verify_against(const physics::Circuit& circuit, const Plan& plan,
                            const sim::Response& exact, const sim::ReferenceOptions& o,
                            sim::ResponseWorkspace& ws) {
  const sim::LadderError planned = sim::measure_ladder_error(circuit, exact, ladder_specs(plan, false), o, &ws);
  const sim::LadderError rule = sim::measure_ladder_error(circuit, exact, ladder_specs(plan, true), o, &ws);
  Verification v;
  v.accuracy = planned.accuracy;
  v.reference_within_target = exact.accuracy.within_target;
  v.lines.resize(circuit.lines.size());
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    LineVerdict& lv = v.lines[k];
    lv.error = planned.line_errors[k];
    lv.rule_error = rule.line_errors[k];
    lv.adequate = meets(lv.error, planned.accuracy, plan.lines[k].tolerance);
  }
  for (const sim::EndError& end : planned.ends) {
    LineVerdict& lv = v.lines[end.line];
    if (end.worst.delay_error &&
        (!lv.delay_error || std::abs(*end.worst.delay_error) > std::abs(*lv.delay_error)))
      lv.delay_error = end.worst.delay_error;
    if (std::abs(end.worst.overshoot_error) > std::abs(lv.overshoot_error))
      lv.overshoot_error = end.worst.overshoot_error;
  }
  return v;
}

/// The smallest passing N of one line with the others exact (see plan_verified).
int search_line(const physics::Circuit& circuit, const sim::Response& exact,
                const sim::ReferenceOptions& o, sim::ResponseWorkspace& ws, std::size_t k,
                const LinePlan& lp) {
  std::map<int, bool> seen;
  const auto passes = [&](int n) {
    auto it = seen.find(n);
    if (it != seen.end()) return it->second;
    std::vector<std::optional<LadderSpec>> ladders(circuit.lines.size());
    ladders[k] = LadderSpec{n, lp.shape};
    const Measured m = measure_partial(circuit, exact, ladders, o, ws);
    return seen[n] = meets(m.error, m.accuracy, lp.tolerance);
  };
  const int start = std::clamp(lp.sections, 1, kVerifiedMaxSections);
  int lo = 0, hi = 0;  // lo fails (0: none known), hi passes
  if (passes(start)) {
    hi = start;
    while (hi > 1) {
      const int down = hi / 2;
      if (!passes(down)) {
        lo = down;
        break;
      }
      hi = down;
    }
  } else {
    lo = start;
    for (;;) {
      if (lo >= kVerifiedMaxSections) return kVerifiedMaxSections;
      const int up = static_cast<int>(std::min<long long>(2LL * lo, kVerifiedMaxSections));
      if (passes(up)) {
        hi = up;
        break;
      }
      lo = up;
    }
  }
  for (;;) {
    while (hi - lo > 1) {
      const int mid = lo + (hi - lo) / 2;
      (passes(mid) ? hi : lo) = mid;
    }
    // Not monotonic everywhere: look two below the answer before taking it.
    if (hi - 1 >= 1 && passes(hi - 1)) {
      hi = hi - 1;
    } else if (hi - 2 >= 1 && passes(hi - 2)) {
      hi = hi - 2;
    } else {
      return hi;
    }
    lo = 0;
    // A new passing count below: bracket again downward from it.
    while (hi > 1) {
      const int down = hi - std::max(1, hi / 8);
      if (!passes(down)) {
        lo = down;
        break;
      }
      hi = down;
    }
  }
}

}  // namespace

Verification verify_plan(const physics::Circuit& circuit, const Plan& plan) {
  if (plan.lines.size() != circuit.lines.size())
    throw std::invalid_argument("the plan is not of this circuit");
  const sim::ReferenceOptions o = reference_options(plan);
  sim::ResponseWorkspace ws;
  const sim::Response exact = sim::exact_reference(circuit, o, &ws);
  return verify_against(circuit, plan, exact, o, ws);
}

std::pair<Plan, Verification> plan_verified(const physics::Circuit& circuit,
                                            const Plan& analytic) {
  if (analytic.lines.size() != circuit.lines.size())
    throw std::invalid_argument("the plan is not of this circuit");
  Plan plan = analytic;
  const sim::ReferenceOptions o = reference_options(plan);
  sim::ResponseWorkspace ws;
  const sim::Response exact = sim::exact_reference(circuit, o, &ws);

  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    LinePlan& lp = plan.lines[k];
    if (lp.fixed || !(lp.rise > 0.0)) continue;
    set_sections(circuit.lines[k], lp, search_line(circuit, exact, o, ws, k, lp));
  }

  // Together: a line may pass alone and fail beside the others' ladders.
  Verification v = verify_against(circuit, plan, exact, o, ws);
  for (int round = 0; round < 32; ++round) {
    bool raised = false;
    for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
      LinePlan& lp = plan.lines[k];
      if (v.lines[k].adequate || lp.fixed || !(lp.rise > 0.0) ||
          lp.sections >= kVerifiedMaxSections)
        continue;
      set_sections(circuit.lines[k], lp,
                   std::min(kVerifiedMaxSections, lp.sections + std::max(1, lp.sections / 8)));
      raised = true;
    }
    if (!raised) break;
    v = verify_against(circuit, plan, exact, o, ws);
  }

  plan.elements = 0;
  double shortest_section = std::numeric_limits<double>::infinity();
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    plan.elements += plan.lines[k].elements;
    if (plan.lines[k].sections > 0)
      shortest_section =
          std::min(shortest_section, circuit.lines[k].delay / plan.lines[k].sections);
  }
  double shortest_ramp = std::numeric_limits<double>::infinity();
  for (const physics::Drive& d : circuit.drives) {
    const double rise = d.rise.value_or(circuit.settings.rise.value_or(0.0));
    if (rise > 0.0) shortest_ramp = std::min(shortest_ramp, rise / 0.8);
  }
  // As plan_circuit: the step resolves the fastest ramp and one section's delay.
  const double step = std::min(shortest_ramp / 40.0, shortest_section / 8.0);
  if (std::isfinite(step)) plan.time_step = step;
  return {plan, v};
}

}  // namespace rungs::plan
