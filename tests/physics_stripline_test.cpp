// Stripline (Cohn, with Wheeler's thickness correction) impedance against published values.
#include <catch2/catch.hpp>

#include <cmath>
#include <initializer_list>
#include <stdexcept>

#include "2_physics/constants.h"
#include "2_physics/per_length.h"
#include "2_physics/stripline.h"

using Catch::Matchers::WithinAbs;
using Catch::Matchers::WithinRel;
using rungs::physics::characteristic_impedance;
using rungs::physics::effective_permittivity;
using rungs::physics::kEta0;
using rungs::physics::kPi;
using rungs::physics::stripline_per_length;
using rungs::physics::stripline_z0;

TEST_CASE("zero-thickness stripline matches Cohn's exact values") {
  struct Row {
    double w_over_b, sqrt_er_z0, half_unit;
  };
  // Cohn's exact zero-thickness form, Z0 = eta0/(4 sqrt er) K(k)/K(k'), k = sech(pi W/2b)
  // (IRE Trans. MTT-2, 1954; memory for the citation): sqrt(er) Z0 = 120.43, 100.43,
  // 65.354 ohm at W/b = 0.35, 0.5, 1 (calc). Half a unit of the last printed figure.
  const double b = 3.2e-3;
  for (const Row row :
       {Row{0.35, 120.43, 0.005}, Row{0.5, 100.43, 0.005}, Row{1.0, 65.354, 0.0005}}) {
    for (const double er : {1.0, 2.2, 10.0}) {
      CAPTURE(row.w_over_b, er);
      CHECK_THAT(std::sqrt(er) * stripline_z0(row.w_over_b * b, b, 0.0, er),
                 WithinAbs(row.sqrt_er_z0, row.half_unit));
    }
  }
}

TEST_CASE("stripline formulas hold their digits for wide and thick strips") {
  struct Row {
    double w_over_b, t_over_b, sqrt_er_z0;
  };
  // Cohn's exact form (IRE Trans. MTT-2, 1954; memory for the citation) times Wheeler's
  // thickness ratio (IEEE Trans. MTT-26, 1978), recomputed for this test in 30-digit
  // arithmetic (calc; these rows are not in REFERENCES.md). They pin wide strips, where the
  // elliptic ratio is far from 1, and Wheeler's constants, which a ratio-only check cannot
  // see. Twelve figures printed, so relative 1e-10.
  const double b = 2e-3;
  for (const Row row :
       {Row{2.0, 0.0, 38.5793225723}, Row{3.0, 0.0, 27.3685428869}, Row{4.0, 0.0, 21.2062209599},
        Row{8.0, 0.0, 11.1573927886}, Row{12.7, 0.0, 7.16693057933}, Row{13.0, 0.0, 7.00696957997},
        Row{0.5, 0.1, 83.0306861461}, Row{0.1, 0.01, 183.651390225}, Row{2.0, 0.2, 29.492145447}}) {
    CAPTURE(row.w_over_b, row.t_over_b);
    CHECK_THAT(stripline_z0(row.w_over_b * b, b, row.t_over_b * b, 1.0),
               WithinRel(row.sqrt_er_z0, 1e-10));
  }
}

TEST_CASE("Pozar's 50-ohm stripline analyses back to 50 ohm") {
  // Pozar 4th ed., Example 3.5: 50 ohm, b = 3.2 mm, er = 2.20 gives W = 2.66 mm (book).
  // Pozar's design formula is a fit to the exact solution; allow 1 %.
  CHECK_THAT(stripline_z0(2.66e-3, 3.2e-3, 0.0, 2.20), WithinRel(50.0, 0.01));
}

TEST_CASE("stripline approaches its wide- and narrow-strip limits") {
  // Wide strip: K(k) -> pi/2 and K(k') -> ln(4/k) (Abramowitz & Stegun 17.3.26, equation
  // number recalled from memory) give sqrt(er) Z0 -> eta0/(4 (W/b + 2 ln 2/pi)): two
  // parallel-plate lines (Pozar Table 2.1) plus the edge fringing (calc). The neglected
  // terms are of order k^2 = 4 e^(-pi W/b).
  const double b = 1e-3;
  for (const double w_over_b : {5.0, 10.0, 30.0, 1000.0}) {
    CAPTURE(w_over_b);
    const double wide = kEta0 / (4.0 * (w_over_b + 2.0 * std::log(2.0) / kPi));
    CHECK_THAT(stripline_z0(w_over_b * b, b, 0.0, 1.0), WithinRel(wide, 1e-6));
  }
  // Narrow strip: k' = tanh(pi W/2b) -> pi W/2b, K(k) -> ln(4/k'), so
  // sqrt(er) Z0 -> (eta0/2 pi) ln(8 b/(pi W)) (same A&S asymptote; calc). Neglected terms
  // are of order (W/b)^2.
  for (const double w_over_b : {1e-3, 1e-4}) {
    CAPTURE(w_over_b);
    const double narrow = kEta0 / (2.0 * kPi) * std::log(8.0 / (kPi * w_over_b));
    CHECK_THAT(stripline_z0(w_over_b * b, b, 0.0, 1.0), WithinRel(narrow, 1e-5));
  }
}

