// Diagnostics for malformed descriptions: each test parses and resolves a small in-memory
// description and checks the exact rendered text of every message (location, message,
// source line and caret), so the line, the column and the span under the caret are all held
// to what a user sees.
#include <catch2/catch.hpp>

#include <string>
#include <utility>

#include "3_model/resolve.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/parser.h"
#include "1_syntax/input_file.h"

namespace {

/// Parses and resolves `text` as the file bad.rungs; returns every diagnostic as rendered.
std::string diagnose(std::string text) {
  const rungs::syntax::InputFile file{"bad.rungs", std::move(text)};
  rungs::syntax::Diagnostics diagnostics(file);
  const auto description = rungs::syntax::parse_description(diagnostics);
  (void)rungs::model::resolve(description, diagnostics);
  return diagnostics.render();
}

}  // namespace

TEST_CASE("an unknown statement suggests the nearest keyword", "[syntax]") {
  CHECK(diagnose("lien a x -> y ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:1: error: unknown statement 'lien'; did you mean 'line'?\n"
        "lien a x -> y ideal z0=50ohm delay=1ns\n"
        "^~~~\n");
}

TEST_CASE("a capitalised keyword is an unknown statement that suggests the lower-case one", "[syntax]") {
  CHECK(diagnose("Line a x -> y ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:1: error: unknown statement 'Line'; did you mean 'line'?\n"
        "Line a x -> y ideal z0=50ohm delay=1ns\n"
        "^~~~\n");
}

TEST_CASE("a line that starts with a symbol lists the statements", "[syntax]") {
  CHECK(diagnose("-> a\n") ==
        "bad.rungs:1:1: error: expected a statement (design, set, line, drive or load), found '->'\n"
        "-> a\n"
        "^~\n");
}

TEST_CASE("a missing arrow is reported at the far node", "[syntax]") {
  CHECK(diagnose("line a x y ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:10: error: expected '->' between the two ends, found 'y'\n"
        "line a x y ideal z0=50ohm delay=1ns\n"
        "         ^\n");
}

TEST_CASE("a wrong arrow is reported as the arrow it should be", "[syntax]") {
  CHECK(diagnose("line a x => y ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:10: error: expected '->' between the two ends, found '=>'\n"
        "line a x => y ideal z0=50ohm delay=1ns\n"
        "         ^~\n");
}

TEST_CASE("a line without its name shows the whole form", "[syntax]") {
  CHECK(diagnose("line a -> y ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:8: error: expected a line name before its ends: line NAME NEAR -> FAR MODEL key=value...\n"
        "line a -> y ideal z0=50ohm delay=1ns\n"
        "       ^~\n");
}

TEST_CASE("a missing model is reported at the end of the line", "[syntax]") {
  CHECK(diagnose("line a x -> y\n") ==
        "bad.rungs:1:14: error: expected a model name such as coax, found the end of the line\n"
        "line a x -> y\n"
        "             ^\n");
}

TEST_CASE("a missing model is reported before a trailing comment", "[syntax]") {
  CHECK(diagnose("line a x -> y  # model to follow\n") ==
        "bad.rungs:1:16: error: expected a model name such as coax, found the end of the line\n"
        "line a x -> y  # model to follow\n"
        "               ^\n");
}

TEST_CASE("a missing 'to' between the levels of a step", "[syntax]") {
  CHECK(diagnose("drive x step 0V 1V rise=1ns\n") ==
        "bad.rungs:1:17: error: expected 'to' between the two levels, found '1V'\n"
        "drive x step 0V 1V rise=1ns\n"
        "                ^~\n");
}

TEST_CASE("a pulse that stops after its first level needs 'to'", "[syntax]") {
  CHECK(diagnose("drive x pulse 0V\n") ==
        "bad.rungs:1:17: error: expected 'to' between the two levels, found the end of the line\n"
        "drive x pulse 0V\n"
        "                ^\n");
}

TEST_CASE("an unknown waveform lists the waveforms", "[syntax]") {
  CHECK(diagnose("drive x ramp 0V to 1V rise=1ns\n") ==
        "bad.rungs:1:9: error: unknown waveform 'ramp'; expected one of step, pulse, dc\n"
        "drive x ramp 0V to 1V rise=1ns\n"
        "        ^~~~\n");
}

TEST_CASE("a misspelt waveform suggests the nearest one", "[syntax]") {
  CHECK(diagnose("drive x stpe 0V to 1V rise=1ns\n") ==
        "bad.rungs:1:9: error: unknown waveform 'stpe'; did you mean 'step'?\n"
        "drive x stpe 0V to 1V rise=1ns\n"
        "        ^~~~\n");
}

TEST_CASE("a misspelt load keyword suggests open", "[syntax]") {
  CHECK(diagnose("load y opne\n") ==
        "bad.rungs:1:8: error: expected a load, found 'opne'; did you mean 'open'?\n"
        "load y opne\n"
        "       ^~~~\n");
}

TEST_CASE("an empty load says what a load is", "[syntax]") {
  CHECK(diagnose("load y\n") ==
        "bad.rungs:1:7: error: expected a load (open, short, or values such as 50ohm || 4pF), found the end of the line\n"
        "load y\n"
        "      ^\n");
}

TEST_CASE("an unclosed bracket in a load", "[syntax]") {
  CHECK(diagnose("load y (50ohm + 1nF\n") ==
        "bad.rungs:1:20: error: expected ')', found the end of the line\n"
        "load y (50ohm + 1nF\n"
        "                   ^\n");
}

TEST_CASE("series then parallel without brackets", "[syntax]") {
  CHECK(diagnose("load y 50ohm + 1nF || 10kohm\n") ==
        "bad.rungs:1:20: error: '+' and '||' cannot be mixed without brackets; write for example (50ohm + 1nF) || 10kohm\n"
        "load y 50ohm + 1nF || 10kohm\n"
        "                   ^~\n");
}

TEST_CASE("parallel then series without brackets", "[syntax]") {
  CHECK(diagnose("load y 50ohm || 1nF + 10kohm\n") ==
        "bad.rungs:1:21: error: '+' and '||' cannot be mixed without brackets; write for example (50ohm + 1nF) || 10kohm\n"
        "load y 50ohm || 1nF + 10kohm\n"
        "                    ^\n");
}

TEST_CASE("a parameter with no value at the end of the line", "[syntax]") {
  CHECK(diagnose("line a x -> y ideal delay=1ns z0=\n") ==
        "bad.rungs:1:34: error: expected a value right after 'z0=', found the end of the line\n"
        "line a x -> y ideal delay=1ns z0=\n"
        "                                 ^\n");
}

TEST_CASE("a stray symbol after the parameters", "[syntax]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns ;\n") ==
        "bad.rungs:1:40: error: expected key=value or the end of the line, found ';'\n"
        "line a x -> y ideal z0=50ohm delay=1ns ;\n"
        "                                       ^\n");
}

TEST_CASE("a stray word after the parameters says how a parameter is written", "[syntax]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns extra\n") ==
        "bad.rungs:1:40: error: expected key=value or the end of the line, found 'extra'; a parameter is written extra=VALUE\n"
        "line a x -> y ideal z0=50ohm delay=1ns extra\n"
        "                                       ^~~~~\n");
}

TEST_CASE("a set statement without a setting name", "[syntax]") {
  CHECK(diagnose("set\n") ==
        "bad.rungs:1:4: error: expected a setting name (rise, tolerance, shape or window), found the end of the line\n"
        "set\n"
        "   ^\n");
}

TEST_CASE("a bare number where a unit is required", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50 delay=1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:24: error: '50' needs a unit: write 50ohm for a resistance\n"
        "line a x -> y ideal z0=50 delay=1ns\n"
        "                       ^~\n");
}

