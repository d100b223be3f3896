// Shortest round-trip exponent notation for netlist values.
#include "emit/spice_number.h"

#include <charconv>

#include <fmt/format.h>

namespace rungs::emit {

std::string spice_number(double value) {
  if (value == 0.0) return "0";
  // Seventeen significant digits always round-trip a double; try fewer first so that
  // 0.5 nH prints as 5e-10 rather than 5.0000000000000000e-10.
  for (int precision = 0; precision < 17; ++precision) {
    std::string text = fmt::format("{:.{}e}", value, precision);
    double back = 0.0;
    std::from_chars(text.data(), text.data() + text.size(), back);
    if (back == value) return text;
  }
  return fmt::format("{:.16e}", value);
}

}  // namespace rungs::emit
