// Formatting the line figures of a circuit as a text table and as JSON.
#include "7_report/lines_table.h"

#include <algorithm>
#include <array>

#include <fmt/format.h>

#include "2_physics/constants.h"
#include "7_report/json_writer.h"

namespace rungs::report {

namespace {

using model::Line;

/// Per-length L' and C' exist when the line's speed is known.
bool has_per_length(const Line& line) { return line.velocity > 0.0; }

std::string figure(double value, double scale) { return fmt::format("{:.4g}", value / scale); }

}  // namespace

std::string lines_table(const model::Circuit& circuit) {
  const std::array<std::string, 11> heading = {"line",  "model",   "Z0/ohm",  "delay/ns",
                                               "vf",    "L'/nH/m", "C'/pF/m", "R'/ohm/m",
                                               "G'/mS/m", "eps_eff", "length/m"};
  std::vector<std::array<std::string, 11>> rows;
  for (const Line& line : circuit.lines) {
    const bool known = has_per_length(line);
    rows.push_back({line.name,
                    line.model,
                    figure(line.z0, 1.0),
                    figure(line.delay, 1e-9),
                    known ? figure(line.velocity, physics::kSpeedOfLight) : "-",
                    known ? figure(line.per_length.l, 1e-9) : "-",
                    known ? figure(line.per_length.c, 1e-12) : "-",
                    figure(line.per_length.r, 1.0),
                    figure(line.per_length.g, 1e-3),
                    known ? figure(line.eps_eff, 1.0) : "-",
                    line.length ? figure(*line.length, 1.0) : "-"});
  }
  std::array<std::size_t, 11> width{};
  for (std::size_t i = 0; i < width.size(); ++i) {
    width[i] = heading[i].size();
    for (const auto& row : rows) width[i] = std::max(width[i], row[i].size());
  }
  auto format_row = [&](const std::array<std::string, 11>& row) {
    std::string out;
    for (std::size_t i = 0; i < row.size(); ++i) {
      // Names left-aligned, figures right-aligned so their digits line up.
      out += i < 2 ? fmt::format("{:<{}}", row[i], width[i]) : fmt::format("{:>{}}", row[i], width[i]);
      out += i + 1 < row.size() ? "  " : "\n";
    }
    return out;
  };
  std::string out = fmt::format("design {}: {} line{}\n", circuit.name, circuit.lines.size(),
                                circuit.lines.size() == 1 ? "" : "s");
  out += format_row(heading);
  for (const auto& row : rows) out += format_row(row);
  return out;
}

std::string lines_json(const model::Circuit& circuit) {
  JsonWriter json;
  json.begin_object().key("version").value(1).key("design").value(circuit.name);
  json.key("lines").begin_array();
  for (const Line& line : circuit.lines) {
    const bool known = has_per_length(line);
    auto maybe = [&](double v) { return known ? std::optional<double>(v) : std::nullopt; };
    json.begin_object()
        .key("name").value(line.name)
        .key("model").value(line.model)
        .key("z0").value(line.z0)
        .key("delay").value(line.delay)
        .key("velocity").value(maybe(line.velocity))
        .key("l").value(maybe(line.per_length.l))
        .key("c").value(maybe(line.per_length.c))
        .key("r").value(line.per_length.r)
        .key("g").value(line.per_length.g)
        .key("eps_eff").value(maybe(line.eps_eff))
        .key("length").value(line.length)
        .end_object();
  }
  json.end_array().end_object();
  return json.str();
}

}  // namespace rungs::report