TEST_CASE("a bare 1M says it would be read as milli", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=1M delay=1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:24: error: '1M' has a prefix but no unit, and a simulator would read M as milli: write 1Mohm for mega or 1mohm for milli\n"
        "line a x -> y ideal z0=1M delay=1ns\n"
        "                       ^~\n");
}

TEST_CASE("a prefix with no unit", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=10k delay=1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:24: error: '10k' has a prefix but no unit: write 10kohm\n"
        "line a x -> y ideal z0=10k delay=1ns\n"
        "                       ^~~\n");
}

TEST_CASE("the simulator suffix meg", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=1meg delay=1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:24: error: '1meg' uses the simulator suffix 'meg', which is not a unit here: write 1Mohm for mega\n"
        "line a x -> y ideal z0=1meg delay=1ns\n"
        "                       ^~~~\n");
}

TEST_CASE("the simulator suffix Meg", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=1Meg delay=1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:24: error: '1Meg' uses the simulator suffix 'meg', which is not a unit here: write 1Mohm for mega\n"
        "line a x -> y ideal z0=1Meg delay=1ns\n"
        "                       ^~~~\n");
}

TEST_CASE("a case slip in a per-length capacitance", "[units]") {
  CHECK(diagnose("line a x -> y perlength l=250nH/m c=100pf/m length=1m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:37: error: unknown unit 'pf/m' for a capacitance per length; did you mean 'pF/m'? (prefixes are case-sensitive)\n"
        "line a x -> y perlength l=250nH/m c=100pf/m length=1m\n"
        "                                    ^~~~~~~\n");
}

TEST_CASE("a case slip in a time", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1NS\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:36: error: unknown unit 'NS' for a time; did you mean 'ns'? (prefixes are case-sensitive)\n"
        "line a x -> y ideal z0=50ohm delay=1NS\n"
        "                                   ^~~\n");
}

