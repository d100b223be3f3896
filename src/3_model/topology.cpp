// Checks on how the lines, drives and loads of a circuit connect.
#include <map>
#include <set>

#include <fmt/format.h>

#include "1_syntax/ast.h"
#include "1_syntax/suggest.h"
#include "1_syntax/text.h"
#include "3_model/resolve.h"

namespace rungs::model {

namespace {

using syntax::Diagnostics;
using syntax::Span;

std::string where(const Diagnostics& d, Span span) {
  const syntax::Location at = d.file().locate(span.begin);
  return fmt::format("{}:{}", at.line, at.column);
}

/// Remembers the first spelling of each name and reports a second one that is the same,
/// or the same once case is folded.
class NameBook {
 public:
  NameBook(std::string_view kind, Diagnostics& d) : kind_(kind), d_(d) {}

  void add(const std::string& name, Span span) {
    auto [it, fresh] = by_folded_.emplace(syntax::fold_case(name), Entry{name, span});
    if (fresh) return;
    if (it->second.name == name) {
      d_.error(span, fmt::format("{} '{}' is already defined at {}; give each {} its own name",
                                 kind_, name, where(d_, it->second.span), kind_));
    } else {
      d_.error(span, fmt::format("{} '{}' differs from '{}' (at {}) only in case; simulators "
                                 "fold case, so rename one",
                                 kind_, name, it->second.name, where(d_, it->second.span)));
    }
  }

 private:
  struct Entry {
    std::string name;
    Span span;
  };
  std::string_view kind_;
  Diagnostics& d_;
  std::map<std::string, Entry> by_folded_;
};

/// Where the line ends touch nodes: the first spelling of each node (by its folded name), how
/// many line ends reach each node, and the nodes in the order lines first reach them.
struct LineEnds {
  std::map<std::string, std::pair<std::string, Span>> spelling;
  std::map<std::string, int> count;
  std::vector<std::string_view> nodes;  // into `spelling`
};

/// Fills `ends` from the lines, reporting a line end on ground, a node spelt in two cases and
/// a line whose two ends are one node.
void read_line_ends(const Circuit& circuit, Diagnostics& d, LineEnds& ends) {
  for (const Line& line : circuit.lines) {
    for (const std::string* end : {&line.near, &line.far}) {
      const Span end_span = end == &line.near ? line.near_span : line.far_span;
      if (is_ground(*end)) {
        d.error(end_span, fmt::format("line '{}' has an end on ground; a line runs between two "
                                       "nodes and ground is its reference already",
                                       line.name));
        continue;
      }
      const std::string key = syntax::fold_case(*end);
      auto [it, fresh] = ends.spelling.emplace(key, std::make_pair(*end, end_span));
      if (!fresh && it->second.first != *end)
        d.error(end_span, fmt::format("node '{}' differs from node '{}' (at {}) only in case; "
                                      "simulators fold case, so write one spelling",
                                      *end, it->second.first, where(d, it->second.second)));
      if (fresh) ends.nodes.push_back(it->second.first);
      ++ends.count[*end];
    }
    if (line.near == line.far && !is_ground(line.near))
      d.error(line.span, fmt::format("line '{}' starts and ends on node '{}'; its two ends "
                                     "need two nodes",
                                     line.name, line.near));
  }
}

/// Warns of each line end that touches nothing else (no other line end, drive or load).
void warn_open_ends(const Circuit& circuit, LineEnds& ends,
                    const std::map<std::string, Span>& drive_at,
                    const std::map<std::string, Span>& load_at, Diagnostics& d) {
  for (const Line& line : circuit.lines) {
    for (const std::string* end : {&line.near, &line.far}) {
      if (is_ground(*end) || ends.count[*end] > 1 || drive_at.count(*end) || load_at.count(*end))
        continue;
      d.warning(end == &line.near ? line.near_span : line.far_span,
                fmt::format("the {} end of line '{}' (node '{}') connects to nothing "
                            "else; it is treated as open",
                            end == &line.near ? "near" : "far", line.name, *end));
    }
  }
}

}  // namespace

void check_topology(const Circuit& circuit, Diagnostics& d, bool check_reach) {
  NameBook line_names("line", d);
  for (const Line& line : circuit.lines) line_names.add(line.name, line.span);
  LineEnds ends;
  read_line_ends(circuit, d, ends);

  auto check_reached = [&](const std::string& node, Span span, std::string_view what) {
    if (is_ground(node)) {
      d.error(span, fmt::format("a {} cannot sit on ground; put it on a line end", what));
      return false;
    }
    if (ends.count.count(node) || !check_reach) return true;
    const std::string near = syntax::nearest(node, ends.nodes);
    d.error(span, fmt::format("{} on node '{}', which no line reaches{}", what, node,
                              near.empty() ? "" : fmt::format("; did you mean '{}'?", near)));
    return false;
  };

  std::map<std::string, Span> drive_at;
  std::map<std::string, Span> load_at;
  for (const Drive& drive : circuit.drives) {
    if (!check_reached(drive.node, drive.span, "drive")) continue;
    if (auto [it, fresh] = drive_at.emplace(drive.node, drive.span); !fresh)
      d.error(drive.span, fmt::format("node '{}' already has a drive at {}; a node takes one "
                                      "drive",
                                      drive.node, where(d, it->second)));
  }
  for (const Load& load : circuit.loads) {
    if (!check_reached(load.node, load.span, "load")) continue;
    if (auto [it, fresh] = load_at.emplace(load.node, load.span); !fresh)
      d.error(load.span, fmt::format("node '{}' already has a load at {}; combine them in one "
                                     "load with || (parallel)",
                                     load.node, where(d, it->second)));
  }
  if (check_reach) warn_open_ends(circuit, ends, drive_at, load_at, d);
}

}  // namespace rungs::model
