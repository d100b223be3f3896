// What every simulation of a circuit needs of it, checked in one place with one set of messages.
#include "3_model/circuit_checks.h"

#include <cmath>
#include <set>
#include <stdexcept>
#include <string>

#include <fmt/format.h>

#include "3_model/edges.h"
#include "3_model/load_network.h"

namespace rungs::model {

double simulated_ramp(const Drive& drive, const Settings& settings) {
  const std::optional<Edge> edge = drive_edge(drive, settings);
  if (!edge || !(edge->rise >= 0.0))
    throw std::invalid_argument(fmt::format("the drive on '{}' has no rise time", drive.node));
  if (drive.kind == WaveKind::pulse && !drive.width)
    throw std::invalid_argument(fmt::format("the pulse on '{}' has no width", drive.node));
  return edge->ramp;
}

void check_simulable(const Circuit& circuit) {
  for (const Line& line : circuit.lines)
    if (!(line.z0 > 0.0) || !std::isfinite(line.z0) || !(line.delay > 0.0) ||
        !std::isfinite(line.delay))
      throw std::invalid_argument(
          fmt::format("line '{}' needs a positive, finite z0 and delay", line.name));
  std::set<std::string> forced;  // nodes of drives without source resistance
  for (const Drive& drive : circuit.drives) {
    if (is_ground(drive.node)) throw std::invalid_argument("a drive cannot be on ground");
    const double rs = drive.source_resistance;
    if (!(rs >= 0.0) || !std::isfinite(rs))
      throw std::invalid_argument("a source resistance must be zero or positive, and finite");
    simulated_ramp(drive, circuit.settings);
    if (rs == 0.0 && !forced.insert(drive.node).second)
      throw std::invalid_argument(fmt::format(
          "node '{}' has two drives without source resistance; they would fight", drive.node));
  }
  for (const Load& load : circuit.loads) {
    const LoadAdmittance::Kind form = load_form(load.network);
    if (form == LoadAdmittance::Kind::short_circuit && !is_ground(load.node) &&
        forced.count(load.node))
      throw std::invalid_argument(
          fmt::format("node '{}' has a short and a drive without source resistance", load.node));
  }
}

}  // namespace rungs::model