TEST_CASE("a case slip in ohm", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50Ohm delay=1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:24: error: unknown unit 'Ohm' for a resistance; did you mean 'ohm'? (prefixes are case-sensitive)\n"
        "line a x -> y ideal z0=50Ohm delay=1ns\n"
        "                       ^~~~~\n");
}

TEST_CASE("a section count with a fraction", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns sections=2.5\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:49: error: expected a whole number, found '2.5'\n"
        "line a x -> y ideal z0=50ohm delay=1ns sections=2.5\n"
        "                                                ^~~\n");
}

TEST_CASE("a line tolerance above 100 %", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns tolerance=150%\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:50: error: the tolerance is a fraction of the swing between 0 and 100 %; write for example 2%\n"
        "line a x -> y ideal z0=50ohm delay=1ns tolerance=150%\n"
        "                                                 ^~~~\n");
}

TEST_CASE("a design tolerance above 100 %", "[units]") {
  CHECK(diagnose("set tolerance 150%\n") ==
        "bad.rungs:1:15: error: the tolerance is a fraction of the swing between 0 and 100 %; write for example 2%\n"
        "set tolerance 150%\n"
        "              ^~~~\n");
}

TEST_CASE("a word where a time is expected", "[units]") {
  CHECK(diagnose("set rise pi\n") ==
        "bad.rungs:1:10: error: expected a time such as 1.2ns, found 'pi'\n"
        "set rise pi\n"
        "         ^~\n");
}

TEST_CASE("a drive level with no unit", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0 to 1V rise=1ns\n") ==
        "bad.rungs:3:14: error: '0' needs a unit: write 0V for a voltage\n"
        "drive x step 0 to 1V rise=1ns\n"
        "             ^\n");
}

