// The verified planner: section counts measured against the exact reference rather than
// estimated, and the smallest count that meets each line's tolerance.
#pragma once
#include <optional>
#include <utility>
#include <vector>

#include "physics/circuit.h"
#include "plan/plan.h"
#include "sim/frequency_reference.h"
#include "sim/two_port.h"

namespace rungs::plan {

/// One line's ladder measured against the exact line, as fractions of the swing of the drive
/// that causes each difference (sim/error_measure.h).
struct LineVerdict {
  double error = 0.0;                 // the larger of the line's two ends, all ladders in place
  std::optional<double> delay_error;  // s, the 50 %-crossing error of larger magnitude
  double overshoot_error = 0.0;       // of larger magnitude over the two ends
  double rule_error = 0.0;            // the same error with every line at its rule count
  /// error plus the measurement's own estimated accuracy is within the line's tolerance: the
  /// count is adequate only when the budget holds with the measure's uncertainty added.
  bool adequate = false;
};

struct Verification {
  std::vector<LineVerdict> lines;  // parallel to circuit.lines
  /// Estimated error of the measured figures (LadderError::accuracy of the plan's ladders).
  double accuracy = 0.0;
  /// Whether the exact reference met its target (the smallest tolerance over 20).
  bool reference_within_target = false;
};

/// Measures the plan's ladders against the exact reference (target: the smallest line
/// tolerance over 20; window plan.window) and, for the common rule's counts, their error too.
/// Throws what sim::exact_reference throws (e.g. std::invalid_argument for a zero window).
Verification verify_plan(const physics::Circuit& circuit, const Plan& plan);

/// The smallest N per line (in the shape planned) whose whole-circuit error, plus the
/// measure's accuracy, is within the line's tolerance:
/// 1. each line alone, every other line exact: from the analytic N, exponential steps (halving
///    while it passes, doubling while it fails) bracket the smallest passing N, then bisection
///    narrows the bracket;
/// 2. the error is not monotonic in N everywhere (a ladder's ringing can line up with a
///    corner of the edge), so after bisection N-1 and N-2 are measured too, and while either
///    passes the search moves down to it and looks again;
/// 3. all lines together: any line whose error fails its tolerance is raised by an eighth (at
///    least one section) and the whole circuit measured again, up to 32 rounds.
/// Lines with sections= (LinePlan::fixed) are verified, not changed. Returns the plan with the
/// new counts (section values, cutoff, elements, predicted errors and time step recomputed)
/// and its verification.
std::pair<Plan, Verification> plan_verified(const physics::Circuit& circuit,
                                            const Plan& analytic);

/// The exact reference's options for a plan: its window, and a target of a twentieth of the
/// smallest line tolerance (the reference's estimate is about its error, not a bound).
sim::ReferenceOptions reference_options(const Plan& plan);

/// The plan's ladders as the frequency-domain solution takes them; with `rule`, at the common
/// rule's counts.
std::vector<sim::LadderSpec> ladder_specs(const Plan& plan, bool rule = false);

/// Past this many sections the search stops doubling; a line that still fails keeps it.
inline constexpr int kVerifiedMaxSections = 1'000'000;

}  // namespace rungs::plan
