// The plan report: how each line became a ladder, how good the ladder is, and cautions.
#pragma once
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "5_plan/plan.h"
#include "5_plan/verify.h"
#include "4_sim/peak.h"

namespace rungs::report {

/// Cautions a person must see: voltages above the source level, dc sources above 50 V,
/// lines charged above 50 V. Each defers to local codes and licensed practice.
std::vector<std::string> cautions(const model::Circuit& circuit, const plan::Plan& plan,
                                  const sim::PeakEstimate& peak);

/// The report for people: one row per line (model, Z0, delay, shape, sections, per-section
/// L and C, cutoff, knee, their ratio, predicted error, the common rule's sections and its
/// predicted error, elements), then totals, the peak and the cautions.
/// With a verification, each row also shows the measured error, the rule's measured error and
/// whether the line is adequate, and lines past kIdealLineAdvice sections get advice.
std::string plan_text(const model::Circuit& circuit, const plan::Plan& plan,
                      const sim::PeakEstimate& peak, std::string_view source_name,
                      const plan::Verification* verification = nullptr);

/// The report for tools, SI units:
/// `{"version": 1, "design", "window", "time_step", "lines": [{"name", "model", "z0",
/// "delay", "shape", "sections", "section_l", "section_c", "elements", "cutoff",
/// "bandwidth", "predicted_error", "rule_sections", "rule_predicted_error"}], "elements",
/// "peak_ratio", "peak_voltage", "cautions"}`; peak values are null when not computed. With a
/// verification each line also has "error", "delay_error" (s), "overshoot_error",
/// "rule_error" and "adequate", and the design "verified": true and "accuracy".
std::string plan_json(const model::Circuit& circuit, const plan::Plan& plan,
                      const sim::PeakEstimate& peak,
                      const plan::Verification* verification = nullptr);

/// Above this many sections a ladder is slow to simulate, and the report suggests the
/// simulator's own ideal line instead.
inline constexpr int kIdealLineAdvice = 5000;

/// One line per inadequate line, for `rungs check`: "line NAME: N sections err X % of the
/// swing, over its Y % budget".
std::vector<std::string> inadequate_lines(const model::Circuit& circuit, const plan::Plan& plan,
                                          const plan::Verification& verification);

/// One line for stderr after emitting.
std::string plan_summary(const model::Circuit& circuit, const plan::Plan& plan,
                         const plan::Verification* verification = nullptr);

}  // namespace rungs::report