TEST_CASE("an unknown model suggests the nearest one", "[models]") {
  CHECK(diagnose("line a x -> y caox inner=0.91mm outer=2.95mm er=2.25 length=3m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:15: error: unknown model 'caox'; did you mean 'coax'?\n"
        "line a x -> y caox inner=0.91mm outer=2.95mm er=2.25 length=3m\n"
        "              ^~~~\n");
}

TEST_CASE("an unknown model far from every name lists them", "[models]") {
  CHECK(diagnose("line a x -> y wire inner=0.91mm outer=2.95mm er=2.25 length=3m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:15: error: unknown model 'wire'; expected one of ideal, perlength, coax, twin, plates, microstrip, stripline\n"
        "line a x -> y wire inner=0.91mm outer=2.95mm er=2.25 length=3m\n"
        "              ^~~~\n");
}

TEST_CASE("an unknown parameter suggests the nearest one", "[models]") {
  CHECK(diagnose("line a x -> y microstrip width=0.3mm height=0.18mm er=4.3 length=42mm thicknes=35um\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:71: error: unknown parameter 'thicknes' for microstrip lines; did you mean 'thickness'?\n"
        "line a x -> y microstrip width=0.3mm height=0.18mm er=4.3 length=42mm thicknes=35um\n"
        "                                                                      ^~~~~~~~\n");
}

TEST_CASE("a missing required parameter names it and what it means", "[models]") {
  CHECK(diagnose("line a x -> y coax inner=0.91mm outer=2.95mm length=3m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:15: error: coax needs er= (dielectric relative permittivity)\n"
        "line a x -> y coax inner=0.91mm outer=2.95mm length=3m\n"
        "              ^~~~\n");
}

TEST_CASE("a parameter given twice points at the second", "[models]") {
  CHECK(diagnose("line a x -> y coax inner=0.91mm inner=1mm outer=2.95mm er=2.25 length=3m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:33: error: inner is given twice (first at 1:20); keep one\n"
        "line a x -> y coax inner=0.91mm inner=1mm outer=2.95mm er=2.25 length=3m\n"
        "                                ^~~~~\n");
}

TEST_CASE("a coax inner diameter not below the outer", "[models]") {
  CHECK(diagnose("line a x -> y coax inner=3mm outer=2.95mm er=2.25 length=3m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:26: error: inner must be smaller than outer (both are diameters)\n"
        "line a x -> y coax inner=3mm outer=2.95mm er=2.25 length=3m\n"
        "                         ^~~\n");
}

TEST_CASE("twin-lead spacing not above the wire diameter", "[models]") {
  CHECK(diagnose("line a x -> y twin wire=0.8mm spacing=0.8mm er=1 length=10m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:39: error: spacing (centre to centre) must exceed the wire diameter, or the wires overlap\n"
        "line a x -> y twin wire=0.8mm spacing=0.8mm er=1 length=10m\n"
        "                                      ^~~~~\n");
}

TEST_CASE("a relative permittivity below 1", "[models]") {
  CHECK(diagnose("line a x -> y twin wire=0.8mm spacing=6mm er=0.5 length=10m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:46: error: er=0.5 is below 1; a dielectric's relative permittivity is at least 1 (vacuum)\n"
        "line a x -> y twin wire=0.8mm spacing=6mm er=0.5 length=10m\n"
        "                                             ^~~\n");
}

TEST_CASE("a negative length", "[models]") {
  CHECK(diagnose("line a x -> y twin wire=0.8mm spacing=6mm er=1 length=-10m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:55: error: length= must be greater than zero\n"
        "line a x -> y twin wire=0.8mm spacing=6mm er=1 length=-10m\n"
        "                                                      ^~~~\n");
}

TEST_CASE("a zero length", "[models]") {
  CHECK(diagnose("line a x -> y twin wire=0.8mm spacing=6mm er=1 length=0m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:55: error: length= must be greater than zero\n"
        "line a x -> y twin wire=0.8mm spacing=6mm er=1 length=0m\n"
        "                                                      ^~\n");
}

TEST_CASE("a negative delay", "[models]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=-1ns\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:36: error: delay= must be greater than zero\n"
        "line a x -> y ideal z0=50ohm delay=-1ns\n"
        "                                   ^~~~\n");
}

TEST_CASE("an ideal line given both v= and er=", "[models]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm length=1m v=0.66c er=2.3\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:51: error: give the speed once: v= or er=, not both\n"
        "line a x -> y ideal z0=50ohm length=1m v=0.66c er=2.3\n"
        "                                                  ^~~\n");
}

TEST_CASE("r= on an ideal line without a length", "[models]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns r=2ohm/m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:42: error: r= is per length, and this line has none; give length= too\n"
        "line a x -> y ideal z0=50ohm delay=1ns r=2ohm/m\n"
        "                                         ^~~~~~\n");
}

TEST_CASE("a coax with neither length nor delay", "[models]") {
  CHECK(diagnose("line a x -> y coax inner=1mm outer=3mm er=2.25\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:15: error: coax needs length= (or delay=)\n"
        "line a x -> y coax inner=1mm outer=3mm er=2.25\n"
        "              ^~~~\n");
}

TEST_CASE("an ideal line with a length but no speed", "[models]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm length=1m\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:15: error: an ideal line needs delay=, or length= with a speed (v= or er=)\n"
        "line a x -> y ideal z0=50ohm length=1m\n"
        "              ^~~~~\n");
}

TEST_CASE("zero sections", "[models]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns sections=0\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:49: error: sections must be at least 1\n"
        "line a x -> y ideal z0=50ohm delay=1ns sections=0\n"
        "                                                ^\n");
}

TEST_CASE("two lines of the same name", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "line a y -> x ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:2:6: error: line 'a' is already defined at 1:6; give each line its own name\n"
        "line a y -> x ideal z0=50ohm delay=1ns\n"
        "     ^\n");
}

TEST_CASE("line names that differ only in case", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "line A y -> x ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:2:6: error: line 'A' differs from 'a' (at 1:6) only in case; simulators fold case, so rename one\n"
        "line A y -> x ideal z0=50ohm delay=1ns\n"
        "     ^\n");
}

TEST_CASE("node names that differ only in case", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "line b Y -> x ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "load Y open\n") ==
        "bad.rungs:2:8: error: node 'Y' differs from node 'y' (at 1:13) only in case; simulators fold case, so write one spelling\n"
        "line b Y -> x ideal z0=50ohm delay=1ns\n"
        "       ^\n");
}

TEST_CASE("two drives on one node", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V rise=1ns\n"
                 "drive x step 0V to 2V rise=1ns\n") ==
        "bad.rungs:4:7: error: node 'x' already has a drive at 3:7; a node takes one drive\n"
        "drive x step 0V to 2V rise=1ns\n"
        "      ^\n");
}

TEST_CASE("a drive on a node no line reaches suggests a near node", "[topology]") {
  CHECK(diagnose("line a xin -> y ideal z0=50ohm delay=1ns\n"
                 "drive xn step 0V to 1V rise=1ns\n"
                 "load y open\n"
                 "load xin open\n") ==
        "bad.rungs:2:7: error: drive on node 'xn', which no line reaches; did you mean 'xin'?\n"
        "drive xn step 0V to 1V rise=1ns\n"
        "      ^~\n");
}

TEST_CASE("a drive on a node no line reaches and nothing near", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "drive z step 0V to 1V rise=1ns\n"
                 "load y open\n"
                 "load x open\n") ==
        "bad.rungs:2:7: error: drive on node 'z', which no line reaches\n"
        "drive z step 0V to 1V rise=1ns\n"
        "      ^\n");
}

