// The verified planner: measured section counts.
#include "5_plan/verify.h"

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <map>
#include <memory>
#include <mutex>
#include <numeric>
#include <span>

#include "1_syntax/invariant.h"
#include "3_model/circuit.h"
#include "5_plan/budget_split.h"
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

/// The plan's ladders for every line, as frequency_response takes them.
std::vector<std::optional<LadderSpec>> every_ladder(const Plan& plan) {
  const std::vector<LadderSpec> specs = ladder_specs(plan);
  return {specs.begin(), specs.end()};
}

bool meets(double error, double error_estimate, double tolerance) {
  return error + error_estimate <= tolerance;
}

/// The line ends of a part, each node once: what an error is measured at and budgeted for.
struct EndSet {
  std::vector<std::size_t> node;           // into Response::nodes
  std::vector<std::string> name;
  std::vector<double> budget;              // the smallest tolerance of the lines that reach it
  std::vector<std::vector<std::size_t>> of_line;  // per line: its ends, into the above
};

EndSet end_set(const model::Circuit& circuit, const Plan& plan, const sim::Response& exact) {
  EndSet ends;
  ends.of_line.resize(circuit.lines.size());
  for (std::size_t k = 0; k < circuit.lines.size(); ++k)
    for (const std::string* name : {&circuit.lines[k].near, &circuit.lines[k].far}) {
      if (model::is_ground(*name)) continue;
      const std::optional<std::size_t> i = exact.node_index(*name);
      if (!i) continue;
      const auto at = std::find(ends.node.begin(), ends.node.end(), *i);
      const std::size_t e = static_cast<std::size_t>(at - ends.node.begin());
      if (at == ends.node.end()) {
        ends.node.push_back(*i);
        ends.name.push_back(*name);
        ends.budget.push_back(plan.lines[k].tolerance);
      }
      ends.budget[e] = std::min(ends.budget[e], plan.lines[k].tolerance);
      if (std::find(ends.of_line[k].begin(), ends.of_line[k].end(), e) == ends.of_line[k].end())
        ends.of_line[k].push_back(e);
    }
  return ends;
}

/// The errors at the line ends of the circuit, with the lines that have a ladder in `ladders`
/// cut and the rest exact, and the figures' error estimate (as
/// sim::measure_ladder_error computes both, which takes every line as a ladder).
struct PartialErrors {
  std::vector<double> end_errors;  // per end of the EndSet: the peak of its difference
  EndWaves diff;                   // per end: the difference waveform (see EndWaves)
  double error = 0.0;              // the largest of all
  double error_estimate = 0.0;
};

PartialErrors measure_partial(const model::Circuit& circuit, const sim::Response& exact,
                              const EndSet& ends,
                              const std::vector<std::optional<LadderSpec>>& ladders,
                              const sim::ReferenceOptions& options, sim::ResponseWorkspace& ws) {
  const sim::Response lad = sim::frequency_response(circuit, ladders, exact.grid, options, &ws);
  PartialErrors m;
  m.end_errors.assign(ends.node.size(), 0.0);
  m.diff.assign(ends.node.size(), {});
  double trunc_worst = 0.0;
  for (std::size_t e = 0; e < ends.node.size(); ++e) {
    const std::size_t i = ends.node[e];
    for (std::size_t c = 0; c < exact.excitations.size(); ++c) {
      const double swing = exact.excitations[c].swing;
      if (!(std::abs(swing) > 0.0)) continue;
      for (std::size_t j = 0; j < exact.t.size(); ++j)
        m.diff[e].push_back((lad.v[c][i][j] - exact.v[c][i][j]) / swing);
      double trunc = 0.0;
      for (std::size_t j = 0; j < exact.coarse[c][i].size(); ++j) {
        const double fine = lad.v[c][i][2 * j] - exact.v[c][i][2 * j];
        const double coarse = lad.coarse[c][i][j] - exact.coarse[c][i][j];
        trunc = std::max(trunc, std::abs(fine - coarse));
      }
      trunc_worst = std::max(trunc_worst, trunc / std::abs(swing));
    }
  }
  // The error is the difference's peak, as sim::compare_waveforms measures it.
  for (std::size_t e = 0; e < ends.node.size(); ++e) {
    m.end_errors[e] = peak(m.diff[e]);
    m.error = std::max(m.error, m.end_errors[e]);
  }
  m.error_estimate = trunc_worst + exact.error_estimate.aliasing + lad.error_estimate.aliasing;
  return m;
}

