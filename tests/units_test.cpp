// Units: SI prefixes (case-sensitive), imperial lengths, per-length units, speeds, ratios,
// and the errors for values a simulator would misread.
#include <catch2/catch.hpp>

#include "1_syntax/units.h"

using namespace rungs::syntax;
using Catch::Matchers::WithinRel;

namespace {
double si(std::string_view token, Dimension d) {
  auto r = read_quantity(token, d);
  if (auto* e = std::get_if<UnitError>(&r)) FAIL("unexpected error: " << e->message);
  return std::get<double>(r);
}
std::string error_of(std::string_view token, Dimension d) {
  auto r = read_quantity(token, d);
  if (auto* e = std::get_if<UnitError>(&r)) return e->message;
  return "no error";
}
}  // namespace

TEST_CASE("SI prefixes follow the SI brochure and are case-sensitive") {
  // Prefix values: BIPM, The International System of Units (SI brochure), 9th ed. 2019, Table 7.
  CHECK_THAT(si("1mohm", Dimension::resistance), WithinRel(1e-3, 1e-15));
  CHECK_THAT(si("1Mohm", Dimension::resistance), WithinRel(1e6, 1e-15));
  CHECK_THAT(si("10kohm", Dimension::resistance), WithinRel(1e4, 1e-15));
  CHECK_THAT(si("4pF", Dimension::capacitance), WithinRel(4e-12, 1e-15));
  CHECK_THAT(si("250nH", Dimension::inductance), WithinRel(250e-9, 1e-15));
  CHECK_THAT(si("10uS", Dimension::conductance), WithinRel(10e-6, 1e-15));
  CHECK_THAT(si("2\xC2\xB5s", Dimension::time), WithinRel(2e-6, 1e-15));  // micro sign
  CHECK_THAT(si("2\xCE\xBCs", Dimension::time), WithinRel(2e-6, 1e-15));  // Greek mu
  CHECK_THAT(si("350ps", Dimension::time), WithinRel(350e-12, 1e-15));
  CHECK_THAT(si("3ms", Dimension::time), WithinRel(3e-3, 1e-15));
  CHECK_THAT(si("3mS", Dimension::conductance), WithinRel(3e-3, 1e-15));
  CHECK_THAT(si("1.5kV", Dimension::voltage), WithinRel(1500.0, 1e-15));
  CHECK_THAT(si("50\xCE\xA9", Dimension::resistance), WithinRel(50.0, 1e-15));  // Greek omega
  CHECK_THAT(si("2GHz", Dimension::frequency), WithinRel(2e9, 1e-15));
}

TEST_CASE("lengths in metres and in inch-based units") {
  // 1 in = 25.4 mm exactly and 1 ft = 0.3048 m exactly (international yard and pound, 1959).
  CHECK_THAT(si("42mm", Dimension::length), WithinRel(0.042, 1e-15));
  CHECK_THAT(si("35um", Dimension::length), WithinRel(35e-6, 1e-15));
  CHECK_THAT(si("2cm", Dimension::length), WithinRel(0.02, 1e-15));
  CHECK_THAT(si("3m", Dimension::length), WithinRel(3.0, 1e-15));
  CHECK_THAT(si("10mil", Dimension::length), WithinRel(254e-6, 1e-15));
  CHECK_THAT(si("2in", Dimension::length), WithinRel(0.0508, 1e-15));
  CHECK_THAT(si("6ft", Dimension::length), WithinRel(1.8288, 1e-15));
}

TEST_CASE("per-length units and speeds") {
  CHECK_THAT(si("250nH/m", Dimension::inductance_per_length), WithinRel(250e-9, 1e-15));
  CHECK_THAT(si("100pF/m", Dimension::capacitance_per_length), WithinRel(100e-12, 1e-15));
  CHECK_THAT(si("2ohm/m", Dimension::resistance_per_length), WithinRel(2.0, 1e-15));
  CHECK_THAT(si("10uS/m", Dimension::conductance_per_length), WithinRel(10e-6, 1e-15));
  CHECK_THAT(si("1pF/mm", Dimension::capacitance_per_length), WithinRel(1e-9, 1e-15));
  CHECK_THAT(si("30pF/ft", Dimension::capacitance_per_length), WithinRel(30e-12 / 0.3048, 1e-15));
  // c = 299 792 458 m/s exactly (SI definition of the metre).
  CHECK_THAT(si("0.66c", Dimension::speed), WithinRel(0.66 * 299792458.0, 1e-15));
  CHECK_THAT(si("2e8m/s", Dimension::speed), WithinRel(2e8, 1e-15));
}

