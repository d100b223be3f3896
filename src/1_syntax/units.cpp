// Unit tables and the reading of value tokens into SI values.
#include "1_syntax/units.h"

#include <array>
#include <charconv>
#include <cmath>
#include <map>
#include <optional>
#include <vector>

#include <fmt/format.h>

#include "1_syntax/suggest.h"
#include "1_syntax/text.h"

namespace rungs::syntax {

namespace {

constexpr double kSpeedOfLight = 299792458.0;

struct Prefix {
  std::string_view symbol;
  double scale;
};
// Case-sensitive, as in SI: m is milli and M is mega. Both micro signs are accepted.
constexpr std::array<Prefix, 13> kPrefixes = {{{"f", 1e-15},
                                               {"p", 1e-12},
                                               {"n", 1e-9},
                                               {"u", 1e-6},
                                               {"\xC2\xB5", 1e-6},
                                               {"\xCE\xBC", 1e-6},
                                               {"m", 1e-3},
                                               {"", 1.0},
                                               {"k", 1e3},
                                               {"M", 1e6},
                                               {"G", 1e9},
                                               {"T", 1e12},
                                               {"c", 1e-2}}};

constexpr std::array<Dimension, 15> kAllDimensions = {
    Dimension::length,      Dimension::time,
    Dimension::resistance,  Dimension::capacitance,
    Dimension::inductance,  Dimension::conductance,
    Dimension::voltage,     Dimension::frequency,
    Dimension::speed,       Dimension::inductance_per_length,
    Dimension::capacitance_per_length, Dimension::resistance_per_length,
    Dimension::conductance_per_length, Dimension::ratio,
    Dimension::count};

using UnitTable = std::map<std::string, double, std::less<>>;

/// Every spelling of a unit with its prefixes, e.g. {"ohm", "mohm", "kohm", "Mohm", ...}.
void add_prefixed(UnitTable& table, std::string_view base, double scale = 1.0) {
  for (const Prefix& p : kPrefixes) {
    if (p.symbol == "c") continue;  // centi only for the metre
    table.emplace(std::string(p.symbol) + std::string(base), p.scale * scale);
  }
}

UnitTable length_units() {
  UnitTable t;
  add_prefixed(t, "m");
  t.emplace("cm", 1e-2);
  t.emplace("mil", 25.4e-6);
  t.emplace("in", 25.4e-3);
  t.emplace("ft", 0.3048);
  return t;
}

UnitTable per_length_units(std::initializer_list<std::string_view> bases) {
  static const std::array<std::pair<std::string_view, double>, 6> per = {
      {{"m", 1.0}, {"cm", 1e-2}, {"mm", 1e-3}, {"in", 25.4e-3}, {"ft", 0.3048}, {"mil", 25.4e-6}}};
  UnitTable t;
  for (std::string_view base : bases) {
    for (const auto& [length, metres] : per) {
      add_prefixed(t, fmt::format("{}/{}", base, length), 1.0 / metres);
    }
  }
  return t;
}

const UnitTable& units_of(Dimension d) {
  static const std::map<Dimension, UnitTable> tables = [] {
    std::map<Dimension, UnitTable> m;
    m[Dimension::length] = length_units();
    add_prefixed(m[Dimension::time], "s");
    for (std::string_view ohm : {"ohm", "\xCE\xA9", "\xE2\x84\xA6"}) add_prefixed(m[Dimension::resistance], ohm);
    add_prefixed(m[Dimension::capacitance], "F");
    add_prefixed(m[Dimension::inductance], "H");
    add_prefixed(m[Dimension::conductance], "S");
    add_prefixed(m[Dimension::voltage], "V");
    add_prefixed(m[Dimension::frequency], "Hz");
    for (const auto& [unit, scale] : length_units()) {
      m[Dimension::speed].emplace(unit + "/s", scale);
    }
    m[Dimension::speed].emplace("c", kSpeedOfLight);
    m[Dimension::inductance_per_length] = per_length_units({"H"});
    m[Dimension::capacitance_per_length] = per_length_units({"F"});
    m[Dimension::resistance_per_length] = per_length_units({"ohm", "\xCE\xA9", "\xE2\x84\xA6"});
    m[Dimension::conductance_per_length] = per_length_units({"S"});
    m[Dimension::ratio] = {{"", 1.0}, {"%", 0.01}};
    m[Dimension::count] = {{"", 1.0}};
    return m;
  }();
  return tables.at(d);
}



/// What messages say of each dimension: its noun, a well-written example, the unit to
/// suggest after a bare number, and the unit without prefix (for "write 1Mohm").
struct DimensionText {
  std::string_view noun, example, usual_unit, base_unit;
};

const DimensionText& text_of(Dimension d) {
  static const std::map<Dimension, DimensionText> table = {
      {Dimension::length, {"a length", "42mm", "mm", "m"}},
      {Dimension::time, {"a time", "1.2ns", "ns", "s"}},
      {Dimension::resistance, {"a resistance", "50ohm", "ohm", "ohm"}},
      {Dimension::capacitance, {"a capacitance", "4pF", "pF", "F"}},
      {Dimension::inductance, {"an inductance", "10nH", "nH", "H"}},
      {Dimension::conductance, {"a conductance", "1mS", "mS", "S"}},
      {Dimension::voltage, {"a voltage", "3.3V", "V", "V"}},
      {Dimension::frequency, {"a frequency", "100MHz", "MHz", "Hz"}},
      {Dimension::speed, {"a speed", "0.66c", "c", "m/s"}},
      {Dimension::inductance_per_length, {"an inductance per length", "250nH/m", "nH/m", "H/m"}},
      {Dimension::capacitance_per_length, {"a capacitance per length", "100pF/m", "pF/m", "F/m"}},
      {Dimension::resistance_per_length, {"a resistance per length", "2ohm/m", "ohm/m", "ohm/m"}},
      {Dimension::conductance_per_length, {"a conductance per length", "10uS/m", "uS/m", "S/m"}},
      {Dimension::ratio, {"a plain number or a percentage", "2%", "%", ""}},
      {Dimension::count, {"a whole number", "12", "", ""}},
  };
  return table.at(d);
}

std::string_view usual_unit(Dimension d) { return text_of(d).usual_unit; }
std::string_view base_unit(Dimension d) { return text_of(d).base_unit; }

struct Split {
  std::string_view number;
  std::string_view unit;
};

/// Splits "42.5e-3mm" into its number and unit, by the grammar's `number` production;
/// an empty number means the token does not start with one.
Split split_number(std::string_view token) {
  std::size_t i = 0;
  auto digits = [&] {
    std::size_t start = i;
    while (i < token.size() && token[i] >= '0' && token[i] <= '9') ++i;
    return i > start;
  };
  if (i < token.size() && (token[i] == '+' || token[i] == '-')) ++i;
  const bool whole = digits();
  bool fraction = false;
  if (i < token.size() && token[i] == '.') {
    ++i;
    fraction = digits();
  }
  if (!whole && !fraction) return {{}, token};
  if (i < token.size() && (token[i] == 'e' || token[i] == 'E')) {
    std::size_t mark = i++;
    if (i < token.size() && (token[i] == '+' || token[i] == '-')) ++i;
    if (!digits()) i = mark;
  }
  return {token.substr(0, i), token.substr(i)};
}

/// The number's value, or empty when it is out of the range of a double.
std::optional<double> to_double(std::string_view number) {
  if (!number.empty() && number.front() == '+') number.remove_prefix(1);
  double value = 0.0;
  const auto result = std::from_chars(number.data(), number.data() + number.size(), value);
  if (result.ec != std::errc()) return std::nullopt;
  return value;
}

/// number * scale, rounded once: for a scale that is a power of ten the exponent is shifted
/// in the text and read again, so 0.1ns is the double nearest 1e-10, not 0.1 * 1e-9.
double scaled(std::string_view number, double value, double scale) {
  static constexpr std::pair<double, int> kPowers[] = {{1e-15, -15}, {1e-12, -12}, {1e-9, -9},
                                                       {1e-6, -6},   {1e-3, -3},   {1e-2, -2},
                                                       {1e3, 3},     {1e6, 6},     {1e9, 9},
                                                       {1e12, 12}};
  for (const auto& [power, exponent] : kPowers) {
    if (scale != power) continue;
    if (!number.empty() && number.front() == '+') number.remove_prefix(1);
    const std::size_t e = number.find_first_of("eE");
    int shift = exponent;
    if (e != std::string_view::npos) {
      int written = 0;
      std::from_chars(number.data() + e + 1 + (number[e + 1] == '+'), number.data() + number.size(),
                      written);
      shift += written;
    }
    const std::string text = fmt::format("{}e{}", number.substr(0, e), shift);
    double exact = value * scale;
    std::from_chars(text.data(), text.data() + text.size(), exact);
    return exact;
  }
  return value * scale;
}

bool is_prefix_only(std::string_view unit) {
  for (const Prefix& p : kPrefixes) {
    if (!p.symbol.empty() && unit == p.symbol) return true;
  }
  return false;
}

bool starts_with_meg(std::string_view unit) {
  return starts_with_folded(unit, "meg");
}

std::string missing_unit_message(std::string_view token, std::string_view number,
                                 std::string_view unit, Dimension d) {
  if (unit.empty()) {
    if (d == Dimension::speed)
      return fmt::format("'{}' needs a unit: write {}c for a fraction of the speed of light, or a "
                         "speed in m/s",
                         token, number);
    return fmt::format("'{}' needs a unit: write {}{} for {}", token, number, usual_unit(d),
                       dimension_noun(d));
  }
  if (unit == "M" && d == Dimension::length)
    return fmt::format("'{}' has a prefix but no unit, and a simulator would read M as milli: "
                       "write {}m for metres or {}mm for millimetres",
                       token, number, number);
  if (unit == "M")
    return fmt::format("'{}' has a prefix but no unit, and a simulator would read M as milli: "
                       "write {}M{} for mega or {}m{} for milli",
                       token, number, base_unit(d), number, base_unit(d));
  return fmt::format("'{}' has a prefix but no unit: write {}{}{}", token, number, unit,
                     base_unit(d));
}

}  // namespace



std::string_view dimension_noun(Dimension d) { return text_of(d).noun; }

std::string_view dimension_example(Dimension d) { return text_of(d).example; }

std::variant<double, UnitError> read_quantity(std::string_view token, Dimension expected) {
  const Split split = split_number(token);
  if (split.number.empty())
    return UnitError{fmt::format("expected {} such as {}, found '{}'", dimension_noun(expected),
                                 dimension_example(expected), token)};
  const std::optional<double> number = to_double(split.number);
  if (!number) return UnitError{fmt::format("'{}' is out of range", token)};
  const UnitTable& table = units_of(expected);
  if (auto hit = table.find(split.unit); hit != table.end()) {
    const double value = scaled(split.number, *number, hit->second);
    if (expected == Dimension::count && value != std::floor(value))
      return UnitError{fmt::format("expected a whole number, found '{}'", token)};
    if (expected == Dimension::count && std::abs(value) > 1e9)
      return UnitError{fmt::format("'{}' is too large", token)};
    if (expected != Dimension::count && value != 0.0 &&
        !(std::abs(value) >= kSmallestValue && std::abs(value) <= kLargestValue))
      return UnitError{fmt::format(
          "'{}' is {:g} in SI units, outside what a simulator takes: a value is 0 or between "
          "{:g} and {:g} in size",
          token, value, kSmallestValue, kLargestValue)};
    return value;
  }
  if (expected == Dimension::count)
    return UnitError{fmt::format("expected a whole number with no unit, found '{}'", token)};
  if (split.unit.empty() || is_prefix_only(split.unit))
    return UnitError{missing_unit_message(token, split.number, split.unit, expected)};
  if (starts_with_meg(split.unit))
    return UnitError{fmt::format("'{}' uses the simulator suffix 'meg', which is not a unit here: "
                                 "write {}M{} for mega",
                                 token, split.number, base_unit(expected))};
  for (Dimension other : kAllDimensions) {
    if (other == expected || other == Dimension::count || other == Dimension::ratio) continue;
    if (units_of(other).count(split.unit))
      return UnitError{fmt::format("expected {} such as {}, found {} '{}'",
                                   dimension_noun(expected), dimension_example(expected),
                                   dimension_noun(other), token)};
  }
  std::vector<std::string_view> same_letters;
  for (const auto& [unit, scale] : table) {
    if (unit.size() == split.unit.size() && edit_distance(unit, split.unit) == 0)
      same_letters.push_back(unit);
  }
  if (same_letters.size() == 1)
    return UnitError{fmt::format("unknown unit '{}' for {}; did you mean '{}'? (prefixes are "
                                 "case-sensitive)",
                                 split.unit, dimension_noun(expected), same_letters.front())};
  if (same_letters.size() > 1)
    return UnitError{fmt::format("unknown unit '{}' for {}; did you mean {}? (prefixes are "
                                 "case-sensitive)",
                                 split.unit, dimension_noun(expected),
                                 fmt::format("'{}'", fmt::join(same_letters, "' or '")))};
  return UnitError{fmt::format("unknown unit '{}' for {}; write for example {}", split.unit,
                               dimension_noun(expected), dimension_example(expected))};
}

std::variant<Quantity, UnitError> read_quantity_of(std::string_view token,
                                                   std::span<const Dimension> allowed) {
  const Split split = split_number(token);
  for (Dimension d : allowed) {
    if (!split.number.empty() && units_of(d).count(split.unit)) {
      auto read = read_quantity(token, d);
      if (auto* value = std::get_if<double>(&read)) return Quantity{*value, d};
      return std::get<UnitError>(read);
    }
  }
  // A slip of case in one of the allowed units gets that unit's own "did you mean".
  for (Dimension d : allowed) {
    for (const auto& [unit, scale] : units_of(d)) {
      if (!split.number.empty() && !unit.empty() && unit.size() == split.unit.size() &&
          edit_distance(unit, split.unit) == 0)
        return std::get<UnitError>(read_quantity(token, d));
    }
  }
  std::vector<std::string> nouns;
  std::vector<std::string> examples;
  for (Dimension d : allowed) {
    nouns.emplace_back(dimension_noun(d));
    examples.emplace_back(dimension_example(d));
  }
  if (!split.number.empty() && is_prefix_only(split.unit)) {
    std::vector<std::string> spelled;
    for (Dimension d : allowed) spelled.push_back(fmt::format("{}{}", token, base_unit(d)));
    return UnitError{fmt::format("'{}' has a prefix but no unit: write {}", token,
                                 fmt::join(spelled, " or "))};
  }
  if (!split.number.empty() && split.unit.empty())
    return UnitError{fmt::format("'{}' needs a unit: write for example {}", token,
                                 fmt::join(examples, ", "))};
  if (!split.number.empty() && starts_with_meg(split.unit))
    return UnitError{fmt::format("'{}' uses the simulator suffix 'meg', which is not a unit here: "
                                 "write {}Mohm for mega",
                                 token, split.number)};
  return UnitError{fmt::format("expected {}, found '{}'; write for example {}",
                               fmt::join(nouns, " or "), token, fmt::join(examples, ", "))};
}

}  // namespace rungs::syntax
