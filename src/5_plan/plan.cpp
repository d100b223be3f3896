// Planning a circuit: the edge that reaches each line, its section count, and the window.
#include "5_plan/plan.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <numeric>

#include <fmt/format.h>

#include "3_model/circuit.h"
#include "5_plan/ladder_error.h"

namespace rungs::plan {

namespace {

using model::Circuit;
using model::Line;
using model::LoadNetwork;
using model::NetworkKind;

/// Connected parts of the circuit: line ends joined through lines.
class Components {
 public:
  explicit Components(const Circuit& circuit) {
    for (const Line& line : circuit.lines) unite(id(line.near), id(line.far));
  }
  int of(const std::string& node) {
    auto it = ids_.find(node);
    return it == ids_.end() ? -1 : find(it->second);
  }

 private:
  int id(const std::string& node) {
    auto [it, fresh] = ids_.emplace(node, static_cast<int>(parent_.size()));
    if (fresh) parent_.push_back(it->second);
    return it->second;
  }
  int find(int i) { return parent_[i] == i ? i : parent_[i] = find(parent_[i]); }
  void unite(int a, int b) { parent_[find(a)] = find(b); }
  std::map<std::string, int> ids_;
  std::vector<int> parent_;
};

/// A load network's resistance at DC: capacitors open, inductors short.
double dc_resistance(const LoadNetwork& n) {
  constexpr double kOpen = std::numeric_limits<double>::infinity();
  switch (n.kind) {
    case NetworkKind::open: return kOpen;
    case NetworkKind::short_circuit: return 0.0;
    case NetworkKind::single:
      return n.element == model::ElementKind::resistor    ? n.value
             : n.element == model::ElementKind::capacitor ? kOpen
                                                            : 0.0;
    case NetworkKind::series: {
      double sum = 0.0;
      for (const LoadNetwork& p : n.parts) sum += dc_resistance(p);
      return sum;
    }
    case NetworkKind::parallel: {
      double conductance = 0.0;
      for (const LoadNetwork& p : n.parts) conductance += 1.0 / dc_resistance(p);
      return 1.0 / conductance;
    }
  }
  return kOpen;
}

/// Round trips until the reflections between the worst-matched pair of ends have fallen
/// under the tolerance: |Gamma_a Gamma_b|^n <= tolerance, with each end's Gamma taken from
/// its DC termination against the line's Z0. At least 2, at most 20.
int settling_round_trips(const Circuit& circuit, double tolerance) {
  std::map<std::string, double> termination;  // node -> resistance to ground at DC
  for (const model::Drive& d : circuit.drives) termination[d.node] = d.source_resistance;
  for (const model::Load& l : circuit.loads) {
    const double r = dc_resistance(l.network);
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
  double shortest_ramp = std::numeric_limits<double>::infinity();
  for (const model::Drive& d : circuit.drives) {
    const double rise = d.rise.value_or(circuit.settings.rise.value_or(0.0));
    if (rise > 0.0) shortest_ramp = std::min(shortest_ramp, rise / 0.8);
  }
  for (const double closing : plan.closing)
    if (closing > 0.0) shortest_ramp = std::min(shortest_ramp, closing);
  double shortest_section = std::numeric_limits<double>::infinity();
  for (std::size_t k = 0; k < circuit.lines.size() && k < plan.lines.size(); ++k)
    if (plan.lines[k].sections > 0)
      shortest_section =
          std::min(shortest_section, circuit.lines[k].delay / plan.lines[k].sections);
  const double step = std::min(shortest_ramp / 40.0, shortest_section / 8.0);
  return std::isfinite(step) ? step : plan.window / 1000.0;
}

Plan plan_circuit(const Circuit& circuit, syntax::Diagnostics& diagnostics) {
  Plan plan;
  Components parts(circuit);
  std::map<int, double> fastest_edge;  // component -> smallest drive rise time
  double last_event = 0.0;             // s, when the last drive has finished changing
  for (const model::Drive& d : circuit.drives) {
    const double rise = d.rise.value_or(circuit.settings.rise.value_or(0.0));
    if (!(rise > 0.0)) continue;  // reported by the resolver
    const int part = parts.of(d.node);
    auto [it, fresh] = fastest_edge.emplace(part, rise);
    if (!fresh) it->second = std::min(it->second, rise);
    const double ramp = rise / 0.8;
    double end = d.at + ramp;
    if (d.kind == model::WaveKind::pulse) end += d.width.value_or(0.0) + ramp;
    last_event = std::max(last_event, end);
  }
  for (const model::Load& l : circuit.loads) last_event = std::max(last_event, l.at.value_or(0.0));

  // A charged line makes the deck start from its initial conditions (uic), not from a DC
  // operating point: everything else starts at rest, so a drive must start at 0 V too.
  const bool charged = std::any_of(circuit.lines.begin(), circuit.lines.end(),
                                   [](const Line& l) { return l.charged.has_value(); });
  for (const model::Drive& d : circuit.drives) {
    if (charged && d.low != 0.0)
      diagnostics.error(d.span, fmt::format("this design has a charged line, so it starts from "
                                            "rest; drive '{}' must start at 0V, not {:g}V",
                                            d.node, d.low));
  }

  std::map<int, double> part_delay;  // component -> sum of its line delays
  for (const Line& line : circuit.lines) {
    part_delay[parts.of(line.near)] += line.delay;
    LinePlan lp;
    lp.shape = line.shape.value_or(circuit.settings.shape);
    lp.tolerance = line.tolerance.value_or(circuit.settings.tolerance);
    auto edge = fastest_edge.find(parts.of(line.near));
    if (line.rise) {
      lp.rise = *line.rise;
    } else if (edge != fastest_edge.end()) {
      lp.rise = edge->second;
    } else if (circuit.settings.rise) {
      lp.rise = *circuit.settings.rise;
    } else {
      diagnostics.error(line.span, fmt::format("no drive reaches line '{}', so nothing says how "
                                               "fast its edges are; give it rise= or write set "
                                               "rise",
                                               line.name));
      plan.lines.push_back(lp);
      continue;
    }
    lp.fixed = line.sections.has_value();
    set_sections(line, lp,
                 line.sections.value_or(
                     analytic_sections(line.delay, lp.rise, lp.tolerance, lp.shape)));
    lp.rule_sections = rule_of_thumb_sections(line.delay, lp.rise);
    lp.rule_predicted_error =
        estimate_ladder_error(line.delay, lp.rise, lp.rule_sections, lp.shape).total();
    lp.bandwidth = knee_frequency(lp.rise);
    plan.elements += lp.elements;
    plan.lines.push_back(lp);
  }

  const double slowest_part =
      std::accumulate(part_delay.begin(), part_delay.end(), 0.0,
                      [](double m, const auto& p) { return std::max(m, p.second); });
  const int trips = settling_round_trips(circuit, circuit.settings.tolerance);
  plan.window = circuit.settings.window.value_or(last_event + (2.0 * trips + 1.0) * slowest_part);
  plan.closing.assign(circuit.loads.size(), 0.0);
  for (std::size_t i = 0; i < circuit.loads.size(); ++i) {
    const model::Load& load = circuit.loads[i];
    if (!load.at) continue;
    double rise = std::numeric_limits<double>::infinity();
    for (std::size_t k = 0; k < circuit.lines.size(); ++k)
      if ((circuit.lines[k].near == load.node || circuit.lines[k].far == load.node) &&
          plan.lines[k].rise > 0.0)
        rise = std::min(rise, plan.lines[k].rise);
    if (std::isfinite(rise)) plan.closing[i] = rise / 0.8;
  }
  plan.time_step = deck_time_step(circuit, plan);
  return plan;
}

}  // namespace rungs::plan