TEST_CASE("a load on ground", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load gnd 50ohm\n"
                 "load y open\n"
                 "load x open\n") ==
        "bad.rungs:2:6: error: a load cannot sit on ground; put it on a line end\n"
        "load gnd 50ohm\n"
        "     ^~~\n");
}

TEST_CASE("a drive on ground", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load x open\n"
                 "load y open\n"
                 "drive 0 step 0V to 1V rise=1ns\n") ==
        "bad.rungs:4:7: error: a drive cannot sit on ground; put it on a line end\n"
        "drive 0 step 0V to 1V rise=1ns\n"
        "      ^\n");
}

TEST_CASE("a line end on gnd", "[topology]") {
  CHECK(diagnose("line a x -> gnd ideal z0=50ohm delay=1ns\n"
                 "load x open\n") ==
        "bad.rungs:1:13: error: line 'a' has an end on ground; a line runs between two nodes and ground is its reference already\n"
        "line a x -> gnd ideal z0=50ohm delay=1ns\n"
        "            ^~~\n");
}

TEST_CASE("a line end on node 0", "[topology]") {
  CHECK(diagnose("line a 0 -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n") ==
        "bad.rungs:1:8: error: line 'a' has an end on ground; a line runs between two nodes and ground is its reference already\n"
        "line a 0 -> y ideal z0=50ohm delay=1ns\n"
        "       ^\n");
}

TEST_CASE("a line from a node to itself", "[topology]") {
  CHECK(diagnose("line a x -> x ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:6: error: line 'a' starts and ends on node 'x'; its two ends need two nodes\n"
        "line a x -> x ideal z0=50ohm delay=1ns\n"
        "     ^\n");
}

TEST_CASE("two loads on one node", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "load y 50ohm\n"
                 "load x open\n") ==
        "bad.rungs:3:6: error: node 'y' already has a load at 2:6; combine them in one load with || (parallel)\n"
        "load y 50ohm\n"
        "     ^\n");
}

TEST_CASE("a line end that touches nothing else is a warning", "[topology]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n") ==
        "bad.rungs:1:8: warning: the near end of line 'a' (node 'x') connects to nothing else; it is treated as open\n"
        "line a x -> y ideal z0=50ohm delay=1ns\n"
        "       ^\n");
}

TEST_CASE("a microstrip far outside the width/height range of its formula", "[models]") {
  CHECK(diagnose("line a x -> y microstrip width=30mm height=0.18mm er=4.3 length=42mm\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:32: warning: width/height = 167 is outside 0.01 to 100, where Hammerstad and Jensen (1980) state their accuracy\n"
        "line a x -> y microstrip width=30mm height=0.18mm er=4.3 length=42mm\n"
        "                               ^~~~\n");
}

TEST_CASE("parallel plates too narrow for their formula", "[models]") {
  CHECK(diagnose("line a x -> y plates width=1mm gap=0.2mm er=4.3 length=50mm\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:28: warning: width/gap = 5 is below 10; the parallel-plate formula neglects fringing and holds for width much larger than gap (Pozar, Table 2.1; common practice)\n"
        "line a x -> y plates width=1mm gap=0.2mm er=4.3 length=50mm\n"
        "                           ^~~\n");
}

TEST_CASE("a misspelt setting suggests the nearest one", "[settings]") {
  CHECK(diagnose("set rsie 1ns\n") ==
        "bad.rungs:1:5: error: unknown setting 'rsie'; did you mean 'rise'?\n"
        "set rsie 1ns\n"
        "    ^~~~\n");
}

TEST_CASE("an unknown setting lists the settings", "[settings]") {
  CHECK(diagnose("set foo 1ns\n") ==
        "bad.rungs:1:5: error: unknown setting 'foo'; expected one of rise, tolerance, shape, "
        "window, method, step\n"
        "set foo 1ns\n"
        "    ^~~\n");
}

TEST_CASE("an integration method that is neither trap nor gear", "[settings]") {
  CHECK(diagnose("set method gaer\n") ==
        "bad.rungs:1:12: error: unknown integration method 'gaer'; did you mean 'gear'?\n"
        "set method gaer\n"
        "           ^~~~\n");
  CHECK(diagnose("set method euler\n") ==
        "bad.rungs:1:12: error: unknown integration method 'euler'; expected one of trap, gear\n"
        "set method euler\n"
        "           ^~~~~\n");
}

TEST_CASE("the deck's maximum step is a positive time", "[settings]") {
  CHECK(diagnose("set step 0ps\n") ==
        "bad.rungs:1:10: error: step must be greater than zero\n"
        "set step 0ps\n"
        "         ^~~\n");
  CHECK(diagnose("set step 5\n").find("bad.rungs:1:10: error:") == 0);
}

TEST_CASE("a setting given twice", "[settings]") {
  CHECK(diagnose("set rise 1ns\n"
                 "set rise 2ns\n") ==
        "bad.rungs:2:5: error: rise is already set at 1:5; keep one\n"
        "set rise 2ns\n"
        "    ^~~~\n");
}

TEST_CASE("a misspelt shape", "[settings]") {
  CHECK(diagnose("set shape pie\n") ==
        "bad.rungs:1:11: error: unknown shape 'pie'; did you mean 'pi'?\n"
        "set shape pie\n"
        "          ^~~\n");
}

TEST_CASE("a shape written in upper case", "[settings]") {
  CHECK(diagnose("set shape T\n") ==
        "bad.rungs:1:11: error: unknown shape 'T'; did you mean 't'?\n"
        "set shape T\n"
        "          ^\n");
}

TEST_CASE("an unknown shape lists the shapes", "[settings]") {
  CHECK(diagnose("set shape square\n") ==
        "bad.rungs:1:11: error: unknown shape 'square'; expected one of pi, t, l\n"
        "set shape square\n"
        "          ^~~~~~\n");
}

TEST_CASE("a misspelt shape on one line", "[settings]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns shape=pie\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:46: error: unknown shape 'pie'; did you mean 'pi'?\n"
        "line a x -> y ideal z0=50ohm delay=1ns shape=pie\n"
        "                                             ^~~\n");
}

TEST_CASE("a zero window", "[settings]") {
  CHECK(diagnose("set window 0ns\n") ==
        "bad.rungs:1:12: error: window must be greater than zero\n"
        "set window 0ns\n"
        "           ^~~\n");
}

TEST_CASE("two design statements", "[settings]") {
  CHECK(diagnose("design a\n"
                 "design b\n") ==
        "bad.rungs:2:8: error: the design is already named at 1:8; keep one design statement\n"
        "design b\n"
        "       ^\n");
}

TEST_CASE("a pulse without width", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x pulse 0V to 1V rise=1ns\n") ==
        "bad.rungs:3:9: error: a pulse needs width= (the time it stays high)\n"
        "drive x pulse 0V to 1V rise=1ns\n"
        "        ^~~~~~~~~~~~~~\n");
}