TEST_CASE("stripline impedance is continuous where the wide-strip form takes over") {
  // The implementation switches to the asymptotic form at pi W/2b = 20, where the terms it
  // drops are below 1e-16 relative (calc); the two sides must meet.
  const double b = 1e-3;
  const double w_switch = 40.0 / kPi * b;
  CHECK_THAT(stripline_z0(w_switch * (1.0 - 1e-12), b, 0.0, 1.0),
             WithinRel(stripline_z0(w_switch * (1.0 + 1e-12), b, 0.0, 1.0), 1e-11));
}

TEST_CASE("strip thickness lowers stripline Z0") {
  // Wheeler, IEEE Trans. MTT-26, 1978: a thick strip acts wider and nearer the planes, so
  // Z0 falls with t (calc).
  const double b = 3.2e-3;
  for (const double w_over_b : {0.1, 0.5, 1.0, 3.0}) {
    double previous = stripline_z0(w_over_b * b, b, 0.0, 2.2);
    for (const double t_over_b : {0.001, 0.01, 0.05, 0.1, 0.25}) {
      CAPTURE(w_over_b, t_over_b);
      const double z = stripline_z0(w_over_b * b, b, t_over_b * b, 2.2);
      CHECK(z < previous);
      previous = z;
    }
  }
}

TEST_CASE("stripline thickness correction agrees with Cohn's thick-strip formula") {
  // Cohn, "Problems in strip transmission lines", IRE Trans. MTT-3, 1955 (formula and
  // citation recalled from memory), for W/(b - t) >= 0.35:
  // sqrt(er) Z0 = 94.15 / (W/(b - t) + C'f/(0.0885 er)), with
  // C'f/(0.0885 er) = (1/pi) {2/(1 - x) ln(1/(1 - x) + 1) - (1/(1 - x) - 1) ln(1/(1 - x)^2 - 1)},
  // x = t/b. Compared as the ratio Z0(t)/Z0(0), which cancels most of that approximation's
  // own error; recalled, so a loose 1 %.
  const auto cohn_1955 = [](double w_over_b, double x) {
    const double r = 1.0 / (1.0 - x);
    // The second term is 0 * ln 0 at x = 0; its limit is 0.
    const double thick_term = x > 0.0 ? (r - 1.0) * std::log(r * r - 1.0) : 0.0;
    const double fringe = (2.0 * r * std::log(r + 1.0) - thick_term) / kPi;
    return 94.15 / (w_over_b * r + fringe);
  };
  const double b = 1e-3;
  for (const double w_over_b : {0.5, 1.0, 2.0}) {
    for (const double x : {0.01, 0.05, 0.1, 0.2}) {
      CAPTURE(w_over_b, x);
      const double ratio =
          stripline_z0(w_over_b * b, b, x * b, 1.0) / stripline_z0(w_over_b * b, b, 0.0, 1.0);
      CHECK_THAT(ratio, WithinRel(cohn_1955(w_over_b, x) / cohn_1955(w_over_b, 0.0), 0.01));
    }
  }
}

TEST_CASE("stripline thickness goes continuously to zero") {
  // Wheeler's dW has x ln x, which vanishes as x = t/b -> 0 (calc): 1 pm is no copper.
  const double b = 3.2e-3;
  for (const double w_over_b : {0.05, 0.83, 5.0}) {
    CAPTURE(w_over_b);
    CHECK_THAT(stripline_z0(w_over_b * b, b, 1e-12, 2.2),
               WithinRel(stripline_z0(w_over_b * b, b, 0.0, 2.2), 1e-6));
  }
}

TEST_CASE("stripline per-length values carry eps_eff = er") {
  // Homogeneous dielectric: TEM, so eps_eff = er (Pozar Table 2.1; calc).
  const auto p = stripline_per_length(1e-3, 2e-3, 35e-6, 4.3);
  CHECK_THAT(effective_permittivity(p), WithinRel(4.3, 1e-12));
  CHECK_THAT(characteristic_impedance(p), WithinRel(stripline_z0(1e-3, 2e-3, 35e-6, 4.3), 1e-12));
}

TEST_CASE("stripline rejects impossible geometry") {
  CHECK_THROWS_AS(stripline_z0(0.0, 1e-3, 0.0, 2.2), std::domain_error);
  CHECK_THROWS_AS(stripline_z0(1e-3, 0.0, 0.0, 2.2), std::domain_error);
  CHECK_THROWS_AS(stripline_z0(1e-3, 1e-3, 1e-3, 2.2), std::domain_error);
  CHECK_THROWS_AS(stripline_z0(1e-3, 1e-3, -1e-6, 2.2), std::domain_error);
  CHECK_THROWS_AS(stripline_z0(1e-3, 1e-3, 0.0, 0.5), std::domain_error);
}
