// Coaxial line per-length parameters against published values.
#include <catch2/catch.hpp>

#include <cmath>
#include <stdexcept>

#include "2_physics/coax.h"
#include "2_physics/constants.h"
#include "2_physics/per_length.h"

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using rungs::physics::characteristic_impedance;
using rungs::physics::coax_per_length;
using rungs::physics::kEta0;
using rungs::physics::kPi;
using rungs::physics::kSpeedOfLight;
using rungs::physics::phase_velocity;

TEST_CASE("air coax with b/a = 2 matches the closed form") {
  const auto p = coax_per_length(1e-3, 2e-3, 1.0);
  // Air line, b/a = 2: L' = 138.63 nH/m, C' = 80.26 pF/m, Z0 = 41.56 ohm (calc; Pozar,
  // Microwave Engineering, Table 2.1). Five printed figures: half a unit of the last.
  CHECK_THAT(p.l, WithinAbs(138.63e-9, 0.005e-9));
  CHECK_THAT(p.c, WithinAbs(80.26e-12, 0.005e-12));
  CHECK_THAT(characteristic_impedance(p), WithinAbs(41.56, 0.005));
}

TEST_CASE("PTFE coax of Pozar's problem is 50 ohm") {
  // Inner conductor 0.91 mm, PTFE dielectric (er 2.08) 3.02 mm: Z0 = 49.9 ohm (book: Pozar,
  // 4th ed., Problem 2.3 data; allow 0.5 %).
  const auto p = coax_per_length(0.91e-3, 3.02e-3, 2.08);
  CHECK_THAT(characteristic_impedance(p), WithinRel(49.9, 0.005));
}

TEST_CASE("solid-polyethylene cables have the handbook capacitance and velocity") {
  // Solid polyethylene, er = 2.25 (practice; handbook figure). Diameters chosen for the
  // nominal impedance by inverting Z0 = eta0/(2 pi sqrt er) ln(b/a) (Pozar Table 2.1).
  const double er = 2.25;
  const double inner = 1e-3;
  const auto cable = [&](double z0) {
    const double outer = inner * std::exp(2.0 * kPi * z0 * std::sqrt(er) / kEta0);
    return coax_per_length(inner, outer, er);
  };
  const auto fifty = cable(50.0);
  const auto seventy_five = cable(75.0);
  REQUIRE_THAT(characteristic_impedance(fifty), WithinRel(50.0, 1e-12));
  REQUIRE_THAT(characteristic_impedance(seventy_five), WithinRel(75.0, 1e-12));
  // Solid-polyethylene 50-ohm and 75-ohm cable: velocity factor 0.66, about 100 pF/m and
  // 67 pF/m (practice; handbook figures; allow 3 %).
  CHECK_THAT(phase_velocity(fifty) / kSpeedOfLight, WithinRel(0.66, 0.03));
  CHECK_THAT(phase_velocity(seventy_five) / kSpeedOfLight, WithinRel(0.66, 0.03));
  CHECK_THAT(fifty.c, WithinRel(100e-12, 0.03));
  CHECK_THAT(seventy_five.c, WithinRel(67e-12, 0.03));
}

TEST_CASE("coax rejects impossible geometry") {
  CHECK_THROWS_AS(coax_per_length(0.0, 1e-3, 1.0), std::domain_error);
  CHECK_THROWS_AS(coax_per_length(2e-3, 1e-3, 1.0), std::domain_error);
  CHECK_THROWS_AS(coax_per_length(1e-3, 1e-3, 1.0), std::domain_error);
  CHECK_THROWS_AS(coax_per_length(1e-3, 2e-3, 0.5), std::domain_error);
  CHECK_THROWS_AS(coax_per_length(1e-3, 2e-3, std::nan("")), std::domain_error);
}
