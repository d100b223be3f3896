// The checks before a circuit is simulated: one set of messages, whichever simulation runs.
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <string>

#include "3_model/circuit.h"
#include "3_model/circuit_checks.h"
#include "4_sim/characteristics.h"
#include "4_sim/frequency_network.h"

using rungs::model::check_simulable;
using rungs::model::Circuit;
using rungs::model::ElementKind;
using rungs::model::NetworkKind;
using rungs::testing::element;
using rungs::testing::ideal_line;
using rungs::testing::step_drive;

namespace {

Circuit good() {
  Circuit c;
  c.lines.push_back(ideal_line("l", "a", "b", 50.0, 1e-9));
  c.drives.push_back(step_drive("a", 0.0, 1.0, 50.0, 1e-10));
  c.loads.push_back(rungs::testing::load("b", element(ElementKind::resistor, 50.0)));
  return c;
}

/// Both simulations, and the check itself, refuse `c` with `message`.
void check_refused(const Circuit& c, const std::string& message) {
  CHECK_THROWS_WITH(check_simulable(c), message);
  CHECK_THROWS_WITH(rungs::sim::simulate_characteristics(c, 4e-9, 1e-11), message);
  CHECK_THROWS_WITH(rungs::sim::FrequencyNetwork(c, {}, rungs::sim::InitialState::automatic),
                    message);
}

}  // namespace

TEST_CASE("a circuit fit to simulate passes the checks") {
  CHECK_NOTHROW(check_simulable(good()));
}

TEST_CASE("the simulations refuse a circuit with one message for each problem") {
  Circuit c = good();
  c.lines[0].z0 = 0.0;
  check_refused(c, "line 'l' needs a positive, finite z0 and delay");

  c = good();
  c.drives[0].node = "gnd";
  check_refused(c, "a drive cannot be on ground");

  c = good();
  c.drives[0].source_resistance = -1.0;
  check_refused(c, "a source resistance must be zero or positive, and finite");

  c = good();
  c.drives[0].rise.reset();
  check_refused(c, "the drive on 'a' has no rise time");

  c = good();
  c.drives[0].source_resistance = 0.0;
  c.drives.push_back(c.drives[0]);
  check_refused(c, "node 'a' has two drives without source resistance; they would fight");

  c = good();
  c.loads[0].network = element(ElementKind::capacitor, -1e-12);
  check_refused(c, "a load element must be zero or positive, and finite");

  c = good();
  c.drives[0].source_resistance = 0.0;
  c.loads.push_back(rungs::testing::load("a", element(ElementKind::resistor, 0.0)));
  check_refused(c, "node 'a' has a short and a drive without source resistance");
}
