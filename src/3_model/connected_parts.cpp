// Connected parts of a circuit: its lines joined at their end nodes, by union-find.
#include "3_model/connected_parts.h"

#include <unordered_map>

namespace rungs::model {

DisjointSets::DisjointSets(std::size_t count) : parent_(count) {
  for (std::size_t i = 0; i < count; ++i) parent_[i] = i;
}

std::size_t DisjointSets::add() {
  parent_.push_back(parent_.size());
  return parent_.size() - 1;
}

std::size_t DisjointSets::find(std::size_t i) {
  while (parent_[i] != i) i = parent_[i] = parent_[parent_[i]];
  return i;
}

void DisjointSets::unite(std::size_t a, std::size_t b) {
  parent_[find(a)] = find(b);
}

ConnectedParts::ConnectedParts(const Circuit& circuit) {
  // Hashed, and by views of the circuit's own names: a large board has thousands of nodes,
  // each met several times, and ordered string maps made this a tenth of `rungs emit`.
  std::unordered_map<std::string_view, std::size_t> id;
  DisjointSets sets;
  const auto node = [&](const std::string& name) -> std::optional<std::size_t> {
    if (is_ground(name)) return std::nullopt;
    auto [it, fresh] = id.try_emplace(name, sets.size());
    if (fresh) sets.add();
    return it->second;
  };
  for (const Line& l : circuit.lines) {
    const auto a = node(l.near);
    const auto b = node(l.far);
    if (a && b) sets.unite(*a, *b);
  }
  for (const Drive& d : circuit.drives) node(d.node);
  for (const Load& l : circuit.loads) node(l.node);

  // Number the parts in the order their first line, drive or load meets them.
  constexpr std::size_t kUnnumbered = static_cast<std::size_t>(-1);
  std::vector<std::size_t> part_of_root(sets.size(), kUnnumbered);
  std::vector<bool> recorded(sets.size(), false);
  const auto part = [&](const std::string& name) -> std::optional<std::size_t> {
    const auto i = node(name);
    if (!i) return std::nullopt;
    std::size_t& p = part_of_root[sets.find(*i)];
    if (p == kUnnumbered) p = count_++;
    if (!recorded[*i]) node_part_.emplace(name, p);
    recorded[*i] = true;
    return p;
  };
  for (const Line& l : circuit.lines) {
    const auto near = part(l.near);
    const auto far = part(l.far);
    line_part_.push_back(near ? *near : far ? *far : count_++);  // both on ground: its own part
  }
  for (const Drive& d : circuit.drives) part(d.node);
  for (const Load& l : circuit.loads) part(l.node);
}

std::optional<std::size_t> ConnectedParts::of_node(std::string_view node) const {
  auto it = node_part_.find(node);
  return it == node_part_.end() ? std::nullopt : std::optional<std::size_t>(it->second);
}

}  // namespace rungs::model
