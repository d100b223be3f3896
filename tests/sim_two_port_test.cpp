// Two-ports of lines and ladders against their definitions, at any section count.
#include <catch2/catch.hpp>

#include <cmath>
#include <complex>
#include <numbers>

#include "4_sim/two_port.h"

using rungs::model::Shape;
using rungs::sim::Abcd;
using rungs::sim::Admittance;
using rungs::sim::admittance_from_abcd;
using rungs::sim::Complex;
using rungs::sim::ladder_abcd;
using rungs::sim::ladder_admittance;
using rungs::sim::LadderSpec;
using rungs::sim::line_abcd;
using rungs::sim::line_admittance;
using rungs::sim::LineTotals;
using rungs::sim::section_abcd;
using rungs::sim::section_propagation;

namespace {

constexpr double kPi = std::numbers::pi;

/// A 50 ohm line of 1 ns, optionally lossy.
LineTotals fifty_ohm(double r = 0.0, double g = 0.0) {
  return {.l = 50.0 * 1e-9, .c = 1e-9 / 50.0, .r = r, .g = g};
}

/// The angular cutoff of one of n sections: w_c sqrt(LC)/n = 2, from f_c = 1/(pi sqrt(L C))
/// (Lumped LC ladder, REFERENCES.md).
double cutoff(const LineTotals& line, int n) {
  return 2.0 * n / std::sqrt(line.l * line.c);
}

double relative(Complex a, Complex b) {
  return std::abs(a - b) / std::max(std::abs(b), 1e-300);
}

/// The N-section ladder as the explicit product of its section matrices: the definition.
Abcd product(const LineTotals& line, LadderSpec ladder, Complex s) {
  const Abcd m = section_abcd(line, ladder, s);
  Abcd p;
  for (int k = 0; k < ladder.sections; ++k) p = p * m;
  return p;
}

bool finite(const Admittance& y) {
  return std::isfinite(std::abs(y.y11)) && std::isfinite(std::abs(y.y12)) &&
         std::isfinite(std::abs(y.y22));
}

}  // namespace

TEST_CASE("a section's chain matrix is its elements cascaded") {
  const LineTotals line = fifty_ohm(3.0, 1e-3);
  const int n = 4;
  const Complex s(2e8, 3e9);
  const Complex z = (line.r + s * line.l) / double(n), y = (line.g + s * line.c) / double(n);
  // Series element [1 z; 0 1], shunt [1 0; y 1] (Pozar, Microwave Engineering, 4th ed.,
  // Table 4.1, recalled from memory); the emitted shapes pi = y/2 | z | y/2, T = z/2 | y | z/2,
  // L = z then y.
  const Abcd series{1.0, z, 0.0, 1.0}, half_series{1.0, z / 2.0, 0.0, 1.0};
  const Abcd shunt{1.0, 0.0, y, 1.0}, half_shunt{1.0, 0.0, y / 2.0, 1.0};
  const std::pair<Shape, Abcd> cases[] = {{Shape::pi, half_shunt * series * half_shunt},
                                          {Shape::t, half_series * shunt * half_series},
                                          {Shape::l, series * shunt}};
  for (const auto& [shape, expected] : cases) {
    const Abcd m = section_abcd(line, {n, shape}, s);
    CHECK(relative(m.a, expected.a) < 1e-14);
    CHECK(relative(m.b, expected.b) < 1e-14);
    CHECK(relative(m.c, expected.c) < 1e-14);
    CHECK(relative(m.d, expected.d) < 1e-14);
    // A reciprocal two-port has AD - BC = 1 (Pozar 4th ed., sec. 4.4, recalled from memory).
    CHECK(std::abs(m.a * m.d - m.b * m.c - 1.0) < 1e-12);
  }
}