TEST_CASE("ratios, percentages and counts") {
  CHECK_THAT(si("2%", Dimension::ratio), WithinRel(0.02, 1e-15));
  CHECK_THAT(si("4.3", Dimension::ratio), WithinRel(4.3, 1e-15));
  CHECK(si("120", Dimension::count) == 120.0);
  CHECK(error_of("12.5", Dimension::count) == "expected a whole number, found '12.5'");
  CHECK(error_of("12ohm", Dimension::count) == "expected a whole number with no unit, found '12ohm'");
}

TEST_CASE("numbers are read the same in every locale") {
  CHECK_THAT(si("1.25e-3s", Dimension::time), WithinRel(1.25e-3, 1e-15));
  CHECK_THAT(si(".5mm", Dimension::length), WithinRel(0.5e-3, 1e-15));
  CHECK_THAT(si("+3V", Dimension::voltage), WithinRel(3.0, 1e-15));
  CHECK_THAT(si("-3V", Dimension::voltage), WithinRel(-3.0, 1e-15));
}

TEST_CASE("values a simulator would misread are errors that say what to write") {
  CHECK(error_of("50", Dimension::resistance) == "'50' needs a unit: write 50ohm for a resistance");
  CHECK(error_of("1M", Dimension::resistance) ==
        "'1M' has a prefix but no unit, and a simulator would read M as milli: write 1Mohm for "
        "mega or 1mohm for milli");
  CHECK(error_of("10k", Dimension::resistance) == "'10k' has a prefix but no unit: write 10kohm");
  CHECK(error_of("1meg", Dimension::resistance) ==
        "'1meg' uses the simulator suffix 'meg', which is not a unit here: write 1Mohm for mega");
  CHECK(error_of("1Megohm", Dimension::resistance) ==
        "'1Megohm' uses the simulator suffix 'meg', which is not a unit here: write 1Mohm for mega");
  CHECK(error_of("4pf", Dimension::capacitance) ==
        "unknown unit 'pf' for a capacitance; did you mean 'pF'? (prefixes are case-sensitive)");
  CHECK(error_of("5ns", Dimension::length) == "expected a length such as 42mm, found a time '5ns'");
  CHECK(error_of("0.66", Dimension::speed) ==
        "'0.66' needs a unit: write 0.66c for a fraction of the speed of light, or a speed in m/s");
  CHECK(error_of("fifty", Dimension::resistance) ==
        "expected a resistance such as 50ohm, found 'fifty'");
  CHECK(error_of("3furlong", Dimension::length) ==
        "unknown unit 'furlong' for a length; write for example 42mm");
}

TEST_CASE("a load element takes ohms, farads or henries") {
  static constexpr Dimension kinds[] = {Dimension::resistance, Dimension::capacitance,
                                        Dimension::inductance};
  auto r = read_quantity_of("4pF", kinds);
  REQUIRE(std::holds_alternative<Quantity>(r));
  CHECK(std::get<Quantity>(r).dimension == Dimension::capacitance);
  auto bare = read_quantity_of("50", kinds);
  REQUIRE(std::holds_alternative<UnitError>(bare));
  CHECK(std::get<UnitError>(bare).message == "'50' needs a unit: write for example 50ohm, 4pF, 10nH");
  auto volts = read_quantity_of("5V", kinds);
  REQUIRE(std::holds_alternative<UnitError>(volts));
  CHECK(std::get<UnitError>(volts).message ==
        "expected a resistance or a capacitance or an inductance, found '5V'; write for example "
        "50ohm, 4pF, 10nH");
}
