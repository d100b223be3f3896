// Load admittances: R, C and L combined in series and in parallel, opens and shorts kept apart.
#include "3_model/load_network.h"

#include <cmath>
#include <limits>
#include <stdexcept>

#include "1_syntax/invariant.h"

namespace rungs::model {

using physics::reciprocal;

LoadAdmittance load_admittance(const LoadNetwork& n, Complex s) {
  using Kind = LoadAdmittance::Kind;
  const bool dc = s == Complex(0.0, 0.0);
  switch (n.kind) {
    case NetworkKind::open:
      return {Kind::open, 0.0};
    case NetworkKind::short_circuit:
      return {Kind::short_circuit, 0.0};
    case NetworkKind::single:
      if (!(n.value >= 0.0) || !std::isfinite(n.value))
        throw std::invalid_argument("a load element must be zero or positive, and finite");
      switch (n.element) {
        case ElementKind::resistor:
          if (n.value == 0.0) return {Kind::short_circuit, 0.0};
          return {Kind::finite, 1.0 / n.value};
        case ElementKind::capacitor:
          if (n.value == 0.0 || dc) return {Kind::open, 0.0};
          return {Kind::finite, s * n.value};
        case ElementKind::inductor:
          if (n.value == 0.0 || dc) return {Kind::short_circuit, 0.0};
          return {Kind::finite, reciprocal(s * n.value)};
      }
      break;
    case NetworkKind::series: {
      Complex z = 0.0;
      bool any = false;
      for (const LoadNetwork& part : n.parts) {
        const LoadAdmittance p = load_admittance(part, s);
        if (p.kind == Kind::open) return {Kind::open, 0.0};
        if (p.kind == Kind::finite) {
          z += reciprocal(p.y);
          any = true;
        }
      }
      if (!any) return {Kind::short_circuit, 0.0};
      return {Kind::finite, reciprocal(z)};
    }
    case NetworkKind::parallel: {
      Complex y = 0.0;
      bool any = false;
      for (const LoadNetwork& part : n.parts) {
        const LoadAdmittance p = load_admittance(part, s);
        if (p.kind == Kind::short_circuit) return {Kind::short_circuit, 0.0};
        if (p.kind == Kind::finite) {
          y += p.y;
          any = true;
        }
      }
      if (!any) return {Kind::open, 0.0};
      return {Kind::finite, y};
    }
  }
  RUNGS_UNREACHABLE("unknown load network kind");
}

LoadAdmittance::Kind load_form(const LoadNetwork& network) {
  // Any s with a positive real part gives the same form; 1 + i keeps every element's value
  // within range.
  return load_admittance(network, Complex(1.0, 1.0)).kind;
}

double dc_resistance(const LoadNetwork& network) {
  const LoadAdmittance y = load_admittance(network, 0.0);
  switch (y.kind) {
    case LoadAdmittance::Kind::open:
      return std::numeric_limits<double>::infinity();
    case LoadAdmittance::Kind::short_circuit:
      return 0.0;
    case LoadAdmittance::Kind::finite:
      return 1.0 / y.y.real();
  }
  return std::numeric_limits<double>::infinity();
}

}  // namespace rungs::model
