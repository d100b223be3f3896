// Names of circuit enumerations as the description language writes them; the ground node.
#include "3_model/circuit.h"

namespace rungs::model {

std::string_view shape_name(Shape shape) {
  switch (shape) {
    case Shape::pi: return "pi";
    case Shape::t: return "t";
    case Shape::l: return "l";
  }
  return "pi";
}

bool is_ground(std::string_view node) {
  return node == "0" || (node.size() == 3 && (node[0] | 0x20) == 'g' && (node[1] | 0x20) == 'n' &&
                         (node[2] | 0x20) == 'd');
}

}  // namespace rungs::model
