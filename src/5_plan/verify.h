// The verified planner: section counts measured against the exact reference rather than
// estimated, and the smallest count that meets each line's tolerance.
#pragma once
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "3_model/circuit.h"
#include "5_plan/end_traces.h"
#include "5_plan/plan.h"
#include "5_plan/thread_pool.h"
#include "4_sim/frequency_reference.h"
#include "4_sim/two_port.h"

namespace rungs::plan {

/// One line's ladder measured against the exact line, as fractions of the swing of the drive
/// that causes each difference (4_sim/error_measure.h).
struct LineVerdict {
  double error = 0.0;                 // the larger of the line's two ends, all ladders in place
  std::optional<double> delay_error;  // s, the 50 %-crossing error of larger magnitude
  double overshoot_error = 0.0;       // of larger magnitude over the two ends
  double rule_error = 0.0;            // the same error with every line at its rule count
  /// error plus the measurement's own error estimate is within the line's tolerance: the
  /// count is adequate only when the budget holds with the measure's uncertainty added.
  bool adequate = false;
  /// The line fails even with every planned line exact: the fixed ladders (sections=) of the
  /// lines it meets cause its error, so the planner left the others as they were.
  bool owed_to_fixed = false;
  /// The line's own contribution: the largest error its ladder causes alone, every other line
  /// exact, at the line end where it takes the most of the budget (`share_node`).
  double own_error = 0.0;
  /// The part of that end's budget the line may take: the room the fixed ladders and the
  /// measure's estimate leave there, times its own error over what the planned lines take there
  /// together (the measured error with every ladder in place, less the fixed ladders' error).
  /// own_error <= share exactly when the end is within budget. A fixed line's share is its own
  /// error, taken as it is.
  double share = 0.0;
  std::string share_node;
};

/// One line end's budget and what takes it (fractions of the swing).
struct EndAccount {
  std::string node;
  double budget = 0.0;    // the smallest tolerance of the lines that reach it
  double fixed = 0.0;     // the fixed ladders' error here, together, the other lines exact
  /// The first-order prediction of `error`: the peak of the sum of every line's own
  /// difference waveform here (each ladder alone, the other lines exact).
  double superposed = 0.0;
  double error = 0.0;     // measured with every ladder in place
  /// The fixed ladders leave under a quarter of the budget: the planned lines were not raised
  /// for this end.
  bool left_to_fixed = false;
};

/// A fixed line that takes most of an end's budget, and a count at which it alone takes at most
/// half of it: from the 1/N^2 fall of a ladder's error, raised by a quarter at a time until
/// measured so (at most five measurements; `measured` says whether one agreed). One a fixed
/// line: at the end that needs the most.
struct FixedAdvice {
  std::size_t line = 0;  // into circuit.lines
  std::string node;
  double own_error = 0.0;
  double budget = 0.0;
  int sections = 0;
  bool measured = false;
};

struct Verification {
  std::vector<LineVerdict> lines;  // parallel to circuit.lines
  /// Estimated error of the measured figures (LadderMeasurement::error_estimate of the plan's ladders).
  double error_estimate = 0.0;
  /// Whether the exact reference met its target (the smallest tolerance over 20).
  bool reference_within_target = false;
  std::vector<EndAccount> ends;  // every line end, once
  std::vector<FixedAdvice> advice;
  /// With VerifyOptions::keep_end_traces: the exact and the planned ladders' waveforms at every
  /// line end, part after part, for comparing a simulator's run of the deck with them.
  std::vector<EndTraces> end_traces;
};

/// What a verification keeps beside its verdicts.
struct VerifyOptions {
  bool keep_end_traces = false;  // fill Verification::end_traces (memory: three per end)
};

/// Each connected part of the circuit (sim::connected_parts) is measured on its own, against its
/// own reference, in what follows.
///
/// Measures the plan's ladders against the exact reference (target: the smallest line
/// tolerance over 20; window plan.window) and, for the common rule's counts, their error too.
/// Throws what sim::exact_reference throws (e.g. std::invalid_argument for a zero window).
/// The parts are measured side by side on `pool`.
Verification verify_plan(const model::Circuit& circuit, const Plan& plan, ThreadPool& pool,
                         const VerifyOptions& options = {});
/// As above, on a pool of its own with a thread for each core.
Verification verify_plan(const model::Circuit& circuit, const Plan& plan);

/// The smallest N per line (in the shape planned) whose whole-circuit error, plus the
/// measure's error estimate, is within the line's tolerance:
/// 1. each line alone, every other line exact: from the analytic N, exponential steps (halving
///    while it passes, doubling while it fails) bracket the smallest passing N, then bisection
///    narrows the bracket;
/// 2. the error is not monotonic in N everywhere (a ladder's ringing can line up with a
///    corner of the edge), so after bisection N-1 and N-2 are measured too, and twelve counts
///    spread over the quarter below N; while any passes the search moves down to it and looks
///    again;
/// 3. all lines together: their errors add where they meet. While a line fails its
///    tolerance, the planned lines that meet it (it and those that share one of its ends)
///    search again as in 1-2 (without the twelve counts), each alone against a smaller share of its tolerance (cut by the
///    worst failing line's ratio of budget to error, between a tenth and a half a round), and
///    the whole circuit is measured again, up to 24 rounds. Counts measured once are not
///    measured again. A line that fails with only the fixed (sections=) ladders in place is
///    marked owed_to_fixed and raises nothing.
/// Lines with sections= (LinePlan::fixed) are verified, not changed. Returns the plan with the
/// new counts (section values, cutoff, elements, predicted errors and time step recomputed)
/// and its verification. The parts, and the lines of each part, are searched side by side on
/// `pool`; the counts do not depend on its size.
std::pair<Plan, Verification> plan_verified(const model::Circuit& circuit, const Plan& analytic,
                                            ThreadPool& pool, const VerifyOptions& options = {});
/// As above, on a pool of its own with a thread for each core.
std::pair<Plan, Verification> plan_verified(const model::Circuit& circuit,
                                            const Plan& analytic);

/// The exact reference's options for a plan: its window, and a target of a twentieth of the
/// smallest line tolerance (the reference's estimate is about its error, not a bound).
sim::ReferenceOptions reference_options(const Plan& plan);

/// The plan's ladders as the frequency-domain solution takes them; with `rule`, at the common
/// rule's counts.
std::vector<sim::LadderSpec> ladder_specs(const Plan& plan, bool rule = false);

/// Fills plan.closing_voltage: each switch's open voltage when it starts to close, with the
/// plan's ladders in place, from their frequency-domain solution on the grid the exact
/// reference starts from (one sweep a part with such a switch). With no switch that closes over
/// a ramp, all zero and no sweep. plan_verified fills it too.
void set_closing_voltages(const model::Circuit& circuit, Plan& plan);

/// Past this many sections the search stops doubling; a line that still fails keeps it.
inline constexpr int kVerifiedMaxSections = 1'000'000;

}  // namespace rungs::plan
