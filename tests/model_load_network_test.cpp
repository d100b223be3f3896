// A load network's admittance at s, and its form and DC resistance, which follow from it.
#include <catch2/catch.hpp>

#include "circuit_builders.h"

#include <cmath>
#include <limits>
#include <stdexcept>

#include "3_model/load_network.h"

using rungs::model::Complex;
using rungs::model::dc_resistance;
using rungs::model::ElementKind;
using rungs::model::load_admittance;
using rungs::model::load_form;
using rungs::model::LoadAdmittance;
using rungs::model::LoadNetwork;
using rungs::model::NetworkKind;
using rungs::testing::combine;
using rungs::testing::element;

namespace {
LoadNetwork of_kind(NetworkKind kind) {
  LoadNetwork n;
  n.kind = kind;
  return n;
}
}  // namespace

TEST_CASE("a load's admittance adds impedances in series and admittances in parallel") {
  // Z_R = R, Z_C = 1/(sC), Z_L = sL (any circuit-theory text; calc).
  const Complex s(2e8, 6.3e9);
  const LoadNetwork rc = combine(NetworkKind::parallel, {element(ElementKind::resistor, 50.0),
                                                         element(ElementKind::capacitor, 2e-12)});
  const LoadAdmittance y = load_admittance(rc, s);
  REQUIRE(y.kind == LoadAdmittance::Kind::finite);
  CHECK(std::abs(y.y - (1.0 / 50.0 + s * 2e-12)) < 1e-12 * std::abs(y.y));
  const LoadNetwork lr = combine(NetworkKind::series, {element(ElementKind::inductor, 2e-9),
                                                       element(ElementKind::resistor, 50.0)});
  const LoadAdmittance z = load_admittance(lr, s);
  REQUIRE(z.kind == LoadAdmittance::Kind::finite);
  CHECK(std::abs(1.0 / z.y - (s * 2e-9 + 50.0)) < 1e-12 * std::abs(1.0 / z.y));
}

TEST_CASE("a load's form and DC resistance follow from its admittance") {
  using Kind = LoadAdmittance::Kind;
  const LoadNetwork r = element(ElementKind::resistor, 50.0);
  const LoadNetwork c = element(ElementKind::capacitor, 2e-12);
  const LoadNetwork l = element(ElementKind::inductor, 2e-9);
  // At DC a capacitor is open and an inductor a short (calc).
  CHECK(dc_resistance(r) == Approx(50.0));
  CHECK(dc_resistance(combine(NetworkKind::parallel, {r, c})) == Approx(50.0));
  CHECK(dc_resistance(combine(NetworkKind::series, {l, r})) == Approx(50.0));
  CHECK(std::isinf(dc_resistance(combine(NetworkKind::series, {r, c}))));
  CHECK(dc_resistance(combine(NetworkKind::parallel, {r, l})) == 0.0);
  CHECK(dc_resistance(combine(NetworkKind::parallel, {r, r})) == Approx(25.0));
  CHECK(std::isinf(dc_resistance(of_kind(NetworkKind::open))));
  CHECK(dc_resistance(of_kind(NetworkKind::short_circuit)) == 0.0);

  CHECK(load_form(combine(NetworkKind::series, {r, c})) == Kind::finite);
  CHECK(load_form(element(ElementKind::capacitor, 0.0)) == Kind::open);
  CHECK(load_form(element(ElementKind::resistor, 0.0)) == Kind::short_circuit);
  CHECK(load_form(combine(NetworkKind::parallel, {r, of_kind(NetworkKind::short_circuit)})) ==
        Kind::short_circuit);
  CHECK(load_form(combine(NetworkKind::series, {r, of_kind(NetworkKind::open)})) == Kind::open);
}

TEST_CASE("a load element that is negative or not finite is refused") {
  const LoadNetwork bad = combine(NetworkKind::series, {element(ElementKind::resistor, 50.0),
                                                        element(ElementKind::capacitor, -1e-12)});
  CHECK_THROWS_WITH(load_form(bad), "a load element must be zero or positive, and finite");
  CHECK_THROWS_AS(
      dc_resistance(element(ElementKind::resistor, std::numeric_limits<double>::infinity())),
      std::invalid_argument);
}