TEST_CASE("a drive with no rise time and no set rise", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V\n") ==
        "bad.rungs:3:7: error: the drive needs rise= (its 10-90 % time), or write set rise for the whole design; an edge with no rise time cannot be modelled\n"
        "drive x step 0V to 1V\n"
        "      ^\n");
}

TEST_CASE("a step between equal levels", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 1V to 1V rise=1ns\n") ==
        "bad.rungs:3:9: error: the drive has no swing; its two levels are equal\n"
        "drive x step 1V to 1V rise=1ns\n"
        "        ^~~~~~~~~~~~~\n");
}

TEST_CASE("a negative start time", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V rise=1ns at=-1ns\n") ==
        "bad.rungs:3:35: error: at= cannot be negative\n"
        "drive x step 0V to 1V rise=1ns at=-1ns\n"
        "                                  ^~~~\n");
}

TEST_CASE("a zero rise time", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V rise=0ns\n") ==
        "bad.rungs:3:28: error: rise= must be greater than zero\n"
        "drive x step 0V to 1V rise=0ns\n"
        "                           ^~~\n");
}

TEST_CASE("a negative source resistance", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V rise=1ns source=-5ohm\n") ==
        "bad.rungs:3:39: error: source= cannot be negative\n"
        "drive x step 0V to 1V rise=1ns source=-5ohm\n"
        "                                      ^~~~~\n");
}

TEST_CASE("a width on a step drive", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V rise=1ns width=1ns\n") ==
        "bad.rungs:3:32: error: unknown parameter 'width' for step drives; expected one of source, rise, at\n"
        "drive x step 0V to 1V rise=1ns width=1ns\n"
        "                               ^~~~~\n");
}

TEST_CASE("a period shorter than the pulse", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x pulse 0V to 1V rise=1ns width=1ns period=1ns\n") ==
        "bad.rungs:3:50: error: the period is shorter than the pulse: width plus its rising and falling ramps\n"
        "drive x pulse 0V to 1V rise=1ns width=1ns period=1ns\n"
        "                                                 ^~~\n");
}

TEST_CASE("a drive parameter given twice", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load y open\n"
                 "drive x step 0V to 1V rise=1ns rise=2ns\n") ==
        "bad.rungs:3:32: error: rise is given twice (first at 3:23); keep one\n"
        "drive x step 0V to 1V rise=1ns rise=2ns\n"
        "                               ^~~~\n");
}

TEST_CASE("an open load switched in later", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\n"
                 "load x open\n"
                 "load y open at=1ns\n") ==
        "bad.rungs:3:16: error: an open load has nothing to switch in; remove at=\n"
        "load y open at=1ns\n"
        "               ^~~\n");
}

