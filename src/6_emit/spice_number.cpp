// Shortest round-trip exponent notation for netlist values.
#include "6_emit/spice_number.h"

#include <charconv>


namespace rungs::emit {

std::string spice_number(double value) {
  if (value == 0.0) return "0";
  // std::to_chars without a precision gives the shortest text that reads back to the same
  // double (C++17 [charconv.to.chars]); scientific keeps it in exponent notation.
  char text[64];
  const auto result = std::to_chars(text, text + sizeof text, value, std::chars_format::scientific);
  return std::string(text, result.ptr);
}

}  // namespace rungs::emit
