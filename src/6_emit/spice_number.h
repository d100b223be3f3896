// Numbers as netlist text: exponent notation that reads back to the same double.
#pragma once
#include <string>

namespace rungs::emit {

/// `value` in exponent notation with the fewest digits that read back to the same double,
/// e.g. 2.5e-10, 5e+01; never a SPICE scale suffix (to a simulator `M` is milli). The same
/// text on every machine and in every locale.
std::string spice_number(double value);

}  // namespace rungs::emit
