// Complete elliptic integral K and the ratio K(k)/K(k') against known values.
#include <catch2/catch.hpp>

#include <cmath>
#include <initializer_list>
#include <stdexcept>

#include "2_physics/constants.h"
#include "2_physics/elliptic.h"

using Catch::Matchers::WithinRel;
using rungs::physics::elliptic_k;
using rungs::physics::elliptic_k_ratio;
using rungs::physics::kPi;

namespace {

// K(k) by its power series, pi/2 sum [(2n)!/(2^(2n) (n!)^2)]^2 k^(2n) (Abramowitz & Stegun
// 17.3.11, equation number recalled from memory): a method independent of the AGM.
double k_by_series(double k) {
  double coefficient = 1.0;  // (2n)!/(2^(2n) (n!)^2), built term by term
  double power = 1.0;
  double sum = 1.0;
  for (int n = 1; n < 5000; ++n) {
    coefficient *= (2.0 * n - 1.0) / (2.0 * n);
    power *= k * k;
    const double term = coefficient * coefficient * power;
    sum += term;
    if (term < 1e-18 * sum) break;
  }
  return kPi / 2.0 * sum;
}

}  // namespace

TEST_CASE("K(0) is pi/2") {
  // K(0) = pi/2 (Abramowitz & Stegun 17.3.11, first term; exact).
  CHECK_THAT(elliptic_k(0.0), WithinRel(kPi / 2.0, 1e-15));
}

TEST_CASE("K at modulus 1/sqrt2 matches the table and the lemniscate constant") {
  const double k = 1.0 / std::sqrt(2.0);
  // K(1/sqrt 2) = 1.854074677301372 (Abramowitz & Stegun, Table 17.1; recalled from
  // memory, so a looser 1e-9 relative).
  CHECK_THAT(elliptic_k(k), WithinRel(1.854074677301372, 1e-9));
  // K(1/sqrt 2) = Gamma(1/4)^2 / (4 sqrt pi), the lemniscatic case (identity recalled from
  // memory; both sides computed here, so only rounding separates them if it holds).
  CHECK_THAT(elliptic_k(k),
             WithinRel(std::pow(std::tgamma(0.25), 2) / (4.0 * std::sqrt(kPi)), 1e-12));
}

TEST_CASE("K at modular angle 15 degrees matches the table") {
  // K(sin 15 deg) = 1.598142002112540 (Abramowitz & Stegun, Table 17.1; recalled from
  // memory, so a looser 1e-9 relative).
  CHECK_THAT(elliptic_k(std::sin(kPi / 12.0)), WithinRel(1.598142002112540, 1e-9));
}

TEST_CASE("K agrees with its power series") {
  // Abramowitz & Stegun 17.3.11 summed to convergence (calc).
  for (const double k : {0.1, 0.3, 0.5, 0.7, 0.9, 0.99}) {
    CAPTURE(k);
    CHECK_THAT(elliptic_k(k), WithinRel(k_by_series(k), 1e-13));
  }
}

TEST_CASE("K near k = 1 follows the logarithmic asymptote") {
  // K(k) = ln(4/k') + (k'^2/4)(ln(4/k') - 1) + O(k'^4 ln k') (Abramowitz & Stegun 17.3.26 and
  // the next term of its series; recalled from memory); at k' = 1.4e-6 the neglected terms
  // are below 1e-22 (calc).
  const double k = 1.0 - 1e-12;
  const double kc = std::sqrt((1.0 - k) * (1.0 + k));
  const double log_term = std::log(4.0 / kc);
  CHECK_THAT(elliptic_k(k), WithinRel(log_term + kc * kc / 4.0 * (log_term - 1.0), 1e-12));
}

TEST_CASE("K(k)/K(k') at singular values") {
  // Singular moduli: K(k')/K(k) = sqrt(r) for k = 1/sqrt2 (r = 1), sqrt2 - 1 (r = 2) and
  // sin 15 deg = (sqrt6 - sqrt2)/4 (r = 3) (Borwein & Borwein, Pi and the AGM, 1987;
  // recalled from memory, so 1e-12 rather than the last bit).
  struct Row {
    double k, r;
  };
  for (const Row row : {Row{1.0 / std::sqrt(2.0), 1.0}, Row{std::sqrt(2.0) - 1.0, 2.0},
                        Row{(std::sqrt(6.0) - std::sqrt(2.0)) / 4.0, 3.0}}) {
    CAPTURE(row.r);
    const double kc = std::sqrt((1.0 - row.k) * (1.0 + row.k));
    CHECK_THAT(elliptic_k_ratio(row.k, kc), WithinRel(1.0 / std::sqrt(row.r), 1e-12));
    CHECK_THAT(elliptic_k_ratio(kc, row.k), WithinRel(std::sqrt(row.r), 1e-12));
  }
}

TEST_CASE("K(k)/K(k') keeps its digits at a tiny modulus") {
  // k = 1e-10, k' = 1 in double: K(k) = pi/2, K(k') = ln(4/k), both to 1e-20 (Abramowitz &
  // Stegun 17.3.11 and 17.3.26; numbers recalled from memory). Computing k' from k, or k
  // from k', would lose one of them entirely.
  const double k = 1e-10;
  CHECK_THAT(elliptic_k_ratio(k, 1.0), WithinRel(kPi / 2.0 / std::log(4.0 / k), 1e-13));
  CHECK_THAT(elliptic_k_ratio(1.0, k), WithinRel(std::log(4.0 / k) / (kPi / 2.0), 1e-13));
}

TEST_CASE("elliptic functions reject moduli outside their range") {
  CHECK_THROWS_AS(elliptic_k(1.0), std::domain_error);
  CHECK_THROWS_AS(elliptic_k(-0.1), std::domain_error);
  CHECK_THROWS_AS(elliptic_k_ratio(0.5, 0.0), std::domain_error);
  CHECK_THROWS_AS(elliptic_k_ratio(0.5, 0.5), std::domain_error);  // not complements
}
