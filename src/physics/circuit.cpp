// Names of circuit enumerations as the description language writes them.
#include "physics/circuit.h"

namespace rungs::physics {

std::string_view shape_name(Shape shape) {
  switch (shape) {
    case Shape::pi: return "pi";
    case Shape::t: return "t";
    case Shape::l: return "l";
  }
  return "pi";
}

}  // namespace rungs::physics
