// Names of circuit enumerations as the description language writes them; the ground node.
#include "3_model/circuit.h"

#include "1_syntax/text.h"

namespace rungs::model {

std::string_view method_name(IntegrationMethod method) {
  return method == IntegrationMethod::gear ? "gear" : "trap";
}

std::string_view shape_name(Shape shape) {
  switch (shape) {
    case Shape::pi: return "pi";
    case Shape::t: return "t";
    case Shape::l: return "l";
  }
  return "pi";
}

bool is_ground(std::string_view node) {
  return node == "0" || syntax::equals_folded(node, "gnd");
}

}  // namespace rungs::model
