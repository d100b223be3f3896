// Parallel-plate line per-length parameters against published values.
#include <catch2/catch.hpp>

#include <stdexcept>

#include "2_physics/per_length.h"
#include "2_physics/plates.h"

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using rungs::physics::characteristic_impedance;
using rungs::physics::effective_permittivity;
using rungs::physics::plates_per_length;

TEST_CASE("air plates 10 mm wide, 0.1 mm apart match the closed form") {
  const auto p = plates_per_length(10e-3, 0.1e-3, 1.0);
  // Air, W = 10 mm, d = 0.1 mm: L' = 12.566 nH/m, C' = 885.42 pF/m, Z0 = 3.7673 ohm (calc;
  // Pozar Table 2.1). Half a unit of the last printed figure.
  CHECK_THAT(p.l, WithinAbs(12.566e-9, 0.0005e-9));
  CHECK_THAT(p.c, WithinAbs(885.42e-12, 0.005e-12));
  CHECK_THAT(characteristic_impedance(p), WithinAbs(3.7673, 0.00005));
}

TEST_CASE("filled plates scale with the dielectric") {
  // Z0 = eta d/W with eta = eta0/sqrt(er), and a homogeneous dielectric gives
  // eps_eff = er (Pozar Table 2.1; calc).
  const auto air = plates_per_length(10e-3, 0.1e-3, 1.0);
  const auto filled = plates_per_length(10e-3, 0.1e-3, 4.0);
  CHECK_THAT(characteristic_impedance(filled),
             WithinRel(characteristic_impedance(air) / 2.0, 1e-12));
  CHECK_THAT(effective_permittivity(filled), WithinRel(4.0, 1e-12));
}

TEST_CASE("plates reject a zero gap or width") {
  CHECK_THROWS_AS(plates_per_length(0.0, 1e-3, 1.0), std::domain_error);
  CHECK_THROWS_AS(plates_per_length(1e-3, 0.0, 1.0), std::domain_error);
  CHECK_THROWS_AS(plates_per_length(1e-3, 1e-4, 0.0), std::domain_error);
}
