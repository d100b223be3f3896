// The edge of every drive and line, derived once from the options and the connected parts.
#include "3_model/edges.h"

#include <algorithm>
#include <vector>

#include "3_model/connected_parts.h"

namespace rungs::model {

std::optional<Edge> drive_edge(const Drive& drive, const Settings& settings) {
  const std::optional<double> rise = drive.rise ? drive.rise : settings.rise;
  if (!rise) return std::nullopt;
  return edge_of(*rise);
}

void derive_edges(Circuit& circuit) {
  for (Drive& d : circuit.drives) d.edge = drive_edge(d, circuit.settings);
  // A line without rise= sees the fastest edge that can reach it: of a drive in its part.
  const ConnectedParts parts(circuit);
  std::vector<std::optional<double>> fastest(parts.count());
  for (const Drive& d : circuit.drives) {
    const auto part = parts.of_node(d.node);
    if (!part || !d.edge || !(d.edge->rise > 0.0)) continue;  // a bad rise is reported
    std::optional<double>& f = fastest[*part];
    f = f ? std::min(*f, d.edge->rise) : d.edge->rise;
  }
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    Line& line = circuit.lines[k];
    std::optional<double> rise = line.rise;
    if (!rise) rise = fastest[parts.of_line(k)];
    if (!rise) rise = circuit.settings.rise;
    line.edge = rise ? std::optional<Edge>(edge_of(*rise)) : std::nullopt;
  }
}

}  // namespace rungs::model
