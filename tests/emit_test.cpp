// The emit stage called directly: numbers as netlist text, ladders, names that stay distinct
// once case is folded, templates, and the source hash. The whole deck as the binary writes
// it is held by the golden files in tests/emit_cli_test.cpp.
#include <catch2/catch.hpp>

#include <cfloat>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <optional>
#include <random>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "circuit_builders.h"

#include "6_emit/netlist.h"
#include "6_emit/ladder.h"
#include "6_emit/names.h"
#include "6_emit/sha256.h"
#include "6_emit/spice_number.h"
#include "6_emit/templates.h"
#include "3_model/resolve.h"
#include "5_plan/plan.h"
#include "5_plan/verify.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/parser.h"

namespace emit = rungs::emit;
namespace model = rungs::model;
namespace plan = rungs::plan;
namespace syntax = rungs::syntax;
using model::Shape;

namespace {

std::string folded(std::string_view s) {
  std::string out(s);
  for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

std::vector<std::string> words(const std::string& line) {
  std::istringstream in(line);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}

double read_double(const std::string& text) {
  double value = 0.0;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  INFO("netlist number '" << text << "'");
  REQUIRE(ec == std::errc());
  REQUIRE(end == text.data() + text.size());
  return value;
}

// ---- numbers ------------------------------------------------------------------------------

// What the netlist may hold for a value: exponent notation, or a plain 0. No scale suffix
// (to a simulator `M` is milli, `MEG` mega), no locale's decimal comma, no digit grouping.
const std::regex kExponentForm(R"(0|-?[1-9](\.[0-9]+)?e[+-][0-9]{2,3})");

std::string shortest_scientific(double value) {
  char buffer[64];
  const auto result =
      std::to_chars(buffer, buffer + sizeof buffer, value, std::chars_format::scientific);
  return std::string(buffer, result.ptr);
}

void check_round_trip(double value) {
  const std::string text = emit::spice_number(value);
  INFO(std::hexfloat << value << " -> '" << text << "'");
  CHECK(std::regex_match(text, kExponentForm));
  CHECK(read_double(text) == value);
  // strtod reads as a C program (and a simulator written in C) would, in the "C" locale.
  CHECK(std::strtod(text.c_str(), nullptr) == value);
}

TEST_CASE("spice_number writes fixed values in plain exponent notation") {
  CHECK(emit::spice_number(5e-10) == "5e-10");
  CHECK(emit::spice_number(2.5e-10) == "2.5e-10");
  CHECK(emit::spice_number(50.0) == "5e+01");
  CHECK(emit::spice_number(1e-3) == "1e-03");  // a milli value, never "1m"
  CHECK(emit::spice_number(1e6) == "1e+06");   // a mega value, never "1M" or "1meg"
  CHECK(emit::spice_number(-3.3) == "-3.3e+00");
  CHECK(emit::spice_number(0.1) == "1e-01");
  CHECK(emit::spice_number(0.0) == "0");
  CHECK(emit::spice_number(1.0 / 3.0) == "3.333333333333333e-01");
  CHECK(emit::spice_number(4.725130785229395e-13) == "4.725130785229395e-13");
  CHECK(emit::spice_number(DBL_MAX) == "1.7976931348623157e+308");
  CHECK(emit::spice_number(DBL_MIN) == "2.2250738585072014e-308");
  CHECK(emit::spice_number(5e-324) == "5e-324");  // the smallest subnormal
  for (double value : {5e-10, 2.5e-10, 1e-3, 1e6, 0.1, 1.0 / 3.0, 299792458.0, 1e-15, 1e300,
                       -1e-300, DBL_MAX, DBL_MIN, 5e-324, 0.1 + 0.2})
    check_round_trip(value);
}

TEST_CASE("spice_number round-trips random doubles with the fewest digits") {
  std::mt19937_64 random(20240601);                              // fixed seed: a failure reproduces
  std::uniform_real_distribution<double> exponent(-18.0, 12.0);  // fs ... TV, a deck's range
  int checked = 0;
  for (int i = 0; i < 20000; ++i) {
    double value = 0.0;
    if (i % 2 == 0) {
      const std::uint64_t bits = random();  // any finite double, subnormals included
      std::memcpy(&value, &bits, sizeof value);
      if (!std::isfinite(value)) continue;
    } else {
      value = std::pow(10.0, exponent(random)) * (i % 4 == 1 ? 1.0 : -1.0);
    }
    check_round_trip(value);
    // The fewest digits: std::to_chars (C++17 <charconv>) gives the shortest text that reads
    // back to the same double. A power of two is left out here: see the next test case.
    int binary_exponent = 0;
    if (value != 0.0 && std::frexp(value, &binary_exponent) != 0.5 &&
        std::frexp(value, &binary_exponent) != -0.5) {
      INFO(std::hexfloat << value);
      CHECK(emit::spice_number(value) == shortest_scientific(value));
      ++checked;
    }
  }
  CHECK(checked > 19000);
}

// A bug once, kept as a regression test: for some exact powers of two, where the gap below a
// double is half the gap above it, spice_number wrote 17 digits although 16 read back
// (2^-24 as 5.9604644775390625e-08, not 5.960464477539063e-08).
TEST_CASE("spice_number gives powers of two the fewest digits too") {
  for (int e = -1074; e <= 1023; ++e) {
    const double value = std::ldexp(1.0, e);
    INFO("2^" << e);
    CHECK(emit::spice_number(value) == shortest_scientific(value));
  }
}

// ---- ladders ------------------------------------------------------------------------------

struct Element {
  std::string name;
  std::string a, b;
  double value = 0.0;
  std::string value_text;
  std::string extra;  // the IC= field, if any
};

std::vector<Element> parse_elements(const std::string& text) {
  std::vector<Element> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) {
    const auto w = words(line);
    REQUIRE(w.size() >= 4);
    REQUIRE(w.size() <= 5);
    out.push_back({w[0], w[1], w[2], read_double(w[3]), w[3], w.size() == 5 ? w[4] : ""});
  }
  return out;
}

plan::LinePlan line_plan(int sections, Shape shape, bool lossy_r, bool lossy_g) {
  plan::LinePlan lp;
  lp.sections = sections;
  lp.shape = shape;
  lp.section_l = 2e-9;
  lp.section_c = 8e-13;
  lp.section_r = lossy_r ? 0.5 : 0.0;
  lp.section_g = lossy_g ? 0.0009765625 : 0.0;  // 1/1024 S: a resistor of exactly 1024 ohm
  return lp;
}

std::string ladder_text(const plan::LinePlan& lp, std::optional<double> charged = {},
                        long long* count = nullptr) {
  std::ostringstream out;
  const long long n = emit::write_ladder(out, lp, charged);
  if (count) *count = n;
  return out.str();
}

std::string kind_of(const Element& e) {
  if (e.name.rfind("RG", 0) == 0) return "G";
  return e.name.substr(0, 1);  // L, C or R
}

TEST_CASE("write_ladder writes plan::ladder_elements elements for every shape") {
  for (Shape shape : {Shape::pi, Shape::t, Shape::l}) {
    for (int sections : {1, 2, 3, 10, 257}) {
      for (bool r : {false, true}) {
        for (bool g : {false, true}) {
          INFO("shape " << model::shape_name(shape) << ", " << sections << " sections, r " << r
                        << ", g " << g);
          long long returned = 0;
          const std::string text = ladder_text(line_plan(sections, shape, r, g), {}, &returned);
          const auto elements = parse_elements(text);
          const long long expected = plan::ladder_elements(sections, shape, r, g);
          CHECK(returned == expected);
          CHECK(static_cast<long long>(elements.size()) == expected);
          // Counted by hand from the shapes: pi has one shunt more than it has sections, T one
          // series element more, L neither; R and G each double their side.
          const long long n = sections;
          const long long series = shape == Shape::t ? n + 1 : n;
          const long long shunt = shape == Shape::pi ? n + 1 : n;
          CHECK(expected == series * (r ? 2 : 1) + shunt * (g ? 2 : 1));
        }
      }
    }
  }
}

TEST_CASE("write_ladder writes each shape as its contract draws it") {
  // Small ladders spelled out in full: names, nodes, the halves at the ends.
  SECTION("pi: C/2 | L | C | L | C/2") {
    CHECK(ladder_text(line_plan(2, Shape::pi, false, false)) ==
          "C0 near ref 4e-13\n"
          "L1 near n1 2e-09\n"
          "C1 n1 ref 8e-13\n"
          "L2 n1 far 2e-09\n"
          "C2 far ref 4e-13\n");
  }
  SECTION("T: L/2 | C | L | C | L/2") {
    CHECK(ladder_text(line_plan(2, Shape::t, false, false)) ==
          "L0 near n1 1e-09\n"
          "C1 n1 ref 8e-13\n"
          "L1 n1 n2 2e-09\n"
          "C2 n2 ref 8e-13\n"
          "L2 n2 far 1e-09\n");
  }
  SECTION("L: (L, C) per section, the C at the far side") {
    CHECK(ladder_text(line_plan(2, Shape::l, false, false)) ==
          "L1 near n1 2e-09\n"
          "C1 n1 ref 8e-13\n"
          "L2 n1 far 2e-09\n"
          "C2 far ref 8e-13\n");
  }
  SECTION("pi with R and G: R beside each L through m<k>, 1/G beside each C") {
    CHECK(ladder_text(line_plan(1, Shape::pi, true, true)) ==
          "C0 near ref 4e-13\n"
          "RG0 near ref 2.048e+03\n"
          "R1 near m1 5e-01\n"
          "L1 m1 far 2e-09\n"
          "C1 far ref 4e-13\n"
          "RG1 far ref 2.048e+03\n");
  }
  SECTION("T with R: the end halves halve R as well as L") {
    CHECK(ladder_text(line_plan(1, Shape::t, true, false)) ==
          "R0 near m0 2.5e-01\n"
          "L0 m0 n1 1e-09\n"
          "C1 n1 ref 8e-13\n"
          "R1 n1 m1 2.5e-01\n"
          "L1 m1 far 1e-09\n");
  }
  SECTION("a charged line starts every capacitor at its voltage") {
    CHECK(ladder_text(line_plan(1, Shape::l, false, false), 200.0) ==
          "L1 near far 2e-09\n"
          "C1 far ref 8e-13 IC=2e+02\n");
  }
}

/// Follows the series elements from `near` and returns the nodes passed, in order.
std::vector<std::string> series_path(const std::vector<Element>& elements) {
  std::multimap<std::string, const Element*> by_node;
  for (const Element& e : elements)
    if (kind_of(e) == "L" || kind_of(e) == "R") {
      by_node.emplace(e.a, &e);
      by_node.emplace(e.b, &e);
    }
  std::vector<std::string> path = {"near"};
  std::set<const Element*> used;
  while (path.back() != "far") {
    const Element* next = nullptr;
    auto [from, to] = by_node.equal_range(path.back());
    for (auto it = from; it != to; ++it)
      if (!used.count(it->second)) {
        REQUIRE(next == nullptr);  // a ladder's series chain never branches
        next = it->second;
      }
    REQUIRE(next != nullptr);
    used.insert(next);
    path.push_back(next->a == path.back() ? next->b : next->a);
  }
  CHECK(used.size() * 2 == by_node.size());  // every series element is on the chain
  return path;
}

TEST_CASE("every ladder is one series chain with its shunts to ref and the line's totals") {
  for (Shape shape : {Shape::pi, Shape::t, Shape::l}) {
    for (int n : {1, 2, 5, 40}) {
      for (bool lossy : {false, true}) {
        INFO("shape " << model::shape_name(shape) << ", " << n << " sections, lossy " << lossy);
        const plan::LinePlan lp = line_plan(n, shape, lossy, lossy);
        const auto elements =
            parse_elements(ladder_text(lp, lossy ? 5.0 : std::optional<double>{}));

        std::set<std::string> names;
        std::map<std::string, double> total;
        std::map<std::string, int> count;
        std::map<std::string, std::vector<const Element*>> shunts_at;
        for (const Element& e : elements) {
          CHECK(names.insert(folded(e.name)).second);  // unique, case folded
          for (const std::string* node : {&e.a, &e.b})
            CHECK(std::regex_match(*node, std::regex("near|far|ref|n[1-9][0-9]*|m[0-9]+")));
          const std::string kind = kind_of(e);
          ++count[kind];
          total[kind] += kind == "G" ? 1.0 / e.value : e.value;
          if (kind == "C" || kind == "G") {
            CHECK(e.b == "ref");
            shunts_at[e.a].push_back(&e);
          } else {
            CHECK(e.a != "ref");
            CHECK(e.b != "ref");
          }
          // Only capacitors carry a starting voltage, and all of them when the line is charged.
          CHECK(e.extra == (kind == "C" && lossy ? "IC=5e+00" : ""));
        }
        // The ladder holds the whole line: N sections' worth of L, C, R and G.
        CHECK_THAT(total["L"], Catch::Matchers::WithinRel(n * lp.section_l, 1e-12));
        CHECK_THAT(total["C"], Catch::Matchers::WithinRel(n * lp.section_c, 1e-12));
        if (lossy) {
          CHECK_THAT(total["R"], Catch::Matchers::WithinRel(n * lp.section_r, 1e-12));
          CHECK_THAT(total["G"], Catch::Matchers::WithinRel(n * lp.section_g, 1e-12));
          CHECK(count["R"] == count["L"]);
          CHECK(count["G"] == count["C"]);
        }

        // Along the chain: inner nodes n<k> (and m<k> with R), then the shunts: one C (and
        // its G) at every n<k>, at both ports of a pi ladder, at the far port of an L ladder.
        const std::vector<std::string> path = series_path(elements);
        CHECK(path.size() == static_cast<std::size_t>(count["L"] + count["R"] + 1));
        std::size_t shunted = 0;
        for (const std::string& node : path) {
          const bool inner = node != "near" && node[0] == 'n';
          const bool want = inner || (node == "near" && shape == Shape::pi) ||
                            (node == "far" && shape != Shape::t);
          INFO("node " << node);
          CHECK(shunts_at[node].size() == (want ? (lossy ? 2u : 1u) : 0u));
          shunted += want;
        }
        CHECK(shunted == static_cast<std::size_t>(count["C"]));
        CHECK(count["L"] == (shape == Shape::t ? n + 1 : n));
        CHECK(count["C"] == (shape == Shape::pi ? n + 1 : n));
        for (const Element& e : elements) {
          const std::string kind = kind_of(e);
          // The halves: a pi ladder's shunts on its ports, a T ladder's first and last series
          // elements (L0, R0 at near; L<N>, R<N> at far).
          bool half = false;
          if (shape == Shape::pi && (kind == "C" || kind == "G"))
            half = e.a == "near" || e.a == "far";
          if (shape == Shape::t && (kind == "L" || kind == "R"))
            half = e.name.substr(1) == "0" || e.name.substr(1) == std::to_string(n);
          const double full = kind == "L"   ? lp.section_l
                              : kind == "C" ? lp.section_c
                              : kind == "R" ? lp.section_r
                                            : 1.0 / lp.section_g;
          // A half shunt G is a resistor of twice 1/G; the other halves are half values.
          const double expected = !half ? full : kind == "G" ? 2.0 * full : full / 2.0;
          INFO(e.name << " " << e.a << " " << e.b << " " << e.value_text);
          CHECK(e.value_text == emit::spice_number(expected));
        }
      }
    }
  }
}

/// The ladder as ladder.h's contract draws it, written plainly, one std::string at a time:
/// what the fast writer must match byte for byte.
std::string contract_ladder(const plan::LinePlan& lp, std::optional<double> charged) {
  const int n = lp.sections;
  const std::string ic = charged ? " IC=" + emit::spice_number(*charged) : "";
  auto shunt_node = [&](int k) {
    return k == 0 ? std::string("near") : k == n ? std::string("far") : "n" + std::to_string(k);
  };
  std::string out;
  auto series = [&](int k, const std::string& a, const std::string& b, bool half) {
    const std::string K = std::to_string(k);
    const double scale = half ? 0.5 : 1.0;
    if (lp.section_r > 0.0) {
      out += "R" + K + " " + a + " m" + K + " " + emit::spice_number(lp.section_r * scale) + "\n";
      out += "L" + K + " m" + K + " " + b + " " + emit::spice_number(lp.section_l * scale) + "\n";
    } else {
      out += "L" + K + " " + a + " " + b + " " + emit::spice_number(lp.section_l * scale) + "\n";
    }
  };
  auto shunt = [&](int k, const std::string& node, bool half) {
    const std::string K = std::to_string(k);
    out += "C" + K + " " + node + " ref " + emit::spice_number(lp.section_c * (half ? 0.5 : 1.0)) +
           ic + "\n";
    if (lp.section_g > 0.0)
      out += "RG" + K + " " + node + " ref " +
             emit::spice_number((half ? 2.0 : 1.0) / lp.section_g) + "\n";
  };
  switch (lp.shape) {
    case Shape::pi:
      shunt(0, "near", true);
      for (int k = 1; k <= n; ++k) {
        series(k, shunt_node(k - 1), shunt_node(k), false);
        shunt(k, shunt_node(k), k == n);
      }
      break;
    case Shape::l:
      for (int k = 1; k <= n; ++k) {
        series(k, shunt_node(k - 1), shunt_node(k), false);
        shunt(k, shunt_node(k), false);
      }
      break;
    case Shape::t:
      series(0, "near", "n1", true);
      for (int k = 1; k <= n; ++k) {
        const std::string node = "n" + std::to_string(k);
        shunt(k, node, false);
        series(k, node, k == n ? "far" : "n" + std::to_string(k + 1), k == n);
      }
      break;
  }
  return out;
}

TEST_CASE("write_ladder writes the contract's ladder byte for byte, across new digits") {
  // Section counts at and beside the points where numbers gain a digit, where counted
  // names would go wrong first.
  for (Shape shape : {Shape::pi, Shape::t, Shape::l}) {
    for (int sections : {1, 8, 9, 10, 11, 99, 100, 101, 999, 1000, 1001, 10001}) {
      for (bool lossy : {false, true}) {
        INFO("shape " << model::shape_name(shape) << ", " << sections << " sections, lossy "
                      << lossy);
        const plan::LinePlan lp = line_plan(sections, shape, lossy, lossy);
        const std::optional<double> charged = lossy ? std::optional<double>(-3.3) : std::nullopt;
        CHECK(ladder_text(lp, charged) == contract_ladder(lp, charged));
      }
    }
  }
}

TEST_CASE("write_ladder holds the longest values a number can take") {
  // 24 characters (sign, 17 digits, point, e, sign, three digits) is the longest text
  // spice_number writes: negative L and C as long as that, R and G (which must be positive
  // to be written at all) one shorter, and a starting voltage as long.
  plan::LinePlan lp = line_plan(3, Shape::pi, true, true);
  lp.section_l = -1.2345678901234567e-300;
  lp.section_c = -2.2250738585072014e-300;
  lp.section_r = 1.7976931348623157e+300;
  lp.section_g = 1.0 / 1.2345678901234567e+300;
  const double charged = -1.2345678901234567e+300;
  CHECK(emit::spice_number(lp.section_l).size() == 24);
  CHECK(emit::spice_number(lp.section_c / 2).size() == 24);
  CHECK(emit::spice_number(charged).size() == 24);
  CHECK(ladder_text(lp, charged) == contract_ladder(lp, charged));
}

TEST_CASE("a long ladder is written in pieces, not held whole") {
  // A 200 000-section ladder (over 20 MB of text) written to a stream that counts what
  // arrives: it comes in pieces of under a megabyte, so the writer keeps no whole ladder.
  struct CountingBuffer : std::streambuf {
    std::size_t bytes = 0;
    std::size_t largest_write = 0;
    std::streamsize xsputn(const char*, std::streamsize n) override {
      bytes += static_cast<std::size_t>(n);
      largest_write = std::max(largest_write, static_cast<std::size_t>(n));
      return n;
    }
    int overflow(int c) override {
      ++bytes;
      return c;
    }
  } buffer;
  std::ostream out(&buffer);
  const long long n = emit::write_ladder(out, line_plan(200000, Shape::pi, true, true), {});
  CHECK(n == plan::ladder_elements(200000, Shape::pi, true, true));
  CHECK(buffer.bytes > 20u * 1000 * 1000);
  CHECK(buffer.largest_write < 1u << 20);
}

// ---- names --------------------------------------------------------------------------------

TEST_CASE("NameTable compares names with case folded") {
  emit::NameTable names;
  CHECK(names.reserve("V_a"));
  CHECK_FALSE(names.reserve("V_a"));
  CHECK_FALSE(names.reserve("v_A"));
  CHECK_FALSE(names.reserve("V_A"));
  CHECK(names.claim("v_a") == "v_a_2");
  CHECK(names.claim("V_a") == "V_a_3");
  CHECK_FALSE(names.reserve("v_A_2"));
  CHECK(names.claim("a__src") == "a__src");
  CHECK(names.claim("A__SRC") == "A__SRC_2");
}

TEST_CASE("NameTable skips suffixed names that are taken already") {
  emit::NameTable names;
  CHECK(names.reserve("x_2"));  // a user's node that looks like a generated second name
  CHECK(names.claim("x") == "x");
  CHECK(names.claim("X") == "X_3");
  CHECK(names.claim("x") == "x_4");
}

TEST_CASE("sanitize_name keeps letters, digits and underscores only") {
  CHECK(emit::sanitize_name("rx_1") == "rx_1");
  CHECK(emit::sanitize_name("Trunk9") == "Trunk9");
  CHECK(emit::sanitize_name("a.b-c d") == "a_b_c_d");
  CHECK(emit::sanitize_name("v(out)") == "v_out_");
  CHECK(emit::sanitize_name("") == "");
}

/// The deck of a description, made the way `rungs emit` makes it.
std::string deck_of(const std::string& text, emit::NetlistOptions options = {}) {
  const syntax::InputFile file{"names.rungs", text};
  syntax::Diagnostics diagnostics(file);
  const auto description = syntax::parse_description(diagnostics);
  const model::Circuit circuit = model::resolve(description, diagnostics);
  INFO(diagnostics.render());
  REQUIRE_FALSE(diagnostics.has_errors());
  plan::Plan plan = rungs::testing::analytic_plan(circuit);
  plan::set_closing_voltages(circuit, plan);  // as prepare_netlist does
  std::ostringstream out;
  const std::string error =
      emit::write_netlist(out, circuit, plan, {file.name, emit::sha256_hex(file.text)},
                       emit::builtin_templates(), options);
  REQUIRE(error.empty());
  return out.str();
}

/// One top-level element: its name and the nodes it connects, in order.
struct TopElement {
  std::string name;
  std::vector<std::string> nodes;
  std::string rest;  // values and model names, for telling elements apart
};

struct TopLevel {
  std::vector<TopElement> elements;
  std::vector<std::string> saved;
  std::vector<std::string> subckts;
};

/// The top level of a deck (outside .subckt ... .ends), split into elements.
TopLevel top_level(const std::string& deck) {
  TopLevel top;
  std::istringstream in(deck);
  bool inside = false;
  bool in_save = false;
  for (std::string line; std::getline(in, line);) {
    const auto w = words(line);
    if (w.empty() || w[0][0] == '*') continue;
    if (w[0] == ".subckt") {
      inside = true;
      top.subckts.push_back(w[1]);
      continue;
    }
    if (w[0] == ".ends") {
      inside = false;
      continue;
    }
    if (inside) continue;
    in_save = w[0] == ".save" || (w[0] == "+" && in_save);
    if (in_save) {
      for (std::size_t i = 1; i < w.size(); ++i) {
        REQUIRE(w[i].size() > 3);
        top.saved.push_back(w[i].substr(2, w[i].size() - 3));  // v(NODE)
      }
      continue;
    }
    if (w[0][0] == '.') continue;
    // Node fields by element letter: X near far ref SUBCKT; T a 0 b 0 Z0= TD=;
    // S a b control 0 MODEL; R, C, L, V: a b VALUE.
    const char letter = static_cast<char>(std::toupper(static_cast<unsigned char>(w[0][0])));
    const std::size_t nodes = letter == 'X' ? w.size() - 2 : letter == 'T' || letter == 'S' ? 4 : 2;
    REQUIRE(w.size() > nodes);
    TopElement e{w[0], {w.begin() + 1, w.begin() + 1 + static_cast<long>(nodes)}, ""};
    for (std::size_t i = 1 + nodes; i < w.size(); ++i) e.rest += " " + w[i];
    top.elements.push_back(e);
  }
  return top;
}

/// Element names unique and node spellings distinct, both with case folded.
void check_unique_names(const TopLevel& top) {
  std::set<std::string> element_names;
  std::map<std::string, std::string> node_spelling;
  for (const TopElement& e : top.elements) {
    INFO("element " << e.name);
    CHECK(element_names.insert(folded(e.name)).second);
    for (const std::string& node : e.nodes) {
      auto [it, fresh] = node_spelling.emplace(folded(node), node);
      CHECK(it->second == node);
    }
  }
  std::set<std::string> subckt_names;
  for (const std::string& s : top.subckts) CHECK(subckt_names.insert(folded(s)).second);
  for (const std::string& s : top.saved) {
    INFO("saved node " << s);
    CHECK(node_spelling.count(folded(s)) == 1);  // a .save names a node the deck has
  }
}

/// Checks that `clashing` and `plain` decks are the same circuit: element by element, the
/// same kinds and values on nodes that map one to one. A generated name that took a user's
/// node would join two nodes the plain deck keeps apart, and the map would not be one to one.
void check_same_circuit(const TopLevel& clashing, const TopLevel& plain) {
  REQUIRE(clashing.elements.size() == plain.elements.size());
  std::map<std::string, std::string> forward, backward;
  for (std::size_t i = 0; i < plain.elements.size(); ++i) {
    const TopElement& a = clashing.elements[i];
    const TopElement& b = plain.elements[i];
    INFO("element " << a.name << " against " << b.name);
    CHECK(std::toupper(static_cast<unsigned char>(a.name[0])) ==
          std::toupper(static_cast<unsigned char>(b.name[0])));
    REQUIRE(a.nodes.size() == b.nodes.size());
    if (a.name[0] != 'X') CHECK(a.rest == b.rest);
    for (std::size_t k = 0; k < a.nodes.size(); ++k) {
      INFO("node " << a.nodes[k] << " against " << b.nodes[k]);
      auto [f, fresh_f] = forward.emplace(folded(a.nodes[k]), b.nodes[k]);
      CHECK(f->second == b.nodes[k]);
      auto [r, fresh_r] = backward.emplace(b.nodes[k], folded(a.nodes[k]));
      CHECK(r->second == folded(a.nodes[k]));
    }
  }
  // Every line end is saved, in both decks alike.
  REQUIRE(clashing.saved.size() == plain.saved.size());
  for (std::size_t i = 0; i < plain.saved.size(); ++i) {
    INFO("saved " << clashing.saved[i] << " against " << plain.saved[i]);
    CHECK(forward[folded(clashing.saved[i])] == plain.saved[i]);
  }
}

/// A design whose nodes are given by `n`: the drive on n[0], loads on n[1], n[3], n[5].
std::string clash_design(const std::vector<std::string>& n) {
  std::string text = "set rise 200ps\n";
  const char* lines[][3] = {
      {"x", "0", "1"}, {"y", "1", "2"}, {"z", "2", "3"}, {"w", "1", "4"}, {"u", "4", "5"}};
  for (const auto& l : lines)
    text += std::string("line ") + l[0] + " " + n[std::stoul(l[1])] + " -> " + n[std::stoul(l[2])] +
            " ideal z0=50ohm delay=300ps\n";
  text += "drive " + n[0] + " step 0V to 1V rise=200ps source=50ohm\n";
  text += "load " + n[1] + " 1kohm at=2ns\n";
  text += "load " + n[3] + " 50ohm + 1pF\n";
  text += "load " + n[5] + " 50ohm || 2pF\n";
  return text;
}

const std::vector<std::string> kPlainNodes = {"p0", "p1", "p2", "p3", "p4", "p5"};

TEST_CASE("user nodes named like generated names keep the circuit as written") {
  // Each set takes, for nodes, names that the deck would otherwise generate: the drive's
  // inner node, source resistor and source; a load's resistor, capacitor, series joint,
  // switch, switch node and control; a line's instance; and the same in other cases.
  const std::vector<std::vector<std::string>> clashing = {
      {"a", "a__src", "R_b", "b", "v_A", "X_x"},
      {"a", "R_a__src", "V_a", "c", "S_a__src", "a__src__sw"},
      {"a", "A__SRC", "b__S", "b", "V_A__SRC__CTL", "c_B"},
      {"q", "q__src_2", "R_q__src_2", "r", "a__src__ctl", "R_r"},
  };
  for (const auto& nodes : clashing) {
    INFO("nodes " << nodes[0] << " " << nodes[1] << " " << nodes[2] << " " << nodes[3] << " "
                  << nodes[4] << " " << nodes[5]);
    const TopLevel top = top_level(deck_of(clash_design(nodes)));
    check_unique_names(top);
    check_same_circuit(top, top_level(deck_of(clash_design(kPlainNodes))));
  }
}

TEST_CASE("with the ideal lines beside, the two circuits share only ground") {
  const TopLevel top =
      top_level(deck_of(clash_design({"a", "a__src", "R_b", "b", "v_A", "X_x"}), {false, true}));
  check_unique_names(top);
  check_same_circuit(top, top_level(deck_of(clash_design(kPlainNodes), {false, true})));
  int ideal_lines = 0;
  for (const TopElement& e : top.elements) ideal_lines += e.name[0] == 'T';
  CHECK(ideal_lines == 5);
}

// A bug once, kept as a regression test: the ideal copy of node `b` was written as `b_ideal`
// whatever the names table said, so a user's own node `b_ideal` joined the ladder circuit to
// the ideal one.
TEST_CASE("with the ideal lines beside, a user's node named like an ideal copy stays apart") {
  const TopLevel top =
      top_level(deck_of(clash_design({"a", "a_ideal", "b", "b_ideal", "c", "d"}), {false, true}));
  check_unique_names(top);
  check_same_circuit(top, top_level(deck_of(clash_design(kPlainNodes), {false, true})));
}

// A bug once, kept as a regression test: a node named like a line's subcircuit (`line_x` for
// line x) was taken as reserved by the subcircuit's name and left out of `.save`.
TEST_CASE("a node named like a line's subcircuit is saved") {
  const TopLevel top = top_level(deck_of(clash_design({"a", "line_x", "b", "line_y", "c", "d"})));
  check_unique_names(top);
  check_same_circuit(top, top_level(deck_of(clash_design(kPlainNodes))));
}

// ---- templates ----------------------------------------------------------------------------

TEST_CASE("fill_template replaces every placeholder and nothing else") {
  const emit::TemplateValues values = {{"x", "1"}, {"y", "{{x}}"}};
  auto filled = emit::fill_template("t", "a {{x}} b {{y}}{{x}} {c} }} {", values);
  CHECK(filled.error.empty());
  CHECK(filled.text == "a 1 b {{x}}1 {c} }} {");  // a value is not filled again
  filled = emit::fill_template("t", "no placeholders\n", values);
  CHECK(filled.error.empty());
  CHECK(filled.text == "no placeholders\n");
}

TEST_CASE("fill_template names an unknown or unclosed placeholder") {
  const emit::TemplateValues values = {{"design", "d"}, {"lines", "2 lines"}};
  auto filled = emit::fill_template("header", "* {{desing}}\n", values);
  CHECK(filled.error == "template header: unknown placeholder {{desing}}; it knows design, lines");
  CHECK(filled.text.empty());
  filled = emit::fill_template("header", "* {{design}} {{}}\n", values);
  CHECK(filled.error == "template header: unknown placeholder {{}}; it knows design, lines");
  filled = emit::fill_template("header", "* {{design}} {{lines\n", values);
  CHECK(filled.error == "template header: '{{' with no '}}'");
  CHECK(filled.text.empty());
}

TEST_CASE("the built-in templates are the files in templates/") {
  namespace fs = std::filesystem;
  std::set<std::string> on_disk;
  for (const auto& entry : fs::directory_iterator(fs::path(RUNGS_SOURCE_DIR) / "templates")) {
    if (entry.path().extension() != ".tmpl") continue;
    const std::string name = entry.path().stem().string();
    on_disk.insert(name);
    std::ifstream in(entry.path(), std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    INFO(name);
    REQUIRE(emit::builtin_templates().count(name) == 1);
    CHECK(emit::builtin_templates().at(name) == text.str());
  }
  CHECK(on_disk == std::set<std::string>{"analysis", "header", "line_begin", "line_end"});
  CHECK(emit::builtin_templates().size() == on_disk.size());
}

TEST_CASE("check_templates passes the built-in set and names what is wrong in others") {
  CHECK(emit::check_templates(emit::builtin_templates()) == "");

  emit::TemplateSet missing = emit::builtin_templates();
  missing.erase("analysis");
  CHECK(emit::check_templates(missing) == "template analysis is missing");

  // A placeholder that belongs to another part of the deck.
  emit::TemplateSet borrowed = emit::builtin_templates();
  borrowed["header"] = "* {{design}} stops at {{stop}}\n";
  CHECK(emit::check_templates(borrowed) ==
        "template header: unknown placeholder {{stop}}; it knows design, elements, lines, "
        "source_hash, tolerance");

  emit::TemplateSet unclosed = emit::builtin_templates();
  unclosed["line_end"] = ".ends {{subckt}\n";
  CHECK(emit::check_templates(unclosed) == "template line_end: '{{' with no '}}'");

  // Leaving placeholders out is allowed: a shorter header is a fine override.
  emit::TemplateSet terse = emit::builtin_templates();
  terse["header"] = "* {{design}}\n";
  terse["line_end"] = ".ends\n";
  CHECK(emit::check_templates(terse) == "");
}

TEST_CASE("write_netlist reports a template that does not fill") {
  emit::TemplateSet bad = emit::builtin_templates();
  bad["line_begin"] = ".subckt {{subckt}} near far ref {{impedance}}\n";
  const syntax::InputFile file{"t.rungs",
                                "line t a -> b ideal z0=50ohm delay=1ns\n"
                                "drive a step 0V to 1V rise=100ps\nload b 50ohm\n"};
  syntax::Diagnostics diagnostics(file);
  const auto circuit = model::resolve(syntax::parse_description(diagnostics), diagnostics);
  REQUIRE_FALSE(diagnostics.has_errors());
  const auto plan = rungs::testing::analytic_plan(circuit);
  std::ostringstream out;
  const std::string error = emit::write_netlist(out, circuit, plan, {file.name, "0"}, bad, {});
  CHECK(error.rfind("template line_begin: unknown placeholder {{impedance}}; it knows ", 0) == 0);
}

// ---- the marker and the hash --------------------------------------------------------------

TEST_CASE("the deck marker names the tool, its version and the source") {
  CHECK(emit::deck_marker("board.rungs") == std::string("* generated by rungs ") + RUNGS_VERSION +
                                                " from board.rungs; do not edit, regenerate it");
  CHECK(emit::is_deck_marker(emit::deck_marker("x")));
  CHECK(emit::is_deck_marker("* generated by rungs 9.9.9 from other.rungs; do not edit"));
  CHECK_FALSE(emit::is_deck_marker("* my own deck"));
  CHECK_FALSE(emit::is_deck_marker(""));
  CHECK_FALSE(emit::is_deck_marker(" * generated by rungs 0.1.0"));
}

TEST_CASE("sha256_hex agrees with the published test vectors") {
  // FIPS PUB 180-2 (2002), Appendix B.1: the one-block message "abc".
  CHECK(emit::sha256_hex("abc") ==
        "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  // FIPS PUB 180-2, Appendix B.2: the 448-bit (56-byte), two-block message.
  CHECK(emit::sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq") ==
        "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  // FIPS PUB 180-2, Appendix B.3: one million repetitions of "a".
  CHECK(emit::sha256_hex(std::string(1000000, 'a')) ==
        "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
  // The empty message: NIST CAVP SHA256ShortMsg.rsp, Len = 0.
  CHECK(emit::sha256_hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  // The vectors above are recalled from the documents named, not re-read; each was confirmed
  // with GNU coreutils sha256sum 9.1 when this test was written.
}

TEST_CASE("sha256_hex pads correctly at the block boundaries") {
  // Lengths where the padding needs one or two blocks (55/56 bytes) and whole blocks.
  // Digests of that many 'x' bytes, computed with GNU coreutils sha256sum 9.1
  // (`head -c N /dev/zero | tr '\0' x | sha256sum`) when this test was written.
  const std::map<std::size_t, std::string> digests = {
      {55, "d5e285683cd4efc02d021a5c62014694958901005d6f71e89e0989fac77e4072"},
      {56, "04c26261370ee7541549d16dee320c723e3fd14671e66a099afe0a377c16888e"},
      {63, "75220b47218278e656f2013bb8f0c455a25eaf01e86c64924e9d48d89776d6f2"},
      {64, "7ce100971f64e7001e8fe5a51973ecdfe1ced42befe7ee8d5fd6219506b5393c"},
      {65, "9537c5fdf120482f7d58d25e9ed583f52c02b4e304ea814db1633ad565aed7e9"},
      {119, "000b48d4edf0fa7bee3c6236ecd2785baa5db4eeb8bb54341b029e0d9fa5fb0c"},
      {120, "13f05a0b594787f5ecd315edc96141bd3243203d1b7d4f0836f37308b276ba98"}};
  for (const auto& [length, digest] : digests) {
    INFO(length << " bytes");
    CHECK(emit::sha256_hex(std::string(length, 'x')) == digest);
  }
}

}  // namespace
