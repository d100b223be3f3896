// The model stage's edges and connected parts: which rise time reaches each line and drive.
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <string>

#include "1_syntax/diagnostics.h"
#include "1_syntax/parser.h"
#include "3_model/circuit.h"
#include "3_model/connected_parts.h"
#include "3_model/edges.h"
#include "3_model/resolve.h"

using rungs::model::Circuit;
using rungs::model::ConnectedParts;
using rungs::model::derive_edges;
using rungs::model::DisjointSets;
using rungs::model::ramp_time;
using rungs::testing::ideal_line;
using rungs::testing::step_drive;

TEST_CASE("a linear ramp's whole time is its 10-90 % time over 0.8") {
  // The 10-90 % part of a linear ramp is 0.8 of it (definition of the 10-90 % rise time).
  CHECK(ramp_time(0.8e-9) == Approx(1e-9));
  CHECK(ramp_time(200e-12) == Approx(250e-12));
  CHECK(rungs::model::edge_of(200e-12).ramp == ramp_time(200e-12));
}

TEST_CASE("disjoint sets join what was joined, directly or through others") {
  DisjointSets sets(4);
  sets.unite(0, 1);
  sets.unite(2, 1);
  CHECK(sets.find(0) == sets.find(2));
  CHECK(sets.find(3) != sets.find(0));
  const std::size_t added = sets.add();
  CHECK(added == 4);
  CHECK(sets.find(added) == added);
  CHECK(sets.size() == 5);
}

TEST_CASE("connected parts join lines at their ends, ground joins nothing") {
  Circuit c;
  c.lines.push_back(ideal_line("a", "x", "y", 50.0, 1e-9));
  c.lines.push_back(ideal_line("b", "p", "q", 50.0, 1e-9));
  c.lines.push_back(ideal_line("c", "y", "z", 50.0, 1e-9));
  c.lines.push_back(ideal_line("stub1", "s", "0", 50.0, 1e-9));
  c.lines.push_back(ideal_line("stub2", "t", "0", 50.0, 1e-9));
  c.drives.push_back(step_drive("lonely", 0.0, 1.0, 50.0, 1e-10));
  c.loads.push_back(rungs::testing::load("only_load", {}));
  const ConnectedParts parts(c);
  // Numbered by first line, then by the nodes only drives and then loads touch.
  CHECK(parts.count() == 6);
  CHECK(parts.of_line(0) == 0);
  CHECK(parts.of_line(1) == 1);
  CHECK(parts.of_line(2) == 0);
  CHECK(parts.of_line(3) == 2);
  CHECK(parts.of_line(4) == 3);  // a shorted stub shares ground with the other, not a part
  CHECK(parts.of_node("z") == 0u);
  CHECK(parts.of_node("lonely") == 4u);
  CHECK(parts.of_node("only_load") == 5u);
  CHECK_FALSE(parts.of_node("0"));
  CHECK_FALSE(parts.of_node("nowhere"));
}

TEST_CASE("a line's edge is its own rise, else its part's fastest drive, else set rise") {
  Circuit c;
  c.settings.rise = 1e-9;
  c.lines.push_back(ideal_line("first", "a", "m", 50.0, 1e-9));
  c.lines.push_back(ideal_line("second", "m", "b", 50.0, 1e-9));
  c.lines.push_back(ideal_line("apart", "p", "q", 50.0, 1e-9));
  c.lines.push_back(ideal_line("own", "u", "v", 50.0, 1e-9));
  c.lines.back().rise = 50e-12;
  c.drives.push_back(step_drive("a", 0.0, 1.0, 50.0, 300e-12));
  c.drives.push_back(step_drive("b", 0.0, 1.0, 50.0, 200e-12));
  c.drives.push_back(step_drive("v", 0.0, 1.0, 50.0, 100e-12));
  c.drives.push_back(step_drive("q", 0.0, 1.0, 50.0, 400e-12));
  c.drives.back().rise.reset();  // takes set rise
  derive_edges(c);
  REQUIRE(c.lines[0].edge);
  CHECK(c.lines[0].edge->rise == 200e-12);  // the faster of the part's two drives
  CHECK(c.lines[1].edge->rise == 200e-12);
  CHECK(c.lines[0].edge->ramp == ramp_time(200e-12));
  CHECK(c.lines[2].edge->rise == 1e-9);    // its drive has no rise= and takes set rise
  CHECK(c.lines[3].edge->rise == 50e-12);  // rise= wins over a faster drive
  REQUIRE(c.drives[3].edge);
  CHECK(c.drives[3].edge->rise == 1e-9);
  CHECK(c.drives[0].edge->ramp == ramp_time(300e-12));

  // With no set rise, a line that no drive with a rise reaches has no edge.
  c.settings.rise.reset();
  derive_edges(c);
  CHECK_FALSE(c.drives[3].edge);
  CHECK_FALSE(c.lines[2].edge);
  CHECK(c.lines[0].edge->rise == 200e-12);
}

TEST_CASE("resolve stores the edges of the circuit it makes") {
  const rungs::syntax::InputFile file{"edges.rungs",
                                       "set rise 1ns\n"
                                       "line near a -> m ideal z0=50ohm delay=1ns\n"
                                       "line far m -> b ideal z0=50ohm delay=1ns\n"
                                       "line lone p -> q ideal z0=50ohm delay=1ns\n"
                                       "drive a step 0V to 1V rise=200ps source=50ohm\n"
                                       "drive p step 0V to 1V source=50ohm\n"
                                       "load b 50ohm\n"
                                       "load q 50ohm\n"};
  rungs::syntax::Diagnostics diagnostics(file);
  const Circuit c =
      rungs::model::resolve(rungs::syntax::parse_description(diagnostics), diagnostics);
  INFO(diagnostics.render());
  REQUIRE_FALSE(diagnostics.has_errors());
  REQUIRE(c.lines.size() == 3);
  CHECK(c.lines[1].edge->rise == Approx(200e-12));
  CHECK(c.lines[2].edge->rise == Approx(1e-9));
  CHECK(c.drives[1].edge->ramp == Approx(1.25e-9));
}
