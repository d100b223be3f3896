// The budget split: greedy raising by marginal cost, then lowering by bisection.
#include "5_plan/budget_split.h"

#include <algorithm>
#include <cmath>

namespace rungs::plan {

namespace {

/// The summed difference at every end with the adjustable lines at `counts`.
EndWaves summed(const SplitProblem& p, const std::vector<int>& counts) {
  EndWaves sum = p.fixed;
  for (std::size_t i = 0; i < p.adjustable.size(); ++i) {
    const EndWaves& own = p.own(p.adjustable[i], counts[i]);
    for (std::size_t e = 0; e < sum.size(); ++e)
      for (std::size_t j = 0; j < sum[e].size(); ++j) sum[e][j] += own[e][j];
  }
  return sum;
}

/// The error each end may have (allowed_error).
double allowed(const SplitProblem& p, const std::vector<bool>& left, std::size_t e) {
  return allowed_error(p.budget[e], peak(p.fixed[e]), left[e]);
}

/// Every end's error over what it may have (negative: room left).
std::vector<double> excess(const SplitProblem& p, const std::vector<bool>& left,
                           const EndWaves& sum) {
  std::vector<double> out(p.budget.size(), 0.0);
  for (std::size_t e = 0; e < out.size(); ++e)
    out[e] = peak(sum[e]) + p.estimate - allowed(p, left, e);
  return out;
}

std::vector<double> excess(const SplitProblem& p, const std::vector<bool>& left,
                           const std::vector<int>& counts) {
  return excess(p, left, summed(p, counts));
}

double total_over(const std::vector<double>& excess) {
  double total = 0.0;
  for (double x : excess) total += std::max(0.0, x);
  return total;
}

/// The total excess if line i moved from `from` to `to` sections, the others as in `sum`.
double over_after(const SplitProblem& p, const std::vector<bool>& left, const EndWaves& sum,
                  std::size_t i, int from, int to) {
  const EndWaves& before = p.own(p.adjustable[i], from);
  const EndWaves& after = p.own(p.adjustable[i], to);
  double total = 0.0;
  for (std::size_t e = 0; e < sum.size(); ++e) {
    double worst = 0.0;
    for (std::size_t j = 0; j < sum[e].size(); ++j)
      worst = std::max(worst, std::abs(sum[e][j] - before[e][j] + after[e][j]));
    total += std::max(0.0, worst + p.estimate - allowed(p, left, e));
  }
  return total;
}

int next_count(int n, int max_sections, double factor) {
  const int up = static_cast<int>(std::ceil(n * factor));
  return std::min(max_sections, std::max(n + 1, up));
}

/// Raises the line that removes the most excess per element until no end is over, or no raise
/// helps (then false).
bool raise_by_marginal_cost(const SplitProblem& p, const std::vector<bool>& left,
                            std::vector<int>& counts) {
  for (int step = 0; step < 400; ++step) {
    const EndWaves sum = summed(p, counts);
    const double over = total_over(excess(p, left, sum));
    if (over <= 0.0) return true;
    bool raised = false;
    for (double factor : {1.25, 2.0, 8.0}) {
      std::vector<std::pair<std::size_t, int>> trial;
      for (std::size_t i = 0; i < counts.size(); ++i)
        if (counts[i] < p.max_sections)
          trial.emplace_back(p.adjustable[i], next_count(counts[i], p.max_sections, factor));
      if (trial.empty()) return false;
      p.prefetch(trial);
      double best = 0.0;
      std::size_t pick = counts.size();
      for (std::size_t i = 0, t = 0; i < counts.size(); ++i) {
        if (counts[i] >= p.max_sections) continue;
        const int to = trial[t++].second;
        const double gain = over - over_after(p, left, sum, i, counts[i], to);
        const long long cost = std::max<long long>(
            1, p.elements(p.adjustable[i], to) - p.elements(p.adjustable[i], counts[i]));
        if (gain > 0.0 && gain / static_cast<double>(cost) > best) {
          best = gain / static_cast<double>(cost);
          pick = i;
        }
      }
      if (pick == counts.size()) continue;  // no line helps at this step: try a longer one
      counts[pick] = next_count(counts[pick], p.max_sections, factor);
      raised = true;
      break;
    }
    if (!raised) return false;
  }
  return total_over(excess(p, left, counts)) <= 0.0;
}

bool within(const std::vector<double>& ex) {
  return std::all_of(ex.begin(), ex.end(), [](double x) { return x <= 0.0; });
}

}  // namespace

void lower_each(const std::vector<int>& floor,
                const std::function<long long(std::size_t i, int n)>& elements,
                const std::function<bool(const std::vector<int>&)>& passes,
                std::vector<int>& counts) {
  std::vector<std::size_t> order(counts.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return elements(a, counts[a]) > elements(b, counts[b]);
  });
  for (const std::size_t i : order) {
    int hi = counts[i];  // passes
    int lo = std::min(floor[i], hi) - 1;
    // Below the floor while it passes (the floor may be a coarser measurement's).
    while (lo >= 1) {
      counts[i] = lo;
      if (!passes(counts)) break;
      hi = lo;
      lo = lo / 2;
    }
    while (hi - lo > 1) {
      const int mid = lo + (hi - lo) / 2;
      counts[i] = mid;
      (passes(counts) ? hi : lo) = mid;
    }
    counts[i] = hi;
  }
}

namespace {

/// Lowers each line as lower_each does, from the start counts, with `accept` or else the
/// prediction deciding.
void lower_by_bisection(const SplitProblem& p, const std::vector<bool>& left,
                        std::vector<int>& counts) {
  lower_each(
      p.start, [&](std::size_t i, int n) { return p.elements(p.adjustable[i], n); },
      [&](const std::vector<int>& trial) {
        for (std::size_t i = 0; i < trial.size(); ++i)
          if (i < p.firm.size() && p.firm[i] && trial[i] < p.start[i]) return false;
        return p.accept ? p.accept(trial) : within(excess(p, left, trial));
      },
      counts);
}

}  // namespace

double peak(const std::vector<double>& wave) {
  double worst = 0.0;
  for (double x : wave) worst = std::max(worst, std::abs(x));
  return worst;
}

double allowed_error(double budget, double fixed_error, bool left_to_fixed) {
  return left_to_fixed ? std::max(budget, fixed_error + kUsefulShare * budget) : budget;
}

bool leaves_too_little(double budget, double fixed_error, double estimate) {
  return budget - fixed_error - estimate < kUsefulShare * budget;
}

SplitResult split_budget(const SplitProblem& p) {
  SplitResult r;
  r.left_to_fixed = p.left_to_fixed;
  if (r.left_to_fixed.empty())
    for (std::size_t e = 0; e < p.budget.size(); ++e)
      r.left_to_fixed.push_back(leaves_too_little(p.budget[e], peak(p.fixed[e]), p.estimate));
  r.sections = p.start;
  r.met = raise_by_marginal_cost(p, r.left_to_fixed, r.sections);
  if (r.met && p.accept) r.met = p.accept(r.sections);
  if (r.met) lower_by_bisection(p, r.left_to_fixed, r.sections);
  return r;
}

}  // namespace rungs::plan