Verification verify_against(const model::Circuit& circuit, const Plan& plan,
                            const sim::Response& exact, const sim::ReferenceOptions& o,
                            sim::ResponseWorkspace& ws, bool with_rule = true,
                            sim::LadderMeasurement* measured = nullptr,
                            bool keep_end_traces = false) {
  sim::LadderMeasurement planned =
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
  if (measured) *measured = std::move(planned);
  return v;
}

/// The reference the candidate ladders are searched against: the exact response on the fewest
/// of the exact grid's frequencies (an eighth, a quarter or a half of them) on which the plan's
/// ladders measure with an error estimate under a tenth of the smallest tolerance; none when
/// no such grid is found. The exact grid is sized for the corners of the waveforms themselves;
/// the difference between a ladder's waveform and the exact one needs less band. Every
/// measurement's own estimate stands beside its error, so the coarser grid's counts are a
/// little higher: settle_on_full_grid lowers them on the full grid, where the report's
/// verdicts are measured.
std::optional<sim::Response> candidate_reference(const model::Circuit& circuit, const Plan& plan,
                                                 const sim::Response& exact, const EndSet& ends,
                                                 const sim::ReferenceOptions& o,
                                                 sim::ResponseWorkspace& ws) {
  double tolerance = std::numeric_limits<double>::infinity();
  for (const LinePlan& lp : plan.lines) tolerance = std::min(tolerance, lp.tolerance);
  const std::vector<std::optional<LadderSpec>> ladders = every_ladder(plan);
  for (const std::size_t fraction : {8, 4, 2}) {
    sim::LaplaceGrid grid = exact.grid;
    grid.frequencies = sim::fft_friendly(exact.grid.frequencies / fraction);
    if (grid.frequencies < o.min_frequencies || grid.frequencies >= exact.grid.frequencies)
      continue;
    sim::Response coarse = sim::frequency_response(circuit, {}, grid, o, &ws);
    if (measure_partial(circuit, coarse, ends, ladders, o, ws).error_estimate < tolerance / 10.0)
      return coarse;
  }
  return std::nullopt;
}

/// One part's measurements, kept across searches: per line, N -> its errors with that line
/// alone a ladder (the rest exact), so a search at a tighter budget only measures counts not yet
/// seen. One line's counts are measured by one thread at a time.
struct PartMeasures {
  const model::Circuit& circuit;
  const sim::Response& exact;
  const sim::ReferenceOptions& options;
  const EndSet& ends;
  const Plan& plan;
  std::vector<std::map<int, PartialErrors>> seen;

  const PartialErrors& alone(std::size_t k, int n, sim::ResponseWorkspace& ws) {
    n = std::clamp(n, 1, kVerifiedMaxSections);
    auto it = seen[k].find(n);
    if (it == seen[k].end()) {
      std::vector<std::optional<LadderSpec>> ladders(circuit.lines.size());
      ladders[k] = LadderSpec{n, plan.lines[k].shape};
      it = seen[k].emplace(n, measure_partial(circuit, exact, ends, ladders, options, ws)).first;
    }
    return it->second;
  }
};

using Passes = std::function<bool(const PartialErrors&)>;

