// Connected parts of a circuit: its lines joined at their end nodes, by union-find.
#include "3_model/connected_parts.h"

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
  std::map<std::string, std::size_t, std::less<>> id;
  DisjointSets sets;
  const auto node = [&](const std::string& name) -> std::optional<std::size_t> {
    if (is_ground(name)) return std::nullopt;
    auto [it, fresh] = id.emplace(name, sets.size());
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
  std::map<std::size_t, std::size_t> part_of_root;
  const auto part = [&](const std::string& name) -> std::optional<std::size_t> {
    const auto i = node(name);
    if (!i) return std::nullopt;
    auto [it, fresh] = part_of_root.emplace(sets.find(*i), count_);
    if (fresh) ++count_;
    node_part_.emplace(name, it->second);
    return it->second;
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
