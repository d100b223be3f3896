// Two-wire line per-length parameters against published values.
#include <catch2/catch.hpp>

#include <cmath>
#include <initializer_list>
#include <stdexcept>

#include "2_physics/constants.h"
#include "2_physics/per_length.h"
#include "2_physics/twin.h"

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using rungs::physics::characteristic_impedance;
using rungs::physics::effective_permittivity;
using rungs::physics::twin_per_length;

TEST_CASE("air two-wire line at D/2a = cosh(2.5) matches the closed form") {
  const double wire = 1e-3;
  const auto p = twin_per_length(wire, wire * std::cosh(2.5), 1.0);
  // Air, D/2a = cosh(2.5): L' = 1.000000 uH/m, C' = 11.1265 pF/m, Z0 = 299.792 ohm (calc;
  // Pozar Table 2.1; Hayt sec. 13.1.4, eqs. 20-21). L' has seven figures: relative 1e-6;
  // the others to half a unit of their last printed figure.
  CHECK_THAT(p.l, WithinRel(1.000000e-6, 1e-6));
  CHECK_THAT(p.c, WithinAbs(11.1265e-12, 0.00005e-12));
  CHECK_THAT(characteristic_impedance(p), WithinAbs(299.792, 0.0005));
}

TEST_CASE("two-wire line follows 276 log10(2D/d) at wide spacing") {
  // 276 log10(2D/d) approximates Z0 in air within 0.5 % for wide spacing (practice).
  const double wire = 1e-3;
  for (const double ratio : {10.0, 20.0, 50.0, 200.0}) {
    CAPTURE(ratio);
    const auto p = twin_per_length(wire, ratio * wire, 1.0);
    CHECK_THAT(characteristic_impedance(p), WithinRel(276.0 * std::log10(2.0 * ratio), 0.005));
  }
}

TEST_CASE("two-wire line in a dielectric slows by sqrt(er)") {
  // A TEM line in a homogeneous dielectric has L'C' = mu eps, so (c/v)^2 = er and Z0 falls
  // as 1/sqrt(er) (every row of Pozar Table 2.1; calc).
  const auto air = twin_per_length(1e-3, 5e-3, 1.0);
  const auto filled = twin_per_length(1e-3, 5e-3, 2.25);
  CHECK_THAT(effective_permittivity(filled), WithinRel(2.25, 1e-12));
  CHECK_THAT(characteristic_impedance(filled),
             WithinRel(characteristic_impedance(air) / 1.5, 1e-12));
}

TEST_CASE("two-wire line rejects touching wires") {
  CHECK_THROWS_AS(twin_per_length(1e-3, 1e-3, 1.0), std::domain_error);
  CHECK_THROWS_AS(twin_per_length(0.0, 1e-3, 1.0), std::domain_error);
  CHECK_THROWS_AS(twin_per_length(1e-3, 5e-3, 0.9), std::domain_error);
}
