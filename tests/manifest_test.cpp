// The build manifest (rungs.toml): what a valid one reads as, and the exact text of every
// error (file:line:col, message, source line, caret), as tests/diagnostics_test.cpp holds
// the description's messages. The TOML itself follows TOML v1.0.0 (toml.io), read by toml++.
#include <catch2/catch.hpp>

#include <string>
#include <utility>

#include "8_project/manifest.h"
#include "3_model/resolve.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/parser.h"
#include "1_syntax/input_file.h"

namespace project = rungs::project;
namespace syntax = rungs::syntax;

namespace {

/// Parses `text` as the manifest rungs.toml; returns every diagnostic as rendered.
std::string diagnose(std::string text) {
  const syntax::InputFile file{"rungs.toml", std::move(text)};
  syntax::Diagnostics diagnostics(file);
  (void)project::parse_manifest(diagnostics);
  return diagnostics.render();
}

}  // namespace

TEST_CASE("a full manifest reads as written", "[manifest]") {
  const syntax::InputFile file{"rungs.toml",
                                "# the bench netlists\n"
                                "[defaults]\n"
                                "window = \"40ns\"\n"
                                "tolerance = 0.015\n"
                                "shape = \"t\"\n"
                                "rise = \"350ps\"\n"
                                "templates = \"sim/templates\"\n"
                                "\n"
                                "[[netlist]]\n"
                                "source = \"lines/clock.rungs\"\n"
                                "output = \"sim/clock.cir\"\n"
                                "report = \"sim/clock.txt\"\n"
                                "report_json = \"sim/clock.json\"\n"
                                "\n"
                                "[[netlist]]\n"
                                "source = \"lines/feed.rungs\"\n"
                                "output = \"sim/feed.lib\"\n"
                                "library = true\n"
                                "with_ideal = true\n"
                                "templates = \"sim/feed_templates\"\n"};
  syntax::Diagnostics diagnostics(file);
  const project::Manifest manifest = project::parse_manifest(diagnostics);
  REQUIRE(diagnostics.render().empty());
  REQUIRE(manifest.defaults.settings.size() == 4);
  // In the order rise, tolerance, shape, window, whatever the order in the file.
  CHECK(manifest.defaults.settings[0].key == "rise");
  CHECK(manifest.defaults.settings[0].value == "350ps");
  CHECK(manifest.defaults.settings[1].key == "tolerance");
  CHECK(manifest.defaults.settings[1].value == "0.015");  // a TOML number is a plain ratio
  CHECK(manifest.defaults.settings[2].value == "t");
  CHECK(manifest.defaults.settings[3].value == "40ns");
  CHECK(file.slice(manifest.defaults.settings[3].span) == "\"40ns\"");
  REQUIRE(manifest.netlists.size() == 2);
  const project::NetlistEntry& clock = manifest.netlists[0];
  CHECK(clock.source == "lines/clock.rungs");
  CHECK(clock.output == "sim/clock.cir");
  CHECK(clock.report == "sim/clock.txt");
  CHECK(clock.report_json == "sim/clock.json");
  CHECK_FALSE(clock.library);
  CHECK_FALSE(clock.with_ideal);
  CHECK(project::templates_of(manifest, clock) == "sim/templates");
  const project::NetlistEntry& feed = manifest.netlists[1];
  CHECK(feed.library);
  CHECK(feed.with_ideal);
  CHECK(feed.report.empty());
  CHECK(project::templates_of(manifest, feed) == "sim/feed_templates");
  CHECK(file.slice(feed.source_span) == "\"lines/feed.rungs\"");
  CHECK(file.slice(feed.span) == "[[netlist]]");
}

TEST_CASE("an unknown key in a netlist suggests the nearest one", "[manifest]") {
  CHECK(diagnose("[[netlist]]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"a.cir\"\n"
                 "libary = true\n") ==
        "rungs.toml:4:1: error: unknown key 'libary' in [[netlist]]; did you mean 'library'?\n"
        "libary = true\n"
        "^~~~~~\n");
}

TEST_CASE("an unknown key in the defaults suggests the nearest setting", "[manifest]") {
  CHECK(diagnose("[defaults]\n"
                 "tolerence = \"2%\"\n"
                 "[[netlist]]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"a.cir\"\n") ==
        "rungs.toml:2:1: error: unknown key 'tolerence' in [defaults]; did you mean "
        "'tolerance'?\n"
        "tolerence = \"2%\"\n"
        "^~~~~~~~~\n");
}

