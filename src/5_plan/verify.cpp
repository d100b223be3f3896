// The verified planner: measured section counts.
#include "5_plan/verify.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <memory>
#include <mutex>
#include <numeric>

#include "1_syntax/invariant.h"
#include "3_model/circuit.h"
#include "5_plan/error_estimate.h"
#include "4_sim/error_measure.h"
#include "4_sim/frequency_reference.h"

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
  o.closing = plan.closing;
  return o;
}

std::vector<LadderSpec> ladder_specs(const Plan& plan, bool rule) {
  std::vector<LadderSpec> out;
  for (const LinePlan& lp : plan.lines)
    out.push_back(LadderSpec{std::max(1, rule ? lp.rule_sections : lp.sections), lp.shape});
  return out;
}

namespace {

/// Calls f(item, workspace) for every item on the pool. Each call has a workspace that no other
/// running call has, kept for a later item because building one costs about a sweep; throws as
/// ThreadPool::for_each does.
template <class F>
void for_each_item(ThreadPool& pool, const std::vector<std::size_t>& items, F&& f) {
  std::mutex spare_lock;
  std::vector<std::unique_ptr<sim::ResponseWorkspace>> spare;
  pool.for_each(items.size(), [&](std::size_t i) {
    std::unique_ptr<sim::ResponseWorkspace> ws;
    {
      const std::lock_guard<std::mutex> hold(spare_lock);
      if (!spare.empty()) {
        ws = std::move(spare.back());
        spare.pop_back();
      }
    }
    if (!ws) ws = std::make_unique<sim::ResponseWorkspace>();
    f(items[i], *ws);
    const std::lock_guard<std::mutex> hold(spare_lock);
    spare.push_back(std::move(ws));
  });
}

bool meets(double error, double error_estimate, double tolerance) {
  return error + error_estimate <= tolerance;
}

/// The errors at the line ends of the circuit, with the lines that have a ladder in `ladders`
/// cut and the rest exact, and the figures' error estimate (as
/// sim::measure_ladder_error computes both, which takes every line as a ladder).
struct PartialErrors {
  std::vector<double> line_errors;  // per line: the larger of its two ends
  double error = 0.0;               // the largest of all
  double error_estimate = 0.0;
};

PartialErrors measure_partial(const model::Circuit& circuit, const sim::Response& exact,
                         const std::vector<std::optional<LadderSpec>>& ladders,
                         const sim::ReferenceOptions& options, sim::ResponseWorkspace& ws) {
  const sim::Response lad = sim::frequency_response(circuit, ladders, exact.grid, options, &ws);
  PartialErrors m;
  std::vector<double> node_error(exact.nodes.size(), -1.0);  // -1: not a line end
  for (const model::Line& line : circuit.lines)
    for (const std::string* name : {&line.near, &line.far}) {
      if (model::is_ground(*name)) continue;
      if (auto i = exact.node_index(*name)) node_error[*i] = 0.0;
    }
  double trunc_worst = 0.0;
  for (std::size_t i = 0; i < node_error.size(); ++i) {
    if (node_error[i] < 0.0) continue;
    for (std::size_t c = 0; c < exact.excitations.size(); ++c) {
      const double swing = exact.excitations[c].swing;
      if (!(std::abs(swing) > 0.0)) continue;
      node_error[i] = std::max(
          node_error[i], sim::compare_waveforms(exact.t, exact.v[c][i], lad.v[c][i], swing).error);
      double trunc = 0.0;
      for (std::size_t j = 0; j < exact.coarse[c][i].size(); ++j) {
        const double fine = lad.v[c][i][2 * j] - exact.v[c][i][2 * j];
        const double coarse = lad.coarse[c][i][j] - exact.coarse[c][i][j];
        trunc = std::max(trunc, std::abs(fine - coarse));
      }
      trunc_worst = std::max(trunc_worst, trunc / std::abs(swing));
    }
  }
  for (const model::Line& line : circuit.lines) {
    double e = 0.0;
    for (const std::string* name : {&line.near, &line.far})
      if (auto i = exact.node_index(*name); i && !model::is_ground(*name))
        e = std::max(e, node_error[*i]);
    m.line_errors.push_back(e);
    m.error = std::max(m.error, e);
  }
  m.error_estimate = trunc_worst + exact.error_estimate.aliasing + lad.error_estimate.aliasing;
  return m;
}

Verification verify_against(const model::Circuit& circuit, const Plan& plan,
                            const sim::Response& exact, const sim::ReferenceOptions& o,
                            sim::ResponseWorkspace& ws, bool with_rule = true,
                            bool keep_end_traces = false) {
  const sim::LadderMeasurement planned =
      sim::measure_ladder_error(circuit, exact, ladder_specs(plan, false), o, &ws);
  const sim::LadderMeasurement rule =
      with_rule ? sim::measure_ladder_error(circuit, exact, ladder_specs(plan, true), o, &ws)
                : planned;
  Verification v;
  v.error_estimate = planned.error_estimate;
  v.reference_within_target = exact.error_estimate.within_target;
  if (keep_end_traces) v.end_traces = end_traces(circuit, exact, planned.ladder);
  v.lines.resize(circuit.lines.size());
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    LineVerdict& lv = v.lines[k];
    lv.error = planned.line_errors[k];
    lv.rule_error = rule.line_errors[k];
    lv.adequate = meets(lv.error, planned.error_estimate, plan.lines[k].tolerance);
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
/// One line's measured counts, kept across searches: N -> error + error estimate, that line alone a
/// ladder (the rest exact), so a search at a tighter budget only measures counts not yet seen.
using ErrorsByCount = std::map<int, double>;

int search_line(const model::Circuit& circuit, const sim::Response& exact,
                const sim::ReferenceOptions& o, sim::ResponseWorkspace& ws, std::size_t k,
                const LinePlan& lp, double budget, ErrorsByCount& seen, bool scan) {
  const auto passes = [&](int n) {
    auto it = seen.find(n);
    if (it == seen.end()) {
      std::vector<std::optional<LadderSpec>> ladders(circuit.lines.size());
      ladders[k] = LadderSpec{n, lp.shape};
      const PartialErrors m = measure_partial(circuit, exact, ladders, o, ws);
      it = seen.emplace(n, m.error + m.error_estimate).first;
    }
    return it->second <= budget;
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
    // Not monotonic everywhere: look two below the answer, then at twelve counts spread over
    // the quarter below it (a band that passes below a band that fails is a few per cent of N
    // wide where it was seen), before taking it.
    int below = 0;
    if (hi - 1 >= 1 && passes(hi - 1)) below = hi - 1;
    else if (hi - 2 >= 1 && passes(hi - 2)) below = hi - 2;
    const int stride = std::max(1, hi / 48);
    for (int step = 1; scan && below == 0 && step <= 12 && hi - step * stride >= 1; ++step)
      if (passes(hi - step * stride)) below = hi - step * stride;
    if (below == 0) return hi;
    hi = below;
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


void closing_voltages_on(const model::Circuit& circuit, Plan& plan,
                         const sim::LaplaceGrid& grid, sim::ResponseWorkspace& ws) {
  plan.closing_voltage.assign(circuit.loads.size(), 0.0);
  if (std::none_of(plan.closing.begin(), plan.closing.end(), [](double c) { return c > 0.0; }))
    return;
  const std::vector<LadderSpec> specs = ladder_specs(plan);
  const std::vector<std::optional<LadderSpec>> ladders(specs.begin(), specs.end());
  const sim::Response r =
      sim::frequency_response(circuit, ladders, grid, reference_options(plan), &ws);
  for (std::size_t i = 0; i < r.switch_voltages.size(); ++i)
    plan.closing_voltage[r.switches[i].load] = r.switch_voltages[i];
}

Verification verify_part(const model::Circuit& circuit, const Plan& plan,
                         const VerifyOptions& options) {
  const sim::ReferenceOptions o = reference_options(plan);
  sim::ResponseWorkspace ws;
  const sim::Response exact = sim::exact_reference(circuit, o, &ws);
  return verify_against(circuit, plan, exact, o, ws, true, options.keep_end_traces);
}

std::pair<Plan, Verification> plan_verified_part(const model::Circuit& circuit,
                                                 const Plan& analytic, ThreadPool& pool,
                                                 const VerifyOptions& options) {
  Plan plan = analytic;
  const sim::ReferenceOptions o = reference_options(plan);
  sim::ResponseWorkspace ws;
  const sim::Response exact = sim::exact_reference(circuit, o, &ws);

  const std::size_t n = circuit.lines.size();
  std::vector<std::size_t> adjustable;
  for (std::size_t j = 0; j < n; ++j)
    if (!plan.lines[j].fixed && plan.lines[j].rise > 0.0) adjustable.push_back(j);
  std::vector<ErrorsByCount> seen(n);
  std::vector<double> share(n, 1.0);  // of each line's tolerance, its budget alone
  // Each line alone: the searches share nothing but the reference, so they run side by side.
  for_each_item(pool, adjustable, [&](std::size_t k, sim::ResponseWorkspace& own) {
    LinePlan& lp = plan.lines[k];
    set_sections(circuit.lines[k], lp,
                 search_line(circuit, exact, o, own, k, lp, lp.tolerance, seen[k], true));
  });

  // Together: a line may pass alone and fail beside the others' ladders, whose errors add at
  // the nodes they share.
  Verification v = verify_against(circuit, plan, exact, o, ws, false);
  // A line that fails with only the fixed ladders in place (every planned line exact) fails
  // whatever the planned counts are: it is left to the fixed lines' sections=.
  std::vector<bool> owed_to_fixed(n, false);
  if (adjustable.size() < n &&
      std::any_of(v.lines.begin(), v.lines.end(), [](const LineVerdict& l) { return !l.adequate; })) {
    std::vector<std::optional<LadderSpec>> fixed(n);
    for (std::size_t j = 0; j < n; ++j)
      if (plan.lines[j].fixed) fixed[j] = LadderSpec{std::max(1, plan.lines[j].sections), plan.lines[j].shape};
    const PartialErrors f = measure_partial(circuit, exact, fixed, o, ws);
    for (std::size_t k = 0; k < n; ++k)
      owed_to_fixed[k] = !meets(f.line_errors[k], f.error_estimate, plan.lines[k].tolerance);
  }
  // While a line fails, the planned lines that meet it (it and those sharing one of its
  // ends) search again alone at a smaller share of their tolerance: by the worst failing
  // line's ratio of budget to error, between a tenth and a half less each round.
  for (int round = 0; round < 24; ++round) {
    std::vector<bool> tighten(n, false);
    double ratio = 1.0;
    bool failing = false;
    for (std::size_t k = 0; k < n; ++k) {
      if (v.lines[k].adequate || owed_to_fixed[k]) continue;
      failing = true;
      ratio = std::min(ratio, std::max(0.0, plan.lines[k].tolerance - v.error_estimate) /
                                  std::max(v.lines[k].error, 1e-12));
      const model::Line& line = circuit.lines[k];
      for (const std::size_t j : adjustable) {
        const model::Line& other = circuit.lines[j];
        tighten[j] = tighten[j] || j == k || other.near == line.near || other.near == line.far ||
                     other.far == line.near || other.far == line.far;
      }
    }
    if (!failing) break;
    const double factor = std::clamp(ratio, 0.5, 0.9);
    std::vector<std::size_t> again;
    for (const std::size_t j : adjustable)
      if (tighten[j]) again.push_back(j);
    std::vector<int> before(n);
    for (std::size_t j = 0; j < n; ++j) before[j] = plan.lines[j].sections;
    for_each_item(pool, again, [&](std::size_t j, sim::ResponseWorkspace& own) {
      share[j] *= factor;
      LinePlan& lp = plan.lines[j];
      set_sections(circuit.lines[j], lp,
                   search_line(circuit, exact, o, own, j, lp, share[j] * lp.tolerance, seen[j],
                               false));
    });
    bool raised = false;
    for (std::size_t j = 0; j < n; ++j) raised = raised || plan.lines[j].sections != before[j];
    if (raised) v = verify_against(circuit, plan, exact, o, ws, false);
  }
  v = verify_against(circuit, plan, exact, o, ws, true, options.keep_end_traces);
  for (std::size_t k = 0; k < n; ++k) v.lines[k].owed_to_fixed = owed_to_fixed[k];

  closing_voltages_on(circuit, plan, exact.grid, ws);
  return {plan, v};
}

/// The whole plan, its parts' plans and verifications put back in place.
void merge_part(const sim::CircuitPart& part, const Plan& from, Plan& into) {
  for (std::size_t j = 0; j < part.lines.size(); ++j) into.lines[part.lines[j]] = from.lines[j];
  for (std::size_t j = 0; j < part.loads.size() && j < from.closing_voltage.size(); ++j)
    into.closing_voltage[part.loads[j]] = from.closing_voltage[j];
}

void merge_part(const sim::CircuitPart& part, const Verification& from, Verification& into) {
  for (std::size_t j = 0; j < part.lines.size(); ++j) into.lines[part.lines[j]] = from.lines[j];
  into.error_estimate = std::max(into.error_estimate, from.error_estimate);
  into.reference_within_target = into.reference_within_target && from.reference_within_target;
  into.end_traces.insert(into.end_traces.end(), from.end_traces.begin(), from.end_traces.end());
}

/// A plan is made from its circuit; one of another circuit is a caller's mistake.
void check_plan_of(const model::Circuit& circuit, const Plan& plan) {
  RUNGS_ASSERT(plan.lines.size() == circuit.lines.size());
}

}  // namespace

void set_closing_voltages(const model::Circuit& circuit, Plan& plan) {
  check_plan_of(circuit, plan);
  plan.closing_voltage.assign(circuit.loads.size(), 0.0);
  for (const sim::CircuitPart& part : sim::connected_parts(circuit)) {
    Plan p = part_plan(plan, part);
    const sim::ReferenceOptions o = reference_options(p);
    sim::ResponseWorkspace ws;
    closing_voltages_on(part.circuit, p, sim::initial_reference_grid(part.circuit, o), ws);
    merge_part(part, p, plan);
  }
}

Verification verify_plan(const model::Circuit& circuit, const Plan& plan, ThreadPool& pool,
                         const VerifyOptions& options) {
  check_plan_of(circuit, plan);
  Verification v;
  v.lines.resize(circuit.lines.size());
  v.reference_within_target = true;
  const std::vector<sim::CircuitPart> parts = sim::connected_parts(circuit);
  std::vector<Verification> verdicts(parts.size());
  std::vector<std::size_t> items(parts.size());
  std::iota(items.begin(), items.end(), std::size_t{0});
  for_each_item(pool, items, [&](std::size_t i, sim::ResponseWorkspace&) {
    verdicts[i] = verify_part(parts[i].circuit, part_plan(plan, parts[i]), options);
  });
  for (std::size_t i = 0; i < parts.size(); ++i) merge_part(parts[i], verdicts[i], v);
  return v;
}

std::pair<Plan, Verification> plan_verified(const model::Circuit& circuit, const Plan& analytic,
                                            ThreadPool& pool, const VerifyOptions& options) {
  check_plan_of(circuit, analytic);
  Plan plan = analytic;
  plan.closing_voltage.assign(circuit.loads.size(), 0.0);
  Verification v;
  v.lines.resize(circuit.lines.size());
  v.reference_within_target = true;
  // Parts side by side, and the lines of each part side by side within it: the loops nest
  // on the one pool, which keeps the threads at work within its size.
  const std::vector<sim::CircuitPart> parts = sim::connected_parts(circuit);
  std::vector<std::pair<Plan, Verification>> done(parts.size());
  std::vector<std::size_t> items(parts.size());
  std::iota(items.begin(), items.end(), std::size_t{0});
  for_each_item(pool, items, [&](std::size_t i, sim::ResponseWorkspace&) {
    done[i] = plan_verified_part(parts[i].circuit, part_plan(analytic, parts[i]), pool, options);
  });
  for (std::size_t i = 0; i < parts.size(); ++i) {
    merge_part(parts[i], done[i].first, plan);
    merge_part(parts[i], done[i].second, v);
  }
  plan.elements = 0;
  for (const LinePlan& lp : plan.lines) plan.elements += lp.elements;
  plan.measured = true;
  plan.time_step = deck_time_step(circuit, plan);
  return {plan, v};
}

Verification verify_plan(const model::Circuit& circuit, const Plan& plan) {
  ThreadPool pool(ThreadPool::core_count());
  return verify_plan(circuit, plan, pool);
}

std::pair<Plan, Verification> plan_verified(const model::Circuit& circuit, const Plan& analytic) {
  ThreadPool pool(ThreadPool::core_count());
  return plan_verified(circuit, analytic, pool);
}

}  // namespace rungs::plan