TEST_CASE("the closed-form ladder equals the product of its sections") {
  const LineTotals lossless = fifty_ohm(), lossy = fifty_ohm(5.0, 2e-3);
  for (const LineTotals& line : {lossless, lossy}) {
    for (const Shape shape : {Shape::pi, Shape::t, Shape::l}) {
      for (const int n : {1, 2, 3, 7, 20, 40}) {
        // Below cutoff, near it and above it, with the damping of an inversion contour.
        for (const double x : {0.05, 0.6, 0.98, 3.0}) {
          const double w = x * cutoff(line, n);
          const Complex s(0.01 * w, w);
          const Abcd closed = ladder_abcd(line, {n, shape}, s);
          const Abcd explicit_product = product(line, {n, shape}, s);
          INFO("shape " << static_cast<int>(shape) << " n " << n << " x " << x);
          // Cayley-Hamilton for a unit-determinant matrix (any linear algebra text): the
          // Chebyshev form is exact, so only rounding separates the two.
          const double scale = std::abs(explicit_product.a) + std::abs(explicit_product.d) +
                               std::abs(explicit_product.b) / 50.0 +
                               std::abs(explicit_product.c) * 50.0;
          CHECK(std::abs(closed.a - explicit_product.a) / scale < 1e-10);
          CHECK(std::abs(closed.b - explicit_product.b) / 50.0 / scale < 1e-10);
          CHECK(std::abs(closed.c - explicit_product.c) * 50.0 / scale < 1e-10);
          CHECK(std::abs(closed.d - explicit_product.d) / scale < 1e-10);
          // The overflow-safe admittances agree with the product's (Pozar 4th ed., Table 4.2
          // conversion y11 = D/B, y12 = -1/B, y22 = A/B, recalled from memory).
          const Admittance y = ladder_admittance(line, {n, shape}, s);
          const Admittance yp = admittance_from_abcd(explicit_product);
          CHECK(relative(y.y11, yp.y11) < 1e-9);
          CHECK(relative(y.y22, yp.y22) < 1e-9);
          CHECK(relative(y.y12, yp.y12) < 1e-8);
        }
      }
    }
  }
}

TEST_CASE("a ladder of 100000 sections at ten times cutoff stays finite") {
  const LineTotals line = fifty_ohm();
  for (const Shape shape : {Shape::pi, Shape::t, Shape::l}) {
    INFO("shape " << static_cast<int>(shape));
    // At 10 f_c, cosh(theta) = 1 + ZY/2 = 1 - 2 (10)^2 = -199: Re theta = acosh(199) = 5.99 per
    // section, so cosh(N theta) overflows a double (about e^709) beyond N = 118.
    const int big = 100000, small = 100;
    const double w = 10.0 * cutoff(line, big);
    const Complex s(1e-6 * w, w);
    const Complex theta = section_propagation(line, big, s);
    CHECK_THAT(theta.real(), Catch::Matchers::WithinRel(std::acosh(199.0), 1e-6));
    const Abcd overflowing = ladder_abcd(line, {big, shape}, s);
    CHECK_FALSE(std::isfinite(std::abs(overflowing.a)));  // why the decaying form is needed
    const Admittance y = ladder_admittance(line, {big, shape}, s);
    REQUIRE(finite(y));

    // The same section values cut at N = 100, where the explicit product is still finite
    // (e^599): the admittances equal the product's, and N = 100000 differs from N = 100 only by
    // terms of e^{-2 N Re theta}, far below rounding.
    LineTotals short_line = line;
    const double scale = double(small) / double(big);
    short_line.l *= scale;
    short_line.c *= scale;
    const Abcd p = product(short_line, {small, shape}, s);
    REQUIRE(std::isfinite(std::abs(p.a)));
    const Admittance yp = admittance_from_abcd(p);
    const Admittance y_small = ladder_admittance(short_line, {small, shape}, s);
    CHECK(relative(y_small.y11, yp.y11) < 1e-9);
    CHECK(relative(y_small.y22, yp.y22) < 1e-9);
    CHECK(relative(y_small.y12, yp.y12) < 1e-6);
    CHECK(relative(y.y11, yp.y11) < 1e-9);
    CHECK(relative(y.y22, yp.y22) < 1e-9);
    CHECK(std::abs(y.y12) < 1e-250);  // transmission e^{-N theta}: nothing gets through
  }
}

