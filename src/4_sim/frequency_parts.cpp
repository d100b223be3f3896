// Connected parts of a circuit: its lines joined at their end nodes, by union-find.
#include "4_sim/frequency_parts.h"

#include <map>
#include <optional>
#include <string>

#include "3_model/circuit.h"

namespace rungs::sim {

using model::Circuit;

std::vector<CircuitPart> connected_parts(const Circuit& circuit) {
  std::map<std::string, std::size_t> id;
  std::vector<std::size_t> parent;
  const auto node = [&](const std::string& name) -> std::optional<std::size_t> {
    if (model::is_ground(name)) return std::nullopt;
    auto [it, fresh] = id.emplace(name, parent.size());
    if (fresh) parent.push_back(it->second);
    return it->second;
  };
  const auto find = [&](std::size_t i) {
    while (parent[i] != i) i = parent[i] = parent[parent[i]];
    return i;
  };
  for (const model::Line& l : circuit.lines) {
    const auto a = node(l.near);
    const auto b = node(l.far);
    if (a && b) parent[find(*a)] = find(*b);
  }
  for (const model::Drive& d : circuit.drives) node(d.node);
  for (const model::Load& l : circuit.loads) node(l.node);
  std::vector<CircuitPart> parts;
  std::map<std::size_t, std::size_t> part_of_root;
  const auto part = [&](const std::string& name) -> CircuitPart* {
    const auto i = node(name);
    if (!i) return nullptr;
    auto [it, fresh] = part_of_root.emplace(find(*i), parts.size());
    if (fresh) {
      parts.emplace_back();
      parts.back().circuit.name = circuit.name;
      parts.back().circuit.settings = circuit.settings;
    }
    return &parts[it->second];
  };
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    const model::Line& l = circuit.lines[k];
    CircuitPart* p = part(l.near);
    if (!p) p = part(l.far);
    if (!p) {  // both ends on ground: a part of its own
      parts.emplace_back();
      parts.back().circuit.name = circuit.name;
      parts.back().circuit.settings = circuit.settings;
      p = &parts.back();
    }
    p->lines.push_back(k);
    p->circuit.lines.push_back(l);
  }
  for (std::size_t d = 0; d < circuit.drives.size(); ++d)
    if (CircuitPart* p = part(circuit.drives[d].node)) {
      p->drives.push_back(d);
      p->circuit.drives.push_back(circuit.drives[d]);
    }
  for (std::size_t l = 0; l < circuit.loads.size(); ++l)
    if (CircuitPart* p = part(circuit.loads[l].node)) {
      p->loads.push_back(l);
      p->circuit.loads.push_back(circuit.loads[l]);
    }
  return parts;
}

}  // namespace rungs::sim
