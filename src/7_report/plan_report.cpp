// Formatting the plan as a text report, as JSON and as a one-line summary.
#include "7_report/plan_report.h"

#include <algorithm>
#include <array>

#include <fmt/format.h>

#include "1_syntax/text.h"
#include "7_report/json_writer.h"

namespace rungs::report {

namespace {

constexpr double kHighVoltage = 50.0;  // V; above this, touch and arc hazards (common practice)

std::string g4(double v, double scale) { return fmt::format("{:.4g}", v / scale); }
std::string percent(double fraction) { return fmt::format("{:.3g} %", 100.0 * fraction); }

/// Right-aligned columns after the first two, which are names.
std::string table(const std::vector<std::vector<std::string>>& rows) {
  std::vector<std::size_t> width(rows.front().size(), 0);
  for (const auto& row : rows)
    for (std::size_t i = 0; i < row.size(); ++i) width[i] = std::max(width[i], row[i].size());
  std::string out;
  for (const auto& row : rows) {
    for (std::size_t i = 0; i < row.size(); ++i) {
      out += i < 2 ? fmt::format("{:<{}}", row[i], width[i]) : fmt::format("{:>{}}", row[i], width[i]);
      out += i + 1 < row.size() ? "  " : "\n";
    }
  }
  return out;
}

/// How the budget was shared, whether the lines' own errors added up as predicted, and which
/// fixed line to change where it leaves the others too little.
std::string budget_notes(const model::Circuit& circuit, const plan::Verification& v) {
  std::string out =
      "own error: the line's ladder alone, every other line exact, at the end named under "
      "\"at\", where it takes the most of the budget; share: the error it may have there, its "
      "own error times the room the fixed lines leave over what the planned lines take there "
      "together (measured), so own error within share means the end is within budget; a fixed "
      "line's share is its own error\n";
  double worst = 0.0;
  const plan::EndAccount* off = nullptr;
  for (const plan::EndAccount& end : v.ends)
    if (end.error - end.superposed > worst) {
      worst = end.error - end.superposed;
      off = &end;
    }
  if (off && worst > v.error_estimate)
    out += fmt::format("superposition: at {} the error with every ladder in place is {}, {} "
                       "above the sum of the lines' own differences ({}); the counts were "
                       "checked by measuring them together\n",
                       off->node, percent(off->error), percent(worst), percent(off->superposed));
  else
    out += "superposition: at every line end the error with every ladder in place is within "
           "the sum of the lines' own differences (and the estimate)\n";
  for (const plan::FixedAdvice& a : v.advice)
    out += fmt::format("advice: at {} the fixed line {} alone takes {} of the {} budget, leaving "
                       "the other lines too little; with sections={} it would take {} half ({})\n",
                       a.node, circuit.lines[a.line].name, percent(a.own_error),
                       percent(a.budget), a.sections, a.measured ? "at most" : "about",
                       a.measured ? "measured" : "estimated from the 1/N^2 fall of a ladder's error");
  return out;
}

/// The verification's design-wide figures in the JSON: the measure's estimate (as
/// "accuracy"), each end's account and the advice for fixed lines.
void write_accounts(JsonWriter& json, const model::Circuit& circuit, const plan::Verification& v) {
  json.key("accuracy").value(v.error_estimate);
  json.key("ends").begin_array();
  for (const plan::EndAccount& end : v.ends)
    json.begin_object()
        .key("node").value(end.node)
        .key("budget").value(end.budget)
        .key("fixed_error").value(end.fixed)
        .key("superposed_error").value(end.superposed)
        .key("error").value(end.error)
        .key("left_to_fixed").value(end.left_to_fixed)
        .end_object();
  json.end_array();
  json.key("advice").begin_array();
  for (const plan::FixedAdvice& a : v.advice)
    json.begin_object()
        .key("line").value(circuit.lines[a.line].name)
        .key("node").value(a.node)
        .key("own_error").value(a.own_error)
        .key("budget").value(a.budget)
        .key("sections").value(a.sections)
        .key("measured").value(a.measured)
        .end_object();
  json.end_array();
}

}  // namespace

std::vector<std::string> cautions(const model::Circuit& circuit, const plan::Plan& plan,
                                  const sim::PeakEstimate& peak) {
  std::vector<std::string> out;
  if (peak.computed && peak.voltage > peak.source_level * (1.0 + 1e-6))
    out.push_back(fmt::format("node {} can reach {:.4g} V, above the highest source level of "
                              "{:.4g} V: reflections push the voltage past the source, so rate "
                              "parts and insulation for the peak",
                              peak.node, peak.voltage, peak.source_level));
  for (std::size_t i = 0; i < circuit.loads.size(); ++i) {
    const model::Load& l = circuit.loads[i];
    const double closing = i < plan.closing.size() ? plan.closing[i] : 0.0;
    if (l.at && closing > 0.0)
      out.push_back(fmt::format("the load on {} is switched in at {:.4g} ns by a switch whose "
                                "voltage falls linearly to zero over {:.4g} ns (rise/0.8 of the "
                                "fastest line at the node), in the deck and the exact reference "
                                "alike; a real switch that closes faster needs a smaller rise= "
                                "on those lines",
                                l.node, *l.at * 1e9, closing * 1e9));
    else if (l.at)
      out.push_back(fmt::format("the load on {} is switched in at {:.4g} ns through an ideal "
                                "switch: its edge is instantaneous, so the ladder's error after "
                                "it is not bounded by the predicted error; check the waveform "
                                "after the switch against the simulator's ideal line "
                                "(--with-ideal)",
                                l.node, *l.at * 1e9));
  }
  for (const model::Drive& d : circuit.drives) {
    if (d.kind == model::WaveKind::dc && std::abs(d.high) > kHighVoltage)
      out.push_back(fmt::format("drive {} is a {:.4g} V dc source: voltages above {:g} V can "
                                "injure or kill; work only to your local electrical codes and "
                                "with licensed, qualified practice",
                                d.node, d.high, kHighVoltage));
  }
  for (const model::Line& line : circuit.lines) {
    if (line.charged && std::abs(*line.charged) > kHighVoltage)
      out.push_back(fmt::format("line {} is charged to {:.4g} V: a charged line keeps its "
                                "energy after the source is removed; discharge and ground it "
                                "before handling, and follow your local electrical codes and "
                                "licensed, qualified practice",
                                line.name, *line.charged));
  }
  return out;
}

std::string plan_text(const model::Circuit& circuit, const plan::Plan& plan,
                      const sim::PeakEstimate& peak, std::string_view source_name,
                      const plan::Verification* verification) {
  std::string out = fmt::format(
      "design {} ({}): {} line{}, tolerance {} of the swing\n"
      "window {} ns, simulator step at most {} ps\n\n",
      circuit.name, syntax::escape_controls(source_name), circuit.lines.size(),
      circuit.lines.size() == 1 ? "" : "s",
      percent(circuit.settings.tolerance), g4(plan.window, 1e-9), g4(plan.time_step, 1e-12));
  std::vector<std::vector<std::string>> rows = {
      {"line", "model", "Z0/ohm", "delay/ns", "shape", "sections", "L/nH", "C/pF", "fc/GHz",
       "knee/GHz", "fc/knee", "predicted", "rule", "rule predicted", "elements"}};
  if (verification) {
    for (const char* heading : {"error", "own error", "share", "at", "rule error", "adequate"})
      rows.front().push_back(heading);
  }
  for (std::size_t i = 0; i < circuit.lines.size(); ++i) {
    const model::Line& line = circuit.lines[i];
    const plan::LinePlan& lp = plan.lines[i];
    rows.push_back({line.name, line.model, g4(line.z0, 1), g4(line.delay, 1e-9),
                    std::string(model::shape_name(lp.shape)),
                    fmt::format("{}{}", lp.sections, lp.fixed ? " (set)" : ""),
                    g4(lp.section_l, 1e-9), g4(lp.section_c, 1e-12), g4(lp.cutoff, 1e9),
                    g4(lp.bandwidth, 1e9), g4(lp.cutoff / lp.bandwidth, 1),
                    percent(lp.predicted_error), fmt::format("{}", lp.rule_sections),
                    percent(lp.rule_predicted_error), fmt::format("{}", lp.elements)});
    if (verification) {
      const plan::LineVerdict& v = verification->lines[i];
      rows.back().push_back(percent(v.error));
      rows.back().push_back(percent(v.own_error));
      rows.back().push_back(percent(v.share));
      rows.back().push_back(v.share_node);
      rows.back().push_back(percent(v.rule_error));
      rows.back().push_back(v.adequate ? "yes" : "NO");
    }
  }
  out += table(rows);
  out += fmt::format("\ntotal ladder elements: {}\n", plan.elements);
  out += "predicted errors are the analytic estimate at the edge's knee frequency (0.5/rise)\n";
  if (verification)
    out += fmt::format("errors are measured against the exact line (frequency-domain reference, "
                       "accuracy {} of the swing): the largest difference at any line end over "
                       "the window, over the drive's swing\n",
                       percent(verification->error_estimate));
  if (verification) out += budget_notes(circuit, *verification);
  for (std::size_t i = 0; i < circuit.lines.size(); ++i) {
    if (plan.lines[i].sections > kIdealLineAdvice)
      out += fmt::format("advice: line {} needs {} sections; a ladder this long is slow to "
                         "simulate, and the simulator's ideal line (see --with-ideal) may serve "
                         "better where losses do not matter\n",
                         circuit.lines[i].name, plan.lines[i].sections);
  }
  if (peak.computed)
    out += fmt::format("peak: the largest line-end excursion is {:.3g} of the drive's swing; "
                       "highest voltage at most {:.4g} V, at node {} (lossless analysis)\n",
                       peak.ratio, peak.voltage, peak.node);
  else
    out += "peak: not computed (circuit too large for the quick lossless analysis)\n";
  for (const std::string& c : cautions(circuit, plan, peak)) out += "caution: " + c + "\n";
  return out;
}

std::string plan_json(const model::Circuit& circuit, const plan::Plan& plan,
                      const sim::PeakEstimate& peak, const plan::Verification* verification) {
  JsonWriter json;
  json.begin_object()
      .key("version").value(1)
      .key("design").value(circuit.name)
      .key("window").value(plan.window)
      .key("time_step").value(plan.time_step);
  json.key("lines").begin_array();
  for (std::size_t i = 0; i < circuit.lines.size(); ++i) {
    const model::Line& line = circuit.lines[i];
    const plan::LinePlan& lp = plan.lines[i];
    json.begin_object()
        .key("name").value(line.name)
        .key("model").value(line.model)
        .key("z0").value(line.z0)
        .key("delay").value(line.delay)
        .key("shape").value(model::shape_name(lp.shape))
        .key("sections").value(lp.sections)
        .key("section_l").value(lp.section_l)
        .key("section_c").value(lp.section_c)
        .key("elements").value(lp.elements)
        .key("cutoff").value(lp.cutoff)
        .key("bandwidth").value(lp.bandwidth)
        .key("predicted_error").value(lp.predicted_error)
        .key("rule_sections").value(lp.rule_sections)
        .key("rule_predicted_error").value(lp.rule_predicted_error);
    if (verification) {
      const plan::LineVerdict& v = verification->lines[i];
      json.key("error").value(v.error)
          .key("delay_error").value(v.delay_error)
          .key("overshoot_error").value(v.overshoot_error)
          .key("rule_error").value(v.rule_error)
          .key("adequate").value(v.adequate)
          .key("share").value(v.share)
          .key("own_error").value(v.own_error)
          .key("share_node").value(v.share_node);
    }
    json.end_object();
  }
  json.end_array();
  json.key("elements").value(plan.elements);
  json.key("verified").value(verification != nullptr);
  if (verification) write_accounts(json, circuit, *verification);
  auto maybe = [&](double v) { return peak.computed ? std::optional<double>(v) : std::nullopt; };
  json.key("peak_ratio").value(maybe(peak.ratio));
  json.key("peak_voltage").value(maybe(peak.voltage));
  json.key("cautions").begin_array();
  for (const std::string& c : cautions(circuit, plan, peak)) json.value(c);
  json.end_array().end_object();
  return json.str();
}

std::string plan_summary(const model::Circuit& circuit, const plan::Plan& plan,
                         const plan::Verification* verification) {
  const std::string head =
      fmt::format("{}: {} line{}, {} ladder elements", circuit.name, circuit.lines.size(),
                  circuit.lines.size() == 1 ? "" : "s", plan.elements);
  if (!verification) {
    double worst = 0.0;
    for (const plan::LinePlan& lp : plan.lines) worst = std::max(worst, lp.predicted_error);
    return fmt::format("{}, predicted error at most {} (not measured: --analytic)", head,
                       percent(worst));
  }
  double worst = 0.0;
  std::size_t failing = 0;
  for (const plan::LineVerdict& v : verification->lines) {
    worst = std::max(worst, v.error);
    failing += v.adequate ? 0 : 1;
  }
  if (failing == 0)
    return fmt::format("{}, every line within its budget (largest measured error {})", head,
                       percent(worst));
  return fmt::format("{}, {} line{} over budget (largest measured error {}; rungs check says "
                     "which)",
                     head, failing, failing == 1 ? "" : "s", percent(worst));
}

std::vector<std::string> inadequate_lines(const model::Circuit& circuit, const plan::Plan& plan,
                                          const plan::Verification& verification) {
  std::vector<std::string> out;
  for (std::size_t i = 0; i < circuit.lines.size(); ++i) {
    const plan::LineVerdict& v = verification.lines[i];
    if (v.adequate) continue;
    out.push_back(fmt::format("line {}: {} sections err {} of the swing (accuracy {}), over its {} "
                              "budget",
                              circuit.lines[i].name, plan.lines[i].sections, percent(v.error),
                              percent(verification.error_estimate), percent(plan.lines[i].tolerance)));
    if (v.owed_to_fixed && !plan.lines[i].fixed) {
      std::string fixed;
      for (const plan::FixedAdvice& a : verification.advice)
        if (fixed.find(circuit.lines[a.line].name) == std::string::npos)
          fixed += fmt::format("{}{} (to sections={})", fixed.empty() ? "" : ", ",
                               circuit.lines[a.line].name, a.sections);
      out.back() += fmt::format("; the fixed sections= of {} leave too little of the budget at "
                                "its end, so it was not raised for it: raise them",
                                fixed.empty() ? "the fixed lines" : fixed);
    }
  }
  return out;
}

}  // namespace rungs::report
