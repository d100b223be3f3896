// Netlist names that stay distinct once a simulator folds their case.
#pragma once
#include <string>
#include <string_view>
#include <unordered_set>

namespace rungs::emit {

/// Hands out top-level netlist names, unique when compared without case (simulators fold
/// case). Names the user chose are reserved first, so generated names yield to them.
class NameTable {
 public:
  /// Reserves a name as it is; false when it is taken already (in any case).
  bool reserve(std::string_view name);
  /// `wanted` if free, else wanted_2, wanted_3, ...; the result is reserved.
  std::string claim(std::string_view wanted);

 private:
  std::unordered_set<std::string> folded_;
};

/// A name reduced to what every SPICE reads in a name: letters, digits and _; anything else
/// becomes _.
std::string sanitize_name(std::string_view name);

}  // namespace rungs::emit
