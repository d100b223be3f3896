// Planning a circuit: the edge that reaches each line, its section count, and the window.
#include "5_plan/plan.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <numeric>

#include <fmt/format.h>

#include "3_model/circuit.h"
#include "3_model/connected_parts.h"
#include "3_model/edges.h"
#include "3_model/load_network.h"
#include "1_syntax/units.h"
#include "5_plan/error_estimate.h"

namespace rungs::plan {

namespace {

using model::Circuit;
using model::Line;

/// Round trips until the reflections between the worst-matched pair of ends have fallen
/// under the tolerance: |Gamma_a Gamma_b|^n <= tolerance, with each end's Gamma taken from
/// its DC termination against the line's Z0. At least 2, at most 20.
int settling_round_trips(const Circuit& circuit, double tolerance) {
  std::map<std::string, double> termination;  // node -> resistance to ground at DC
  for (const model::Drive& d : circuit.drives) termination[d.node] = d.source_resistance;
  for (const model::Load& l : circuit.loads) {
    const double r = model::dc_resistance(l.network);
    auto [it, fresh] = termination.emplace(l.node, r);
    if (!fresh) it->second = 1.0 / (1.0 / it->second + 1.0 / r);
  }
  std::map<std::string, int> ends;
  for (const Line& line : circuit.lines) ++ends[line.near], ++ends[line.far];
  auto gamma = [&](const std::string& node, double z0) {
    if (ends[node] > 1) return 0.5;  // a junction of lines: partly transmitted
    auto it = termination.find(node);
    const double r = it == termination.end() ? std::numeric_limits<double>::infinity() : it->second;
    return std::isinf(r) ? 1.0 : std::abs(r - z0) / (r + z0);
  };
  double worst = 0.0;
  for (const Line& line : circuit.lines)
    worst = std::max(worst, gamma(line.near, line.z0) * gamma(line.far, line.z0));
  if (worst <= tolerance) return 2;
  if (worst >= 1.0) return 20;
  return std::clamp(static_cast<int>(std::ceil(std::log(tolerance) / std::log(worst))), 2, 20);
}

/// When the last drive has finished changing, or the last load is switched in, s.
double last_event(const Circuit& circuit) {
  double last = 0.0;
  for (const model::Drive& d : circuit.drives) {
    if (!d.edge || !(d.edge->rise > 0.0)) continue;  // reported by the resolver
    double end = d.at + d.edge->ramp;
    if (d.kind == model::WaveKind::pulse) end += d.width.value_or(0.0) + d.edge->ramp;
    last = std::max(last, end);
  }
  for (const model::Load& l : circuit.loads) last = std::max(last, l.at.value_or(0.0));
  return last;
}

/// A charged line makes the deck start from its initial conditions (uic), not from a DC
/// operating point: everything else starts at rest, so a drive must start at 0 V too.
void check_rest_start(const Circuit& circuit, syntax::Diagnostics& diagnostics) {
  const bool charged = std::any_of(circuit.lines.begin(), circuit.lines.end(),
                                   [](const Line& l) { return l.charged.has_value(); });
  for (const model::Drive& d : circuit.drives) {
    if (charged && d.low != 0.0)
      diagnostics.error(d.span, fmt::format("this design has a charged line, so it starts from "
                                            "rest; drive '{}' must start at 0V, not {:g}V",
                                            d.node, d.low));
  }
}

/// The plan of one line for the edge that reaches it: its shape, tolerance and analytic
/// section count (or its sections=). Without an edge, an error and a plan of rise 0.
LinePlan plan_line(const Circuit& circuit, const Line& line, syntax::Diagnostics& diagnostics) {
  LinePlan lp;
  lp.shape = line.shape.value_or(circuit.settings.shape);
  lp.tolerance = line.tolerance.value_or(circuit.settings.tolerance);
  if (!line.edge) {
    diagnostics.error(line.span, fmt::format("no drive reaches line '{}', so nothing says how "
                                             "fast its edges are; give it rise= or write set "
                                             "rise",
                                             line.name));
    return lp;
  }
  lp.rise = line.edge->rise;
  lp.fixed = line.sections.has_value();
  set_sections(
      line, lp,
      line.sections.value_or(analytic_sections(line.delay, lp.rise, lp.tolerance, lp.shape)));
  lp.rule_sections = rule_of_thumb_sections(line.delay, lp.rise);
  lp.rule_predicted_error =
      estimate_ladder_error(line.delay, lp.rise, lp.rule_sections, lp.shape).total();
  lp.bandwidth = knee_frequency(lp.rise);
  return lp;
}

/// The observation window: `set window`, else the last event plus enough round trips of the
/// slowest connected part (the sum of its line delays) for its reflections to settle.
double plan_window(const Circuit& circuit) {
  if (circuit.settings.window) return *circuit.settings.window;
  const model::ConnectedParts parts(circuit);
  std::vector<double> part_delay(parts.count(), 0.0);
  for (std::size_t k = 0; k < circuit.lines.size(); ++k)
    part_delay[parts.of_line(k)] += circuit.lines[k].delay;
  const double slowest_part = std::accumulate(part_delay.begin(), part_delay.end(), 0.0,
                                              [](double m, double d) { return std::max(m, d); });
  const int trips = settling_round_trips(circuit, circuit.settings.tolerance);
  return last_event(circuit) + (2.0 * trips + 1.0) * slowest_part;
}

/// Per load, the closing time of its switch: the ramp of the fastest line edge at its node; 0
/// for a load that is not switched or that no line with an edge reaches.
std::vector<double> closing_times(const Circuit& circuit) {
  std::vector<double> closing(circuit.loads.size(), 0.0);
  for (std::size_t i = 0; i < circuit.loads.size(); ++i) {
    const model::Load& load = circuit.loads[i];
    if (!load.at) continue;
    double rise = std::numeric_limits<double>::infinity();
    for (const Line& line : circuit.lines)
      if ((line.near == load.node || line.far == load.node) && line.edge && line.edge->rise > 0.0)
        rise = std::min(rise, line.edge->rise);
    if (std::isfinite(rise)) closing[i] = model::ramp_time(rise);
  }
  return closing;
}

}  // namespace

long long ladder_elements(int sections, model::Shape shape, bool has_r, bool has_g) {
  const long long n = sections;
  const long long series = shape == model::Shape::t ? n + 1 : n;
  const long long shunt = shape == model::Shape::pi ? n + 1 : n;
  return series * (has_r ? 2 : 1) + shunt * (has_g ? 2 : 1);
}

void set_sections(const model::Line& line, LinePlan& lp, int sections) {
  const double n = sections;
  lp.sections = sections;
  lp.predicted_error = estimate_ladder_error(line.delay, lp.rise, sections, lp.shape).total();
  lp.section_l = line.z0 * line.delay / n;
  lp.section_c = line.delay / (line.z0 * n);
  const double length = line.length.value_or(0.0);
  lp.section_r = line.per_length.r * length / n;
  lp.section_g = line.per_length.g * length / n;
  lp.cutoff = section_cutoff(line.delay / n);
  lp.elements = ladder_elements(sections, lp.shape, lp.section_r > 0.0, lp.section_g > 0.0);
}

Plan part_plan(const Plan& whole, const sim::CircuitPart& part) {
  Plan p;
  p.window = whole.window;
  p.time_step = whole.time_step;
  p.measured = whole.measured;
  for (const std::size_t k : part.lines) {
    p.lines.push_back(whole.lines[k]);
    p.elements += whole.lines[k].elements;
  }
  for (const std::size_t i : part.loads) {
    p.closing.push_back(i < whole.closing.size() ? whole.closing[i] : 0.0);
    if (!whole.closing_voltage.empty()) p.closing_voltage.push_back(whole.closing_voltage[i]);
  }
  return p;
}

double deck_time_step(const model::Circuit& circuit, const Plan& plan) {
  if (circuit.settings.step) return *circuit.settings.step;
  double shortest_ramp = std::numeric_limits<double>::infinity();
  for (const model::Drive& d : circuit.drives)
    if (d.edge && d.edge->rise > 0.0) shortest_ramp = std::min(shortest_ramp, d.edge->ramp);
  for (const double closing : plan.closing)
    if (closing > 0.0) shortest_ramp = std::min(shortest_ramp, closing);
  double shortest_section = std::numeric_limits<double>::infinity();
  for (std::size_t k = 0; k < circuit.lines.size() && k < plan.lines.size(); ++k)
    if (plan.lines[k].sections > 0)
      shortest_section =
          std::min(shortest_section, circuit.lines[k].delay / plan.lines[k].sections);
  const double steps_a_section = plan.measured ? 8.0 : 16.0;
  const double step = std::min(shortest_ramp / 40.0, shortest_section / steps_a_section);
  return std::isfinite(step) ? step : plan.window / 1000.0;
}

namespace {

/// Every figure the deck will carry, checked before anything is written: a section's L, C, R
/// and G, the count, the deck's size, the window and the time step. Each error points at the
/// line (or the file) whose values gave the figure.
void check_deck_figures(const Circuit& circuit, const Plan& plan, syntax::Diagnostics& diagnostics) {
  auto in_range = [](double v) {
    return std::abs(v) >= syntax::kSmallestValue && std::abs(v) <= syntax::kLargestValue;
  };
  for (std::size_t i = 0; i < plan.lines.size(); ++i) {
    const Line& line = circuit.lines[i];
    const LinePlan& lp = plan.lines[i];
    const struct {
      const char* what;
      double value;
      const char* unit;
      bool may_be_zero;
    } figures[] = {{"inductance", lp.section_l, "H", false},
                   {"capacitance", lp.section_c, "F", false},
                   {"resistance", lp.section_r, "ohm", true},
                   {"conductance", lp.section_g, "S", true}};
    for (const auto& f : figures) {
      if (f.may_be_zero && f.value == 0.0) continue;
      if (!in_range(f.value))
        diagnostics.error(line.span,
                          fmt::format("a section of line {} would have a {} of {:g} {}, outside "
                                      "what a simulator takes ({:g} to {:g}): check the line's "
                                      "values (impedance, delay, length, per-length figures)",
                                      line.name, f.what, f.value, f.unit, syntax::kSmallestValue,
                                      syntax::kLargestValue));
    }
    if (!lp.fixed && lp.sections >= kMaxSections)
      diagnostics.error(line.span,
                        fmt::format("line {} would need more than {} sections for its budget: "
                                    "its delay is far longer than its edge; give it sections=N, a "
                                    "slower rise= or a larger tolerance=",
                                    line.name, kMaxSections));
  }
  if (plan.elements > kMaxDeckElements) {
    // Pointed at the line with the most elements: the one to change first.
    const auto largest =
        std::max_element(plan.lines.begin(), plan.lines.end(),
                         [](const LinePlan& a, const LinePlan& b) { return a.elements < b.elements; });
    const Line& line = circuit.lines[static_cast<std::size_t>(largest - plan.lines.begin())];
    diagnostics.error(line.span,
                      fmt::format("the deck would hold {} ladder elements, more than the {} a "
                                  "simulator could run ({} in line {}): lower its sections= or "
                                  "raise its tolerance=",
                                  plan.elements, kMaxDeckElements, largest->elements, line.name));
  }
  if (!(std::isfinite(plan.window) && plan.window > 0.0 && plan.window <= syntax::kLargestValue))
    diagnostics.error(syntax::Span{},
                      fmt::format("the observation window would be {:g} s: give a finite one "
                                  "with 'set window'",
                                  plan.window));
  else if (!(std::isfinite(plan.time_step) && plan.time_step >= syntax::kSmallestValue &&
             plan.window / plan.time_step <= 1e12))
    diagnostics.error(syntax::Span{},
                      fmt::format("the simulator's step would be {:g} s over a window of {:g} s, "
                                  "more than 1e12 steps: shorten the window ('set window') or set "
                                  "a longer step ('set step')",
                                  plan.time_step, plan.window));
}

}  // namespace

Plan plan_circuit(const Circuit& circuit, syntax::Diagnostics& diagnostics) {
  check_rest_start(circuit, diagnostics);
  Plan plan;
  for (const Line& line : circuit.lines) {
    plan.lines.push_back(plan_line(circuit, line, diagnostics));
    plan.elements += plan.lines.back().elements;
  }
  plan.window = plan_window(circuit);
  plan.closing = closing_times(circuit);
  plan.time_step = deck_time_step(circuit, plan);
  // Only for a plan without errors: figures of a line that could not be planned mean nothing.
  if (!diagnostics.has_errors()) check_deck_figures(circuit, plan, diagnostics);
  return plan;
}

}  // namespace rungs::plan
