// Reading a value token with its unit into an SI double.
#pragma once
#include <span>
#include <string>
#include <string_view>
#include <variant>

namespace rungs::syntax {

/// What a value measures. Each has its own units; a value must carry one of them.
enum class Dimension {
  length,                  // m, with SI prefixes; also mil, in, ft
  time,                    // s
  resistance,              // ohm (or Ω)
  capacitance,             // F
  inductance,              // H
  conductance,             // S
  voltage,                 // V
  frequency,               // Hz
  speed,                   // m/s, or a fraction of c: 0.66c
  inductance_per_length,   // H/m, H/mm, H/ft...
  capacitance_per_length,  // F/m
  resistance_per_length,   // ohm/m
  conductance_per_length,  // S/m
  ratio,                   // a plain number, or a percentage: 2%
  count,                   // a whole number, no unit
};

/// A value read from a token: SI magnitude and what it measures.
struct Quantity {
  double value = 0.0;
  Dimension dimension = Dimension::ratio;
};

/// Why a token could not be read; `message` is ready for a Diagnostic on the token.
struct UnitError {
  std::string message;
};

/// The sizes a non-zero value may have once its unit is applied, in SI units: beyond them a
/// derived figure (a section's L or C, a window, a time step) overflows or underflows a
/// double or a simulator's arithmetic. Checked by read_quantity.
inline constexpr double kSmallestValue = 1e-30;
inline constexpr double kLargestValue = 1e30;

/// Reads `token` (as written, e.g. "42mm") as a value of `expected`. Prefixes are
/// case-sensitive (m milli, M mega); a bare number where a unit is needed, a prefix with no
/// unit ("1M", "10k") and the simulator suffix "meg" are errors that say what to write.
/// Numbers are read without regard to the locale; a value outside kSmallestValue..kLargestValue
/// in size (other than 0) is an error.
std::variant<double, UnitError> read_quantity(std::string_view token, Dimension expected);

/// Reads `token` as any one of `allowed` (a load element may be ohms, farads or henries).
std::variant<Quantity, UnitError> read_quantity_of(std::string_view token,
                                                   std::span<const Dimension> allowed);

/// "a length", "a time"...: the noun an error message uses.
std::string_view dimension_noun(Dimension dimension);

/// An example of a well-written value, for messages: "42mm", "1.2ns".
std::string_view dimension_example(Dimension dimension);

}  // namespace rungs::syntax