TEST_CASE("every error of a file is reported in source order", "[file]") {
  CHECK(diagnose("lien b p -> q ideal z0=50ohm delay=1ns\n"
                 "set rsie 350ps\n"
                 "line a x -> y coax inner=3mm outer=2.95mm er=2.25 length=3m\n"
                 "drive x step 0V to 1V\n"
                 "load y open\n"
                 "set tolerance 150%\n") ==
        "bad.rungs:1:1: error: unknown statement 'lien'; did you mean 'line'?\n"
        "lien b p -> q ideal z0=50ohm delay=1ns\n"
        "^~~~\n"
        "bad.rungs:2:5: error: unknown setting 'rsie'; did you mean 'rise'?\n"
        "set rsie 350ps\n"
        "    ^~~~\n"
        "bad.rungs:3:26: error: inner must be smaller than outer (both are diameters)\n"
        "line a x -> y coax inner=3mm outer=2.95mm er=2.25 length=3m\n"
        "                         ^~~\n"
        "bad.rungs:4:7: error: the drive needs rise= (its 10-90 % time), or write set rise for the whole design; an edge with no rise time cannot be modelled\n"
        "drive x step 0V to 1V\n"
        "      ^\n"
        "bad.rungs:6:15: error: the tolerance is a fraction of the swing between 0 and 100 %; write for example 2%\n"
        "set tolerance 150%\n"
        "              ^~~~\n");
}

TEST_CASE("columns count code points after a micro sign", "[file]") {
  CHECK(diagnose("line a x -> y microstrip width=300µm height=180µm er=0.9 length=42mm\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:54: error: er=0.9 is below 1; a dielectric's relative permittivity is at least 1 (vacuum)\n"
        "line a x -> y microstrip width=300µm height=180µm er=0.9 length=42mm\n"
        "                                                     ^~~\n");
}

TEST_CASE("an unknown parameter after micro signs", "[file]") {
  CHECK(diagnose("line a x -> y microstrip width=300µm height=180µm er=4.3 length=42mm thicknes=35µm\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:70: error: unknown parameter 'thicknes' for microstrip lines; did you mean 'thickness'?\n"
        "line a x -> y microstrip width=300µm height=180µm er=4.3 length=42mm thicknes=35µm\n"
        "                                                                     ^~~~~~~~\n");
}

TEST_CASE("CRLF line endings: the error is on the right line and the source line has no CR", "[file]") {
  CHECK(diagnose("load x open\r\n"
                 "line a x -> y ideal z0=50ohm delay=1\r\n"
                 "load y open\r\n") ==
        "bad.rungs:2:36: error: '1' needs a unit: write 1ns for a time\n"
        "line a x -> y ideal z0=50ohm delay=1\n"
        "                                   ^\n");
}

TEST_CASE("CRLF line endings: a syntax error at the end of a line", "[file]") {
  CHECK(diagnose("line a x -> y\r\n") ==
        "bad.rungs:1:14: error: expected a model name such as coax, found the end of the line\n"
        "line a x -> y\n"
        "             ^\n");
}

TEST_CASE("a tab before the error is kept in the caret line", "[file]") {
  CHECK(diagnose("line\ta\tx -> y ideal z0=50ohm\tdelay=1\n"
                 "load x open\n"
                 "load y open\n") ==
        "bad.rungs:1:36: error: '1' needs a unit: write 1ns for a time\n"
        "line\ta\tx -> y ideal z0=50ohm\tdelay=1\n"
        "    \t \t                     \t      ^\n");
}

TEST_CASE("an error on a last line with no line break", "[file]") {
  CHECK(diagnose("load x open\n"
                 "load y open\n"
                 "line a x -> y ideal z0=50ohm delay=1") ==
        "bad.rungs:3:36: error: '1' needs a unit: write 1ns for a time\n"
        "line a x -> y ideal z0=50ohm delay=1\n"
        "                                   ^\n");
}

// Messages that say what to write instead, or point past a first error to the real one.

TEST_CASE("a case slip in a load value gets that unit's did-you-mean", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\ndrive x step 0V to 1V rise=1ns\nload y 4pf\n") ==
        "bad.rungs:3:8: error: unknown unit 'pf' for a capacitance; did you mean 'pF'? (prefixes are case-sensitive)\n"
        "load y 4pf\n"
        "       ^~~\n");
}

TEST_CASE("a load that ends in an operator asks for the value after it", "[syntax]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\ndrive x step 0V to 1V rise=1ns\nload y 50ohm +\n") ==
        "bad.rungs:3:14: error: expected a value such as 50ohm, 4pF or 10nH after '+', found the end of the line\n"
        "load y 50ohm +\n"
        "             ^\n");
}