TEST_CASE("image impedances and phase of a section at half its cutoff") {
  // Lumped LC ladder (REFERENCES.md, calc): at x = f/f_c = 0.5, 60 degrees a section,
  // Z_T = 0.86603 Z0, Z_pi = 1.15470 Z0 (Zobel, BSTJ 1923, recalled from memory).
  const LineTotals line = fifty_ohm();
  const int n = 100000;
  const double w = 0.5 * cutoff(line, n);
  const Complex theta = section_propagation(line, n, Complex(0.0, w));
  CHECK_THAT(theta.imag(), Catch::Matchers::WithinRel(kPi / 3.0, 1e-12));
  CHECK(std::abs(theta.real()) < 1e-12);
  // A long ladder with a little loss on the contour looks like its image impedance at the port:
  // y11 = coth(N theta)/Zi -> 1/Zi once N Re theta >> 1; the damping shifts Zi by O(sigma/w).
  const Complex s(1e-4 * w, w);
  const Admittance yt = ladder_admittance(line, {n, Shape::t}, s);
  const Admittance ypi = ladder_admittance(line, {n, Shape::pi}, s);
  // The printed figures carry five digits: 0.01 ohm covers them and the O(sigma/w) shift.
  CHECK(std::abs(1.0 / yt.y11 - 0.86603 * 50.0) < 0.01);
  CHECK(std::abs(1.0 / ypi.y11 - 1.15470 * 50.0) < 0.01);
  // An L ladder (Z, Y)^N starts with a whole series element: its series end shows
  // Z_T + Z/2 = Z0 (sqrt(1 - x^2) + j x) and its shunt end 1/(1/Z_pi + Y/2), both of magnitude
  // Z0 (calc from the same constant-k relations, Z/2 = j x Z0 and Y/2 = j x / Z0).
  const Admittance yl = ladder_admittance(line, {n, Shape::l}, s);
  const double x = 0.5;
  CHECK(std::abs(1.0 / yl.y11 - 50.0 * Complex(std::sqrt(1 - x * x), x)) < 0.01);
  CHECK(std::abs(1.0 / yl.y22 - 50.0 * Complex(std::sqrt(1 - x * x), -x)) < 0.01);
}

TEST_CASE("the exact line's admittances match its chain matrix and stay finite when long") {
  const LineTotals line = fifty_ohm(4.0, 1e-3);
  for (const double w : {1e6, 1e8, 3e9, 4e10}) {
    const Complex s(0.05 * w, w);
    const Admittance y = line_admittance(line, s);
    const Admittance yp = admittance_from_abcd(line_abcd(line, s));
    CHECK(relative(y.y11, yp.y11) < 1e-10);
    CHECK(relative(y.y12, yp.y12) < 1e-8);
    CHECK(relative(y.y22, yp.y22) < 1e-10);
  }
  // Re(gamma l) = 2000: cosh overflows, the decaying form gives the matched line: y11 = 1/Zc,
  // y12 = 0 (any text's lossy line of infinite length, e.g. Pozar 4th ed., sec. 2.1, recalled
  // from memory).
  const LineTotals lossless = fifty_ohm();
  const Complex s(2e12, 5e12);
  CHECK_FALSE(std::isfinite(std::abs(line_abcd(lossless, s).a)));
  const Admittance y = line_admittance(lossless, s);
  REQUIRE(finite(y));
  CHECK(relative(y.y11, 1.0 / 50.0) < 1e-14);
  CHECK(std::abs(y.y12) == 0.0);
}

TEST_CASE("a low-loss line attenuates by R'/(2 Z0) + G' Z0 / 2") {
  // 1 m of a 50 ohm line with R' = 2 ohm/m and G' = 1e-4 S/m, at frequencies where
  // R' << w L' and G' << w C'.
  const double length = 1.0, z0 = 50.0, v = 2e8;
  const double r = 2.0, g = 1e-4;
  const LineTotals line{
      .l = z0 / v * length, .c = 1.0 / (z0 * v) * length, .r = r * length, .g = g * length};
  // Pozar, Microwave Engineering, 4th ed., eq. 2.85 (REFERENCES.md): alpha = R'/(2 Z0) +
  // G' Z0 / 2 Np/m for a low-loss line.
  const double alpha = r / (2.0 * z0) + g * z0 / 2.0;
  for (const double f : {1e9, 1e10}) {
    const Complex s(0.0, 2.0 * kPi * f);
    // cosh(gamma l) = A = -y22/y12 for a reciprocal two-port (Table 4.2 conversions).
    const Admittance y = line_admittance(line, s);
    const Complex gamma_l = std::acosh(-y.y22 / y.y12);
    // The approximation drops terms of order (R'/(w L'))^2, below 1e-4 here.
    INFO("f = " << f);
    CHECK_THAT(std::abs(gamma_l.real()) / length, Catch::Matchers::WithinRel(alpha, 1e-3));
  }
}