TEST_CASE("an unknown table suggests the nearest, and a far one lists them", "[manifest]") {
  CHECK(diagnose("[[netlists]]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"a.cir\"\n"
                 "[simulator]\n"
                 "name = \"x\"\n") ==
        // Not also "lists no netlist": that would only repeat the misspelling's consequence.
        "rungs.toml:1:3: error: unknown key 'netlists' at the top of the manifest; did you mean "
        "'netlist'?\n"
        "[[netlists]]\n"
        "  ^~~~~~~~\n"
        "rungs.toml:4:2: error: unknown key 'simulator' at the top of the manifest; expected one "
        "of defaults, netlist\n"
        "[simulator]\n"
        " ^~~~~~~~~\n");
}

TEST_CASE("a setting that `set` would reject gets the message `set` gives", "[manifest]") {
  CHECK(diagnose("[defaults]\n"
                 "tolerance = \"2\"\n"
                 "shape = \"hex\"\n"
                 "window = \"0ns\"\n"
                 "rise = \"1M\"\n"
                 "[[netlist]]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"a.cir\"\n") ==
        "rungs.toml:2:13: error: the tolerance is a fraction of the swing between 0 and 100 %; "
        "for 2 percent write 2%\n"
        "tolerance = \"2\"\n"
        "            ^~~\n"
        "rungs.toml:3:9: error: unknown shape 'hex'; expected one of pi, t, l\n"
        "shape = \"hex\"\n"
        "        ^~~~~\n"
        "rungs.toml:4:10: error: window must be greater than zero\n"
        "window = \"0ns\"\n"
        "         ^~~~~\n"
        "rungs.toml:5:8: error: '1M' has a prefix but no unit, and a simulator would read M "
        "as milli: write 1Ms for mega or 1ms for milli\n"
        "rise = \"1M\"\n"
        "       ^~~~\n");
}

TEST_CASE("a setting is a string with its unit, and one word", "[manifest]") {
  CHECK(diagnose("[defaults]\n"
                 "rise = 350\n"
                 "window = \"40 ns\"\n"
                 "[[netlist]]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"a.cir\"\n") ==
        "rungs.toml:2:8: error: rise takes a value with its unit, as a string: rise = \"350ps\"\n"
        "rise = 350\n"
        "       ^~~\n"
        "rungs.toml:3:10: error: window takes one value with no spaces, such as window = "
        "\"40ns\"\n"
        "window = \"40 ns\"\n"
        "         ^~~~~~~\n");
}

TEST_CASE("a value with a unit left unquoted says to quote it", "[manifest]") {
  CHECK(diagnose("[defaults]\n"
                 "tolerance = 2%\n") ==
        "rungs.toml:2:13: error: a value with a unit is a string in TOML: write tolerance = "
        "\"2%\"\n"
        "tolerance = 2%\n"
        "            ^~\n");
}

TEST_CASE("other TOML syntax errors come from the TOML reader, in our style", "[manifest]") {
  CHECK(diagnose("[[netlist]]\n"
                 "source = \"a.rungs\n") ==
        "rungs.toml:2:18: error: not valid TOML: the string is not closed on its line; add the "
        "closing quote\n"
        "source = \"a.rungs\n"
        "                 ^\n");
  CHECK(diagnose("[[netlist]]\n"
                 "source = \"a.rungs\"\n"
                 "source = \"b.rungs\"\n") ==
        "rungs.toml:3:10: error: not valid TOML: 'source' is given twice; keep one\n"
        "source = \"b.rungs\"\n"
        "         ^\n");
}

TEST_CASE("a netlist needs a source and an output", "[manifest]") {
  CHECK(diagnose("[[netlist]]\n"
                 "report = \"a.txt\"\n") ==
        "rungs.toml:1:1: error: this netlist has no source; add source = \"lines/NAME.rungs\"\n"
        "[[netlist]]\n"
        "^~~~~~~~~~~\n"
        "rungs.toml:1:1: error: this netlist has no output; add output = \"sim/NAME.cir\"\n"
        "[[netlist]]\n"
        "^~~~~~~~~~~\n");
}