TEST_CASE("a parameter with no value before the next parameter", "[syntax]") {
  CHECK(diagnose("line a x -> y ideal z0= delay=1ns\nload y open\ndrive x step 0V to 1V rise=1ns\n") ==
        "bad.rungs:1:25: error: expected a value right after 'z0=', found 'delay'\n"
        "line a x -> y ideal z0= delay=1ns\n"
        "                        ^~~~~\n");
}

TEST_CASE("a blank between a number and its unit", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50 ohm delay=1ns\n") ==
        "bad.rungs:1:27: error: a unit follows its number with no blank between them: write 50ohm\n"
        "line a x -> y ideal z0=50 ohm delay=1ns\n"
        "                          ^~~\n");
}

TEST_CASE("M on a length is refused with advice that fits a length", "[units]") {
  CHECK(diagnose("line a x -> y coax inner=1mm outer=3mm er=2 length=4M\ndrive x step 0V to 1V rise=1ns\nload y open\n") ==
        "bad.rungs:1:52: error: '4M' has a prefix but no unit, and a simulator would read M as milli: write 4m for metres or 4mm for millimetres\n"
        "line a x -> y coax inner=1mm outer=3mm er=2 length=4M\n"
        "                                                   ^~\n");
}

TEST_CASE("a conflict of length and delay quotes the values as written", "[models]") {
  CHECK(diagnose("line a x -> y coax inner=1mm outer=3mm er=2 length=3m delay=1ns\ndrive x step 0V to 1V rise=1ns\nload y open\n") ==
        "bad.rungs:1:61: error: length=3m and delay=1ns imply 10.01c, but this coax line carries 0.7071c; give only one of length= and delay=\n"
        "line a x -> y coax inner=1mm outer=3mm er=2 length=3m delay=1ns\n"
        "                                                            ^~~\n");
}

TEST_CASE("a dc drive of zero volts has no swing", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\nload y open\ndrive x dc 0V rise=1ns\n") ==
        "bad.rungs:3:12: error: a dc drive of 0V has no swing; give a level other than 0V\n"
        "drive x dc 0V rise=1ns\n"
        "           ^~\n");
}

TEST_CASE("a dc drive given two levels points to step", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\nload y open\ndrive x dc 1V to 2V rise=1ns\n") ==
        "bad.rungs:3:15: error: a dc drive takes one level; for a change between two levels write step LOW to HIGH\n"
        "drive x dc 1V to 2V rise=1ns\n"
        "              ^~\n");
}

TEST_CASE("a step with its first level missing", "[drive]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns\nload y open\ndrive x step to 1V rise=1ns\n") ==
        "bad.rungs:3:14: error: expected a voltage such as 0V, found 'to'\n"
        "drive x step to 1V rise=1ns\n"
        "             ^~\n");
}

TEST_CASE("a number beyond the range of a double", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=1e400ohm delay=1ns\nload y open\ndrive x step 0V to 1V rise=1ns\n") ==
        "bad.rungs:1:24: error: '1e400ohm' is out of range\n"
        "line a x -> y ideal z0=1e400ohm delay=1ns\n"
        "                       ^~~~~~~~\n");
}

TEST_CASE("a section count too large to be meant", "[units]") {
  CHECK(diagnose("line a x -> y ideal z0=50ohm delay=1ns sections=99999999999\nload y open\ndrive x step 0V to 1V rise=1ns\n") ==
        "bad.rungs:1:49: error: '99999999999' is too large\n"
        "line a x -> y ideal z0=50ohm delay=1ns sections=99999999999\n"
        "                                                ^~~~~~~~~~~\n");
}

TEST_CASE("a name with a letter outside ASCII", "[syntax]") {
  CHECK(diagnose("line aé x -> y ideal z0=50ohm delay=1ns\n") ==
        "bad.rungs:1:7: error: names use ASCII letters, digits and _ only, found 'é'\n"
        "line aé x -> y ideal z0=50ohm delay=1ns\n"
        "      ^\n");
}

TEST_CASE("old Mac line ends (CR alone) still give the right line", "[file]") {
  CHECK(diagnose("load y open\rline a x -> y ideal z0=50 delay=1ns\rdrive x step 0V to 1V rise=1ns\r") ==
        "bad.rungs:2:24: error: '50' needs a unit: write 50ohm for a resistance\n"
        "line a x -> y ideal z0=50 delay=1ns\n"
        "                       ^~\n");
}

TEST_CASE("a syntax error does not make its neighbours look unconnected", "[topology]") {
  CHECK(diagnose("line a x -> y coax inner=1mm outer=3mm er=2 length=1m\nload y 50ohm 4pF\ndrive x step 0V to 1V rise=1ns\n") ==
        "bad.rungs:2:14: error: expected '+' (series) or '||' (parallel) between load values, found '4pF'\n"
        "load y 50ohm 4pF\n"
        "             ^~~\n");
}
