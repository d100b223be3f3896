// Connected parts of a circuit, each cut out as a circuit of its own.
#include "4_sim/frequency_parts.h"

#include "3_model/circuit.h"
#include "3_model/connected_parts.h"

namespace rungs::sim {

using model::Circuit;

std::vector<CircuitPart> connected_parts(const Circuit& circuit) {
  const model::ConnectedParts connected(circuit);
  std::vector<CircuitPart> parts(connected.count());
  for (CircuitPart& p : parts) {
    p.circuit.name = circuit.name;
    p.circuit.settings = circuit.settings;
  }
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    CircuitPart& p = parts[connected.of_line(k)];
    p.lines.push_back(k);
    p.circuit.lines.push_back(circuit.lines[k]);
  }
  for (std::size_t d = 0; d < circuit.drives.size(); ++d)
    if (const auto i = connected.of_node(circuit.drives[d].node)) {
      parts[*i].drives.push_back(d);
      parts[*i].circuit.drives.push_back(circuit.drives[d]);
    }
  for (std::size_t l = 0; l < circuit.loads.size(); ++l)
    if (const auto i = connected.of_node(circuit.loads[l].node)) {
      parts[*i].loads.push_back(l);
      parts[*i].circuit.loads.push_back(circuit.loads[l]);
    }
  return parts;
}

}  // namespace rungs::sim
