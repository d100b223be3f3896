// The connected parts of a circuit (nodes joined through lines), by one union-find.
#pragma once
#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "3_model/circuit.h"

namespace rungs::model {

/// Disjoint sets of the indices 0 .. size()-1 (union-find with path halving): which elements
/// have been joined, directly or through others.
class DisjointSets {
 public:
  explicit DisjointSets(std::size_t count = 0);
  /// A new element in a set of its own; returns its index.
  std::size_t add();
  /// The representative of i's set: the same for every element joined to i.
  std::size_t find(std::size_t i);
  /// Joins the sets of a and b.
  void unite(std::size_t a, std::size_t b);
  std::size_t size() const { return parent_.size(); }

 private:
  std::vector<std::size_t> parent_;
};

/// The connected parts of a circuit: line ends joined through lines, ground joining nothing
/// (a line end on ground is a shorted end, not a connection). Parts are numbered 0, 1, ... in
/// the order of their first line, then of the nodes that only drives and loads touch, in the
/// order of the drives and then the loads.
class ConnectedParts {
 public:
  explicit ConnectedParts(const Circuit& circuit);

  /// How many parts there are.
  std::size_t count() const { return count_; }
  /// The part of a node the circuit names; none for ground or an unknown node.
  std::optional<std::size_t> of_node(std::string_view node) const;
  /// The part of circuit.lines[k]: its near end's, else its far end's; a line with both ends
  /// on ground is a part of its own.
  std::size_t of_line(std::size_t k) const { return line_part_[k]; }

 private:
  std::map<std::string, std::size_t, std::less<>> node_part_;
  std::vector<std::size_t> line_part_;
  std::size_t count_ = 0;
};

}  // namespace rungs::model