/// The smallest N of line k, alone a ladder with the others exact, that `accept` takes:
/// exponential steps from the plan's count bracket it, bisection narrows the bracket; with
/// `scan`, the counts just below and twelve over the quarter below are tried as well (see
/// plan_verified).
/// The smallest N from `start` that `passes`, as search_line finds it; with `near`, the start is
/// taken to be close above the answer, and the bracket steps down by an eighth, not a half.
int smallest_passing(int start, const std::function<bool(int)>& passes, bool scan,
                     bool near = false,
                     const std::function<void(const std::vector<int>&)>& prefetch = {}) {
  start = std::clamp(start, 1, kVerifiedMaxSections);
  int lo = 0, hi = 0;  // lo fails (0: none known), hi passes
  if (passes(start)) {
    hi = start;
    while (hi > 1) {
      const int down = near ? hi - std::max(1, hi / 8) : hi / 2;
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
    const int stride = std::max(1, hi / 48);
    if (prefetch) {  // the counts looked at below, measured ahead side by side
      std::vector<int> ahead;
      for (int n : {hi - 1, hi - 2})
        if (n >= 1) ahead.push_back(n);
      for (int step = 1; scan && step <= 12 && hi - step * stride >= 1; ++step)
        ahead.push_back(hi - step * stride);
      prefetch(ahead);
    }
    if (hi - 1 >= 1 && passes(hi - 1)) below = hi - 1;
    else if (hi - 2 >= 1 && passes(hi - 2)) below = hi - 2;
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

int search_line(PartMeasures& pm, sim::ResponseWorkspace& ws, std::size_t k,
                const Passes& accept, bool scan) {
  return smallest_passing(
      pm.plan.lines[k].sections, [&](int n) { return accept(pm.alone(k, n, ws)); }, scan);
}

void closing_voltages_on(const model::Circuit& circuit, Plan& plan,
                         const sim::LaplaceGrid& grid, sim::ResponseWorkspace& ws) {
  plan.closing_voltage.assign(circuit.loads.size(), 0.0);
  if (std::none_of(plan.closing.begin(), plan.closing.end(), [](double c) { return c > 0.0; }))
    return;
  const std::vector<std::optional<LadderSpec>> ladders = every_ladder(plan);
  const sim::Response r =
      sim::frequency_response(circuit, ladders, grid, reference_options(plan), &ws);
  for (std::size_t i = 0; i < r.switch_voltages.size(); ++i)
    plan.closing_voltage[r.switches[i].load] = r.switch_voltages[i];
}

/// The fixed (sections=) ladders' errors together, every other line exact; zero without any.
PartialErrors fixed_errors(PartMeasures& pm, sim::ResponseWorkspace& ws) {
  std::vector<std::optional<LadderSpec>> fixed(pm.circuit.lines.size());
  bool any = false;
  for (std::size_t j = 0; j < fixed.size(); ++j)
    if (pm.plan.lines[j].fixed) {
      fixed[j] = LadderSpec{std::max(1, pm.plan.lines[j].sections), pm.plan.lines[j].shape};
      any = true;
    }
  if (any) return measure_partial(pm.circuit, pm.exact, pm.ends, fixed, pm.options, ws);
  // No fixed ladder: a zero difference of the measured waveforms' size.
  PartialErrors none;
  none.end_errors.assign(pm.ends.node.size(), 0.0);
  std::size_t sources = 0;
  for (const sim::Excitation& x : pm.exact.excitations) sources += std::abs(x.swing) > 0.0;
  none.diff.assign(pm.ends.node.size(), std::vector<double>(sources * pm.exact.t.size(), 0.0));
  return none;
}

/// The ends whose budget the fixed ladders leave too little of (leaves_too_little).
std::vector<bool> left_to_fixed(const EndSet& ends, const PartialErrors& fixed) {
  std::vector<bool> left(ends.node.size(), false);
  for (std::size_t e = 0; e < left.size(); ++e)
    left[e] = leaves_too_little(ends.budget[e], fixed.end_errors[e], fixed.error_estimate);
  return left;
}

/// Every line's own measurement at its planned count (its ladder alone, the others exact).
std::vector<const PartialErrors*> own_measurements(PartMeasures& pm, sim::ResponseWorkspace& ws) {
  std::vector<const PartialErrors*> own;
  for (std::size_t k = 0; k < pm.circuit.lines.size(); ++k)
    own.push_back(&pm.alone(k, std::max(1, pm.plan.lines[k].sections), ws));
  return own;
}

/// Each end's account: budget, the fixed ladders' error, the superposed prediction and the
/// error measured with every ladder in place (`together`).
void account_ends(const EndSet& ends, const PartialErrors& fixed, const std::vector<bool>& left,
                  const std::vector<const PartialErrors*>& own,
                  const sim::LadderMeasurement& together, Verification& v) {
  for (std::size_t e = 0; e < ends.node.size(); ++e) {
    EndAccount acc{.node = ends.name[e], .budget = ends.budget[e], .fixed = fixed.end_errors[e],
                   .superposed = 0.0, .error = 0.0, .left_to_fixed = left[e]};
    std::vector<double> sum(fixed.diff[e].size(), 0.0);
    for (const PartialErrors* line : own)
      for (std::size_t j = 0; j < sum.size(); ++j) sum[j] += line->diff[e][j];
    acc.superposed = peak(sum);
    for (const sim::EndError& end : together.ends)
      if (end.node == acc.node) acc.error = std::max(acc.error, end.worst.error);
    v.ends.push_back(acc);
  }
}

/// Line k's own error and share at the end where it takes the most of the budget (see
/// LineVerdict); `accounts` are this part's end accounts, parallel to the EndSet.
void share_of(const PartMeasures& pm, std::size_t k, const PartialErrors& own,
              const PartialErrors& fixed, const std::vector<bool>& left,
              std::span<const EndAccount> accounts, double estimate, LineVerdict& lv) {
  const EndSet& ends = pm.ends;
  if (ends.node.empty()) return;
  std::size_t worst = 0;
  for (std::size_t e = 1; e < ends.node.size(); ++e)
    if (own.end_errors[e] / ends.budget[e] > own.end_errors[worst] / ends.budget[worst]) worst = e;
  lv.own_error = own.end_errors[worst];
  lv.share_node = ends.name[worst];
  if (pm.plan.lines[k].fixed) {
    lv.share = lv.own_error;  // taken as it is
    return;
  }
  // What the planned lines take there together, measured: the error with every ladder in place
  // beyond the fixed ladders' own. Their room is what the budget leaves beside the fixed
  // ladders; each line's share is its own error scaled by room over take, so that its own
  // error is within its share exactly when the end is within budget.
  const double fixed_error = fixed.end_errors[worst];
  const double take = std::max(accounts[worst].error - fixed_error, 0.0);
  const double room = std::max(
      0.0, allowed_error(ends.budget[worst], fixed_error, left[worst]) - fixed_error - estimate);
  lv.share = take > 0.0 ? room * lv.own_error / take : room;
}

/// A count at which fixed line k alone takes at most half of end e's budget (FixedAdvice).
FixedAdvice advise_fixed(PartMeasures& pm, std::size_t k, std::size_t e, double own_error,
                         sim::ResponseWorkspace& ws) {
  // From the count at which a ladder's error, falling about as 1/N^2, would get there, a
  // quarter more at a time until the measurement agrees (at most five measurements; past them
  // the count reached is said as an estimate).
  const double half = pm.ends.budget[e] / 2.0;
  const int now = std::max(1, pm.plan.lines[k].sections);
  int sections = static_cast<int>(
      std::min<double>(kVerifiedMaxSections, std::ceil(now * std::sqrt(own_error / half))));
  bool measured = false;
  for (int step = 0; step < 5 && !measured; ++step) {
    const PartialErrors& m = pm.alone(k, sections, ws);
    measured = m.end_errors[e] + m.error_estimate <= half;
    if (!measured) sections = std::min(kVerifiedMaxSections, sections + std::max(1, sections / 4));
  }
  return FixedAdvice{.line = k, .node = pm.ends.name[e], .own_error = own_error,
                     .budget = pm.ends.budget[e], .sections = sections, .measured = measured};
}

/// Each line's own error and share, each end's account, and advice for the fixed line that
/// takes most of each end left to fixed ladders (one piece a fixed line: the end that needs
/// the most sections).
void attribute(PartMeasures& pm, const PartialErrors& fixed, const std::vector<bool>& left,
               const sim::LadderMeasurement& together, sim::ResponseWorkspace& ws,
               Verification& v) {
  const std::size_t n = pm.circuit.lines.size();
  const std::vector<const PartialErrors*> own = own_measurements(pm, ws);
  const std::size_t first = v.ends.size();  // this part's accounts start here
  account_ends(pm.ends, fixed, left, own, together, v);
  const std::span<const EndAccount> accounts(v.ends.data() + first, pm.ends.node.size());
  for (std::size_t k = 0; k < n; ++k)
    share_of(pm, k, *own[k], fixed, left, accounts, v.error_estimate, v.lines[k]);
  for (std::size_t e = 0; e < pm.ends.node.size(); ++e) {
    if (!left[e]) continue;
    std::size_t culprit = n;
    for (std::size_t k = 0; k < n; ++k)
      if (pm.plan.lines[k].fixed &&
          (culprit == n || own[k]->end_errors[e] > own[culprit]->end_errors[e]))
        culprit = k;
    if (culprit == n) continue;
    const FixedAdvice a = advise_fixed(pm, culprit, e, own[culprit]->end_errors[e], ws);
    auto same = std::find_if(v.advice.begin(), v.advice.end(),
                             [&](const FixedAdvice& b) { return b.line == culprit; });
    if (same == v.advice.end()) v.advice.push_back(a);
    else if (a.sections > same->sections) *same = a;
  }
}

Verification verify_part(const model::Circuit& circuit, const Plan& plan,
                         const VerifyOptions& options) {
  const sim::ReferenceOptions o = reference_options(plan);
  sim::ResponseWorkspace ws;
  const sim::Response exact = sim::exact_reference(circuit, o, &ws);
  const EndSet ends = end_set(circuit, plan, exact);
  PartMeasures pm{circuit, exact, o, ends, plan, {}};
  pm.seen.resize(circuit.lines.size());
  sim::LadderMeasurement together;
  Verification v =
      verify_against(circuit, plan, exact, o, ws, true, &together, options.keep_end_traces);
  const PartialErrors fixed = fixed_errors(pm, ws);
  attribute(pm, fixed, left_to_fixed(ends, fixed), together, ws, v);
  return v;
}

/// Line k's count when it is the only ladder: the smallest N whose own errors fit every end's
/// budget less the fixed ladders' part (the whole budget where that is left to them).
int alone_count(PartMeasures& pm, const PartialErrors& fixed, const std::vector<bool>& left,
                std::size_t k, sim::ResponseWorkspace& ws) {
  return search_line(
      pm, ws, k,
      [&](const PartialErrors& m) {
        for (std::size_t e = 0; e < m.end_errors.size(); ++e) {
          const double room = pm.ends.budget[e] - (left[e] ? 0.0 : fixed.end_errors[e]);
          if (m.end_errors[e] + m.error_estimate > room) return false;
        }
        return true;
      },
      true);
}

/// Whether counts (parallel to `adjustable`) pass with every ladder in place, measured on pm's
/// grid: every line end within its budget with the measure's estimate added; at an end left to
/// the fixed ladders, the planned lines may add a quarter of its budget (kUsefulShare) to the
/// fixed ladders' error there, no more.
struct TogetherCheck {
  PartMeasures& pm;
  const Plan& plan;
  const std::vector<std::size_t>& adjustable;
  const PartialErrors& fixed;
  const std::vector<bool>& left;
  sim::ResponseWorkspace& ws;
  std::map<std::vector<int>, bool> seen;

  bool operator()(const std::vector<int>& counts) {
    auto it = seen.find(counts);
    if (it == seen.end()) it = seen.emplace(counts, evaluate(counts, ws)).first;
    return it->second;
  }

  /// Measures the sets of counts not yet seen side by side on `pool`.
  void prefetch(const std::vector<std::vector<int>>& batch, ThreadPool& pool) {
    std::vector<std::size_t> missing;
    for (std::size_t i = 0; i < batch.size(); ++i)
      if (!seen.count(batch[i])) missing.push_back(i);
    std::vector<char> passed(batch.size(), 0);
    for_each_item(pool, missing, [&](std::size_t i, sim::ResponseWorkspace& own) {
      passed[i] = evaluate(batch[i], own) ? 1 : 0;
    });
    for (const std::size_t i : missing) seen.emplace(batch[i], passed[i] != 0);
  }

  bool evaluate(const std::vector<int>& counts, sim::ResponseWorkspace& work) const {
    Plan trial = plan;
    for (std::size_t i = 0; i < adjustable.size(); ++i)
      set_sections(pm.circuit.lines[adjustable[i]], trial.lines[adjustable[i]], counts[i]);
    const sim::LadderMeasurement m = sim::measure_ladder_error(
        pm.circuit, pm.exact, ladder_specs(trial), pm.options, &work);
    bool ok = true;
    for (std::size_t e = 0; e < pm.ends.name.size(); ++e) {
      const double allowed = allowed_error(pm.ends.budget[e], fixed.end_errors[e], left[e]);
      for (const sim::EndError& end : m.ends)
        if (end.node == pm.ends.name[e]) ok = ok && end.worst.error + m.error_estimate <= allowed;
    }
    return ok;
  }
};

/// Splits every end's budget between the planned lines that reach it (split_budget) and sets
/// their counts; false when no split meets every end.
bool split_counts(PartMeasures& pm, Plan& plan, const PartialErrors& fixed,
                  const std::vector<bool>& left, const std::vector<std::size_t>& adjustable,
                  ThreadPool& pool,
                  sim::ResponseWorkspace& ws) {
  SplitProblem p;
  p.budget = pm.ends.budget;
  p.fixed = fixed.diff;
  p.estimate = fixed.error_estimate;
  for (const auto& counts : pm.seen)
    for (const auto& [count, m] : counts) p.estimate = std::max(p.estimate, m.error_estimate);
  p.adjustable = adjustable;
  p.left_to_fixed = left;
  for (const std::size_t k : adjustable) {
    p.start.push_back(plan.lines[k].sections);
    p.firm.push_back(std::any_of(pm.ends.of_line[k].begin(), pm.ends.of_line[k].end(),
                                 [&](std::size_t e) { return left[e]; }));
  }
  p.max_sections = kVerifiedMaxSections;
  p.elements = [&](std::size_t k, int count) {
    LinePlan trial = plan.lines[k];
    set_sections(pm.circuit.lines[k], trial, count);
    return trial.elements;
  };
  p.own = [&](std::size_t k, int count) -> const EndWaves& {
    return pm.alone(k, count, ws).diff;
  };
  p.prefetch = [&](const std::vector<std::pair<std::size_t, int>>& trial) {
    std::vector<std::size_t> items(trial.size());
    std::iota(items.begin(), items.end(), std::size_t{0});
    for_each_item(pool, items, [&](std::size_t i, sim::ResponseWorkspace& own) {
      pm.alone(trial[i].first, trial[i].second, own);
    });
  };
  TogetherCheck together{pm, plan, adjustable, fixed, left, ws, {}};
  p.accept = [&](const std::vector<int>& counts) { return together(counts); };
  const SplitResult r = split_budget(p);
  for (std::size_t i = 0; i < adjustable.size(); ++i)
    set_sections(pm.circuit.lines[adjustable[i]], plan.lines[adjustable[i]], r.sections[i]);
  return r.met;
}

/// While a line fails with every ladder in place although the split met every end (its errors
/// did not add as the split took them to), the planned lines that meet it (it and those sharing
/// one of its ends) search again alone at a smaller part of their tolerance: by the worst
/// failing line's ratio of budget to error, between a tenth and a half less each round.
void tighten_by_measuring(PartMeasures& pm, Plan& plan, const std::vector<std::size_t>& adjustable,
                          const std::vector<bool>& owed_to_fixed, ThreadPool& pool,
                          sim::ResponseWorkspace& ws, Verification& v) {
  const model::Circuit& circuit = pm.circuit;
  const std::size_t n = circuit.lines.size();
  std::vector<double> share(n, 1.0);
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
    if (!failing) return;
    const double factor = std::clamp(ratio, 0.5, 0.9);
    std::vector<std::size_t> again;
    for (const std::size_t j : adjustable)
      if (tighten[j]) again.push_back(j);
    std::vector<int> before(n);
    for (std::size_t j = 0; j < n; ++j) before[j] = plan.lines[j].sections;
    for_each_item(pool, again, [&](std::size_t j, sim::ResponseWorkspace& own) {
      share[j] *= factor;
      const double budget = share[j] * plan.lines[j].tolerance;
      const int count = search_line(
          pm, own, j,
          [&](const PartialErrors& m) { return m.error + m.error_estimate <= budget; }, false);
      set_sections(circuit.lines[j], plan.lines[j], std::max(count, before[j]));
    });
    bool raised = false;
    for (std::size_t j = 0; j < n; ++j) raised = raised || plan.lines[j].sections != before[j];
    if (raised) v = verify_against(circuit, plan, pm.exact, pm.options, ws, false);
  }
}

/// The counts found on the candidates' coarser grid, settled on the full one: raised by
/// measuring if they fail there, then each lowered as far as the design still passes with every
/// ladder in place, never below `floor` (per adjustable line; 0: none).
void settle_on_full_grid(const model::Circuit& circuit, const sim::Response& exact,
                         const sim::ReferenceOptions& o, const EndSet& ends,
                         const std::vector<std::size_t>& adjustable, const std::vector<int>& floor,
                         const std::vector<bool>& left,
                         const std::vector<bool>& owed_to_fixed, ThreadPool& pool,
                         sim::ResponseWorkspace& ws, Plan& plan) {
  PartMeasures full{circuit, exact, o, ends, plan, {}};
  full.seen.resize(circuit.lines.size());
  Verification v = verify_against(circuit, plan, exact, o, ws, false);
  tighten_by_measuring(full, plan, adjustable, owed_to_fixed, pool, ws, v);
  std::vector<int> counts;
  for (const std::size_t k : adjustable) counts.push_back(plan.lines[k].sections);
  const PartialErrors fixed = fixed_errors(full, ws);
  TogetherCheck together{full, plan, adjustable, fixed, left, ws, {}};
  if (!together(counts)) return;  // still failing: the verdicts say where
  // The largest ladder first; each searched as search_line searches, from just above.
  std::vector<std::size_t> order(adjustable.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return plan.lines[adjustable[a]].elements > plan.lines[adjustable[b]].elements;
  });
  for (const std::size_t i : order) {
    std::vector<int> trial = counts;
    const auto with = [&](int n) {
      std::vector<int> c = counts;
      c[i] = n;
      return c;
    };
    counts[i] = smallest_passing(
        counts[i],
        [&](int n) {
          if (n < floor[i]) return false;
          trial[i] = n;
          return together(trial);
        },
        true, true,
        [&](const std::vector<int>& ahead) {
          std::vector<std::vector<int>> batch;
          for (int n : ahead)
            if (n >= floor[i]) batch.push_back(with(n));
          together.prefetch(batch, pool);
        });
  }
  for (std::size_t i = 0; i < adjustable.size(); ++i)
    set_sections(circuit.lines[adjustable[i]], plan.lines[adjustable[i]], counts[i]);
}

std::pair<Plan, Verification> plan_verified_part(const model::Circuit& circuit,
                                                 const Plan& analytic, ThreadPool& pool,
                                                 const VerifyOptions& options) {
  Plan plan = analytic;
  const sim::ReferenceOptions o = reference_options(plan);
  sim::ResponseWorkspace ws;
  const sim::Response exact = sim::exact_reference(circuit, o, &ws);
  const EndSet ends = end_set(circuit, plan, exact);
  const std::size_t n = circuit.lines.size();
  std::vector<std::size_t> adjustable;
  for (std::size_t j = 0; j < n; ++j)
    if (!plan.lines[j].fixed && plan.lines[j].rise > 0.0) adjustable.push_back(j);
  // With one line to plan there is nothing to split: its search on the full grid is the answer.
  const std::optional<sim::Response> coarse =
      adjustable.size() > 1 ? candidate_reference(circuit, plan, exact, ends, o, ws) : std::nullopt;
  const sim::Response& candidates = coarse ? *coarse : exact;
  PartMeasures pm{circuit, candidates, o, ends, plan, {}};
  pm.seen.resize(circuit.lines.size());

  // The fixed ladders' errors are taken as they are; the planned lines share what is left.
  const PartialErrors fixed = fixed_errors(pm, ws);
  const std::vector<bool> left = left_to_fixed(ends, fixed);
  // Each line alone first (the searches share nothing but the reference, so they run side by
  // side): no split can give a line fewer sections than it needs with the others exact.
  for_each_item(pool, adjustable, [&](std::size_t k, sim::ResponseWorkspace& own) {
    set_sections(circuit.lines[k], plan.lines[k], alone_count(pm, fixed, left, k, own));
  });
  // A line that reaches an end left to the fixed ladders keeps at least the count it needs
  // alone: it is not raised for the fixed lines' error, nor let go below its own budget.
  std::vector<int> floor;
  for (const std::size_t k : adjustable) {
    const bool firm = std::any_of(ends.of_line[k].begin(), ends.of_line[k].end(),
                                  [&](std::size_t e) { return left[e]; });
    floor.push_back(firm ? plan.lines[k].sections : 0);
  }
  if (adjustable.size() > 1) split_counts(pm, plan, fixed, left, adjustable, pool, ws);

  // Together: the split takes errors to add where ladders meet; the measurement with every
  // ladder in place says whether they did.
  Verification v = verify_against(circuit, plan, candidates, o, ws, false);
  std::vector<bool> owed_to_fixed(n, false);
  for (std::size_t k = 0; k < n; ++k)
    for (const std::size_t e : ends.of_line[k])
      owed_to_fixed[k] = owed_to_fixed[k] || (left[e] && !v.lines[k].adequate);
  tighten_by_measuring(pm, plan, adjustable, owed_to_fixed, pool, ws, v);

  if (coarse)
    settle_on_full_grid(circuit, exact, o, ends, adjustable, floor, left, owed_to_fixed, pool, ws,
                        plan);
  sim::LadderMeasurement together;
  v = verify_against(circuit, plan, exact, o, ws, true, &together, options.keep_end_traces);
  for (std::size_t k = 0; k < n; ++k) v.lines[k].owed_to_fixed = owed_to_fixed[k];
  // The attribution the report prints is measured on the full grid, as the verdicts are.
  if (coarse) {
    PartMeasures full{circuit, exact, o, ends, plan, {}};
    full.seen.resize(n);
    attribute(full, fixed_errors(full, ws), left, together, ws, v);
  } else {
    attribute(pm, fixed, left, together, ws, v);
  }

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
  into.ends.insert(into.ends.end(), from.ends.begin(), from.ends.end());
  for (FixedAdvice a : from.advice) {
    a.line = part.lines[a.line];
    into.advice.push_back(a);
  }
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