TEST_CASE("values of the wrong type say what to write", "[manifest]") {
  CHECK(diagnose("[[netlist]]\n"
                 "source = 3\n"
                 "output = \"\"\n"
                 "library = \"yes\"\n") ==
        "rungs.toml:2:10: error: source takes a path as a string, such as source = "
        "\"lines/clock.rungs\"\n"
        "source = 3\n"
        "         ^\n"
        "rungs.toml:3:10: error: output is empty; give a path, such as output = \"sim/clock.cir\"\n"
        "output = \"\"\n"
        "         ^~\n"
        "rungs.toml:4:11: error: library is true or false, without quotes\n"
        "library = \"yes\"\n"
        "          ^~~~~\n");
}

TEST_CASE("netlist in single brackets is a table, not the list it must be", "[manifest]") {
  CHECK(diagnose("[netlist]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"a.cir\"\n") ==
        "rungs.toml:1:2: error: netlist is a list of tables: write [[netlist]], in double "
        "brackets, above each netlist's keys\n"
        "[netlist]\n"
        " ^~~~~~~\n");
}

TEST_CASE("each file has one writer, and no output replaces a description", "[manifest]") {
  CHECK(diagnose("[[netlist]]\n"
                 "source = \"a.rungs\"\n"
                 "output = \"sim/a.cir\"\n"
                 "[[netlist]]\n"
                 "source = \"b.rungs\"\n"
                 "output = \"sim/../sim/a.cir\"\n"
                 "report = \"./a.rungs\"\n"
                 "report_json = \"rungs.toml\"\n") ==
        "rungs.toml:6:10: error: 'sim/../sim/a.cir' is already written at 3:10; give each "
        "file one writer\n"
        "output = \"sim/../sim/a.cir\"\n"
        "         ^~~~~~~~~~~~~~~~~~\n"
        "rungs.toml:7:10: error: './a.rungs' is a netlist's source; an output cannot replace a "
        "description\n"
        "report = \"./a.rungs\"\n"
        "         ^~~~~~~~~~~\n"
        "rungs.toml:8:15: error: 'rungs.toml' is this manifest; an output cannot replace it\n"
        "report_json = \"rungs.toml\"\n"
        "              ^~~~~~~~~~~~\n");
}

TEST_CASE("an empty manifest says what to add", "[manifest]") {
  CHECK(diagnose("") ==
        "rungs.toml:1:1: error: the manifest lists no netlist; add a [[netlist]] table with "
        "source and output\n"
        "\n"
        "^\n");
}

TEST_CASE("columns count characters, not bytes, after non-ASCII text", "[manifest]") {
  CHECK(diagnose("[[netlist]] # Spannungsmessung über 3 m\n"
                 "source = \"lines/ü.rungs\"\n"
                 "output = \"sim/ü.cir\"\n"
                 "reprot = \"x\"\n") ==
        "rungs.toml:4:1: error: unknown key 'reprot' in [[netlist]]; did you mean 'report'?\n"
        "reprot = \"x\"\n"
        "^~~~~~\n");
  CHECK(diagnose("[[netlist]]\n"
                 "source = \"ü\"  ;\n") ==
        "rungs.toml:2:15: error: not valid TOML: expected a comment or whitespace, saw ';' (in a "
        "key-value pair)\n"
        "source = \"ü\"  ;\n"
        "              ^\n");
}

TEST_CASE("defaults apply where a description does not set them itself", "[manifest]") {
  const syntax::InputFile file{"d.rungs",
                                "set tolerance 5%\n"
                                "line t a -> b ideal z0=50ohm delay=1ns\n"
                                "load b 50ohm\n"
                                "drive a step 0V to 1V source=50ohm\n"};
  syntax::Diagnostics diagnostics(file);
  auto description = syntax::parse_description(diagnostics);
  project::apply_defaults(description,
                        {{"tolerance", "1%", {}}, {"shape", "t", {}}, {"rise", "200ps", {}}});
  const auto circuit = rungs::model::resolve(description, diagnostics);
  CHECK(diagnostics.render().empty());  // the drive has no rise=; the default gives one
  CHECK(circuit.settings.tolerance == Approx(0.05));  // the description's own set wins
  CHECK(circuit.settings.shape == rungs::model::Shape::t);
  REQUIRE(circuit.settings.rise);
  CHECK(*circuit.settings.rise == Approx(200e-12));
}
