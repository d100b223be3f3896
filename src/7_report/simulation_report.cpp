// Formatting a simulated deck's errors and the advice for the ends over their budget.
#include "7_report/simulation_report.h"

#include <cmath>

#include <fmt/format.h>

namespace rungs::report {

namespace {

std::string swing_percent(double fraction) {
  return fmt::format("{:.3g} %", 100.0 * fraction);
}

/// The lines that end at `node`, by name, joined by commas.
std::string lines_at(const model::Circuit& circuit, const std::string& node) {
  std::string names;
  for (const model::Line& line : circuit.lines)
    if (line.near == node || line.far == node)
      names += fmt::format("{}{}", names.empty() ? "" : ", ", line.name);
  return names;
}

}  // namespace

std::string time_setting(double seconds) {
  struct Prefix {
    double scale;
    const char* unit;
  };
  static constexpr Prefix prefixes[] = {{1e-15, "fs"}, {1e-12, "ps"}, {1e-9, "ns"},
                                        {1e-6, "us"},  {1e-3, "ms"},  {1.0, "s"}};
  const Prefix* chosen = &prefixes[0];
  for (const Prefix& p : prefixes)
    if (std::abs(seconds) >= p.scale) chosen = &p;
  return fmt::format("{:.3g}{}", seconds / chosen->scale, chosen->unit);
}

std::string simulation_table(const model::Circuit& circuit, const plan::Plan& plan,
                             const std::vector<plan::SimulatedEnd>& ends,
                             std::string_view simulator, double seconds) {
  std::string out = fmt::format(
      "simulated by {} in {:.3g} s: method {}, maximum step {} s; errors in % of the swing\n",
      simulator, seconds, model::method_name(circuit.settings.method),
      fmt::format("{:.4g}", plan.time_step));
  std::vector<std::vector<std::string>> rows = {
      {"node", "simulated", "ladder", "simulation", "budget", ""}};
  for (const plan::SimulatedEnd& end : ends) {
    const plan::SimulationVerdict verdict = plan::verdict_of(end);
    rows.push_back({end.node, fmt::format("{:.3g}", 100 * end.simulated_error),
                    fmt::format("{:.3g}", 100 * end.ladder_error),
                    fmt::format("{:.3g}", 100 * end.simulation_error),
                    fmt::format("{:.3g}", 100 * end.budget),
                    verdict == plan::SimulationVerdict::within ? "ok" : "over"});
  }
  std::vector<std::size_t> width(rows.front().size(), 0);
  for (const auto& row : rows)
    for (std::size_t i = 0; i < row.size(); ++i) width[i] = std::max(width[i], row[i].size());
  for (const auto& row : rows) {
    std::string text;
    for (std::size_t i = 0; i < row.size(); ++i)
      text += i == 0 ? fmt::format("  {:<{}}", row[i], width[i])
                     : fmt::format("  {:>{}}", row[i], width[i]);
    while (!text.empty() && text.back() == ' ') text.pop_back();
    out += text + "\n";
  }
  return out;
}

std::vector<std::string> simulation_failures(const model::Circuit& circuit, const plan::Plan& plan,
                                             const std::vector<plan::SimulatedEnd>& ends) {
  std::vector<std::string> out;
  const double share = plan::kSimulationShare;
  for (const plan::SimulatedEnd& end : ends) {
    const plan::SimulationVerdict verdict = plan::verdict_of(end);
    if (verdict == plan::SimulationVerdict::within) continue;
    std::string line = fmt::format(
        "node {}: the simulated deck errs {} of the swing, over its {} budget (the ladder's own "
        "error {}, the simulation's {} at {:.4g} ns)",
        end.node, swing_percent(end.simulated_error), swing_percent(end.budget),
        swing_percent(end.ladder_error), swing_percent(end.simulation_error),
        end.simulation_at * 1e9);
    if (verdict == plan::SimulationVerdict::simulation_over) {
      line += fmt::format(
          "; the simulation is over its share of {}: write set step {} in the description (the "
          "deck's maximum step is {})",
          swing_percent(share * end.budget),
          time_setting(plan::suggested_step(end, plan.time_step)), time_setting(plan.time_step));
      // Measured on the examples (README, Simulating the deck): at the same step gear erred 1.6
      // to 3.8 times more than trap, so only gear is told to try the other.
      if (circuit.settings.method == model::IntegrationMethod::gear)
        line += ", or set method trap, which errs less at the same step";
    } else if (end.ladder_error > end.budget && !plan.measured) {
      // The analytic estimate chose the counts and missed: a smaller tolerance would only
      // ask the same estimate again.
      line +=
          "; the ladder alone is over the budget: more sections: plan without --analytic, "
          "which measures the counts";
    } else {
      line += fmt::format(
          "; the ladder leaves the simulation less than its share of {}: more sections: give "
          "{} tolerance={:.3g}%",
          swing_percent(share * end.budget), lines_at(circuit, end.node),
          100.0 * (1.0 - share) * end.budget);
    }
    out.push_back(std::move(line));
  }
  return out;
}

}  // namespace rungs::report
