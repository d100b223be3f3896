// Splitting each line end's error budget between the lines that reach it, so that the total
// element count is smallest: the allocation only, on measured error-against-N curves.
#pragma once
#include <cstddef>
#include <functional>
#include <vector>

namespace rungs::plan {

/// One ladder's own contribution at every line end of its part (parallel to
/// SplitProblem::budget): the difference it makes to the waveform there, v_ladder - v_exact over
/// the swing of the source, sampled over the window (the sources one after another), with that
/// line's ladder in place and every other line exact.
using EndWaves = std::vector<std::vector<double>>;

/// The largest magnitude of a difference waveform: the error it is, as a fraction of the swing.
double peak(const std::vector<double>& wave);

/// The allocation's inputs. The differences of several ladders are taken to add at a line end
/// (first-order superposition), so a set of counts is accepted when, at every end, the peak of
/// the fixed ladders' difference plus the adjustable lines' own differences, plus `estimate`,
/// stays within `budget`.
struct SplitProblem {
  std::vector<double> budget;  // per end: the smallest tolerance of the lines that reach it
  EndWaves fixed;              // the fixed (sections=) ladders' difference, together
  double estimate = 0.0;       // the measurement's own error estimate, held back at every end
  std::vector<std::size_t> adjustable;  // the lines whose counts may change
  std::vector<int> start;      // per adjustable line: the count below which it cannot pass alone
  /// Per adjustable line (empty: none): its start is a floor that lowering never goes below
  /// (a line that reaches an end left to the fixed ladders must still pass alone there).
  std::vector<bool> firm;
  int max_sections = 1;
  /// Elements of line k's ladder at N sections.
  /// Per end, whether it is left to the fixed ladders; empty: decided by leaves_too_little
  /// from `fixed` and `estimate`.
  std::vector<bool> left_to_fixed;
  std::function<long long(std::size_t k, int n)> elements;
  /// Line k's own difference at N sections; the caller measures and keeps it.
  std::function<const EndWaves&(std::size_t k, int n)> own;
  /// Whether the counts (parallel to `adjustable`) pass when measured with every ladder in
  /// place; empty: the superposed prediction decides.
  std::function<bool(const std::vector<int>& counts)> accept;
  /// Measures the listed (line, count) pairs ahead, side by side; may do nothing.
  std::function<void(const std::vector<std::pair<std::size_t, int>>&)> prefetch;
};

/// Below this part of an end's budget left over by the fixed ladders, the end is left to them:
/// the planned lines are not raised for it (the report says which fixed line to change).
inline constexpr double kUsefulShare = 0.25;

/// The error an end may have with every ladder in place: its budget; where it is left to the
/// fixed ladders, their error plus a quarter of the budget (kUsefulShare) if that is more, so
/// that the planned lines are not raised for it but cannot take more than that either.
double allowed_error(double budget, double fixed_error, bool left_to_fixed);

struct SplitResult {
  std::vector<int> sections;        // per adjustable line, parallel to SplitProblem::adjustable
  std::vector<bool> left_to_fixed;  // per end: too little budget left by the fixed ladders
  bool met = false;                 // every end not left to the fixed ladders within budget
};

/// Lowers each count (the largest ladder first, `elements(i, n)` of entry i at n sections) by
/// bisection as far as `passes` still takes the counts, the others as they are then; below
/// `floor[i]` only while it passes there. `counts` must pass on entry.
void lower_each(const std::vector<int>& floor,
                const std::function<long long(std::size_t i, int n)>& elements,
                const std::function<bool(const std::vector<int>&)>& passes,
                std::vector<int>& counts);

/// Whether the fixed ladders, with `fixed_error` at an end and the measure's `estimate`, leave
/// under kUsefulShare of its `budget`: the end is then left to them.
bool leaves_too_little(double budget, double fixed_error, double estimate);

/// Chooses the counts by marginal cost: from the start counts, while an end is over its
/// budget, the line whose next count (a quarter more) removes the most excess error per added
/// element is raised; then, if `accept` takes them, each line, largest first, is lowered by
/// bisection as far as `accept` (or, without it, the prediction) still takes the counts. `met`
/// is false when no raise brings every end within budget, or `accept` refuses the raised
/// counts (the errors did not add as predicted).
SplitResult split_budget(const SplitProblem& problem);

}  // namespace rungs::plan
