// Cutting the check's responses down to the total waveforms at the line ends.
#include "5_plan/end_traces.h"

#include <algorithm>
#include <cmath>
#include <set>
#include <stdexcept>

namespace rungs::plan {

std::vector<EndTraces> end_traces(const model::Circuit& circuit, const sim::Response& exact,
                                  const sim::Response& ladder) {
  if (exact.nodes != ladder.nodes || exact.t.size() != ladder.t.size() ||
      exact.v.size() != ladder.v.size())
    throw std::invalid_argument("the ladder's response is not on the exact reference's grid");
  double swing = 0.0;
  for (const sim::Excitation& e : exact.excitations) swing = std::max(swing, std::abs(e.swing));
  std::vector<EndTraces> out;
  std::set<std::string> seen;
  for (const model::Line& line : circuit.lines) {
    for (const std::string* node : {&line.near, &line.far}) {
      if (model::is_ground(*node) || !seen.insert(*node).second) continue;
      const std::optional<std::size_t> i = exact.node_index(*node);
      if (!i) throw std::invalid_argument("the exact reference is not of this circuit");
      EndTraces traces{*node, exact.t, std::vector<double>(exact.t.size(), 0.0),
                       std::vector<double>(exact.t.size(), 0.0), swing};
      for (std::size_t c = 0; c < exact.v.size(); ++c)
        for (std::size_t j = 0; j < exact.t.size(); ++j) {
          traces.exact[j] += exact.v[c][*i][j];
          traces.ladder[j] += ladder.v[c][*i][j];
        }
      out.push_back(std::move(traces));
    }
  }
  return out;
}

}  // namespace rungs::plan
