// Chain and admittance matrices of exact lines and N-section ladders, overflow-safe at any N.
#include "4_sim/two_port.h"

#include <cmath>

namespace rungs::sim {

namespace {

/// The series impedance Z and shunt admittance Y of one N-th of the line.
struct SectionImmittance {
  Complex z;
  Complex y;
};

SectionImmittance section_immittance(const LineTotals& line, int sections, Complex s) {
  const double n = static_cast<double>(sections);
  return {(line.r + s * line.l) / n, (line.g + s * line.c) / n};
}

/// sqrt(Z), sqrt(Y) and q = sqrt(ZY)/2 = sinh(theta/2), taken as a product of principal roots so
/// that Re q > 0 whenever Z and Y lie in the right half plane (a square root of the product could
/// land on the other branch).
struct SectionRoots {
  Complex root_z;
  Complex root_y;
  Complex q;
  Complex cosh_half;  // cosh(theta/2) = sqrt(1 + q^2)
};

SectionRoots section_roots(const SectionImmittance& zy) {
  SectionRoots r;
  r.root_z = std::sqrt(zy.z);
  r.root_y = std::sqrt(zy.y);
  r.q = 0.5 * r.root_z * r.root_y;
  r.cosh_half = std::sqrt(1.0 + r.q * r.q);
  return r;
}

/// The same for a lossless section (Z = sL, Y = sC): sqrt(Z) sqrt(Y) = s sqrt(LC) exactly when
/// Re s > 0, so only cosh(theta/2) needs a complex root; `y0` = sqrt(C/L) = root_y/root_z.
struct LosslessRoots {
  Complex q;
  Complex cosh_half;
  double y0 = 0.0;
};

LosslessRoots lossless_roots(const LineTotals& line, int sections, Complex s) {
  LosslessRoots r;
  r.q = 0.5 * s * (std::sqrt(line.l * line.c) / static_cast<double>(sections));
  r.cosh_half = std::sqrt(1.0 + r.q * r.q);
  r.y0 = std::sqrt(line.c / line.l);
  return r;
}

/// coth(w) and csch(w) from e = e^-w, Re w >= 0: the decaying form, |e^-2w| <= 1, so nothing
/// overflows however large Re w grows; beyond Re w of about 700 the csch underflows to zero and
/// the coth rounds to one, their limits. 1 - e^-2w is formed directly: the caller makes sure it
/// does not cancel.
CothCsch coth_csch_of_decay(Complex e) {
  const Complex x = e * e;
  const Complex inverse = reciprocal(1.0 - x);
  return {(1.0 + x) * inverse, 2.0 * e * inverse};
}

/// z^n for n >= 1 by repeated squaring: about 2 log2(n) products, each rounding once, so the
/// relative error grows as n times a rounding error, as that of exp(n log z) does.
Complex integer_power(Complex z, long long n) {
  Complex result(1.0, 0.0);
  for (;;) {
    if (n & 1) result *= z;
    n >>= 1;
    if (n == 0) return result;
    z *= z;
  }
}

}  // namespace

LineTotals line_totals(const model::Line& line) {
  const double length = line.length.value_or(0.0);
  return {.l = line.z0 * line.delay,
          .c = line.delay / line.z0,
          .r = line.per_length.r * length,
          .g = line.per_length.g * length};
}

Abcd operator*(const Abcd& m, const Abcd& n) {
  return {m.a * n.a + m.b * n.c, m.a * n.b + m.b * n.d, m.c * n.a + m.d * n.c,
          m.c * n.b + m.d * n.d};
}

Admittance admittance_from_abcd(const Abcd& m) {
  return {m.d / m.b, -1.0 / m.b, m.a / m.b};
}

Complex expm1(Complex z) {
  // e^(a+ib) - 1 = (e^a - 1) cos b + (cos b - 1) + i e^a sin b, with cos b - 1 = -2 sin^2(b/2).
  const double a = z.real();
  const double b = z.imag();
  const double half = std::sin(0.5 * b);
  return {std::expm1(a) * std::cos(b) - 2.0 * half * half, std::exp(a) * std::sin(b)};
}

CothCsch coth_csch(Complex w) {
  if (w.real() < 0.0) {
    const CothCsch m = coth_csch(-w);  // both are odd functions
    return {-m.coth, -m.csch};
  }
  if (std::norm(w) < 1.0) {
    // Small arguments: sinh and cosh cannot overflow, and 1 - e^-2w would lose digits.
    const Complex inverse = reciprocal(std::sinh(w));
    return {std::cosh(w) * inverse, inverse};
  }
  // With |w| >= 1, 1 - e^-2w is at least about 2 Re w, so forming it directly loses no more
  // than a rounding error relative to that.
  return coth_csch_of_decay(std::exp(-w));
}

Abcd line_abcd(const LineTotals& line, Complex s) {
  const Complex root_z = std::sqrt(line.r + s * line.l);
  const Complex root_y = std::sqrt(line.g + s * line.c);
  const Complex w = root_z * root_y;   // gamma l, Pozar eq. 2.5 times the length
  const Complex zc = root_z / root_y;  // Pozar eq. 2.7
  const Complex ch = std::cosh(w);
  const Complex sh = std::sinh(w);
  return {ch, zc * sh, sh / zc, ch};
}

Admittance line_admittance(const LineTotals& line, Complex s) {
  Complex w;
  Complex yc;  // 1/Zc
  if (line.r == 0.0 && line.g == 0.0) {
    // Lossless: gamma l = s sqrt(LC), Zc = sqrt(L/C), with no complex roots to take.
    w = s * std::sqrt(line.l * line.c);
    yc = std::sqrt(line.c / line.l);
  } else {
    const Complex root_z = std::sqrt(line.r + s * line.l);
    const Complex root_y = std::sqrt(line.g + s * line.c);
    w = root_z * root_y;
    yc = root_y * reciprocal(root_z);
  }
  const CothCsch h = coth_csch(w);
  return {h.coth * yc, -h.csch * yc, h.coth * yc};
}

Abcd section_abcd(const LineTotals& line, LadderSpec ladder, Complex s) {
  const auto [z, y] = section_immittance(line, ladder.sections, s);
  const Complex zy = z * y;
  switch (ladder.shape) {
    case model::Shape::pi:
      return {1.0 + 0.5 * zy, z, y * (1.0 + 0.25 * zy), 1.0 + 0.5 * zy};
    case model::Shape::t:
      return {1.0 + 0.5 * zy, z * (1.0 + 0.25 * zy), y, 1.0 + 0.5 * zy};
    case model::Shape::l:
      return {1.0 + zy, z, y, 1.0};
  }
  return {};
}

Complex section_propagation(const LineTotals& line, int sections, Complex s) {
  // cosh(theta) = 1 + 2 sinh^2(theta/2) = 1 + ZY/2, so sinh(theta/2) = sqrt(ZY)/2.
  return 2.0 * std::asinh(section_roots(section_immittance(line, sections, s)).q);
}

Abcd ladder_abcd(const LineTotals& line, LadderSpec ladder, Complex s) {
  const SectionRoots r = section_roots(section_immittance(line, ladder.sections, s));
  const Complex theta = 2.0 * std::asinh(r.q);
  const Complex sinh_theta = 2.0 * r.q * r.cosh_half;
  const double n = static_cast<double>(ladder.sections);
  // Chebyshev polynomials of the second kind at cosh(theta): U_{n-1} = sinh(n theta)/sinh(theta).
  const Complex u_n1 = std::sinh(n * theta) / sinh_theta;
  const Complex u_n2 = std::sinh((n - 1.0) * theta) / sinh_theta;
  const Abcd m = section_abcd(line, ladder, s);
  return {u_n1 * m.a - u_n2, u_n1 * m.b, u_n1 * m.c, u_n1 * m.d - u_n2};
}

Admittance ladder_admittance(const LineTotals& line, LadderSpec ladder, Complex s) {
  const SectionImmittance zy = section_immittance(line, ladder.sections, s);
  Complex q;
  Complex cosh_half;
  Complex root_ratio;  // sqrt(Y)/sqrt(Z)
  if (line.r == 0.0 && line.g == 0.0) {
    const LosslessRoots r = lossless_roots(line, ladder.sections, s);
    q = r.q;
    cosh_half = r.cosh_half;
    root_ratio = r.y0;
  } else {
    const SectionRoots r = section_roots(zy);
    q = r.q;
    cosh_half = r.cosh_half;
    root_ratio = r.root_y * reciprocal(r.root_z);
  }
  // 1/Zi from sinh(theta) = 2 q cosh(theta/2) = sqrt(Z) sqrt(Y) cosh(theta/2): the pi section's
  // Z/sinh(theta) and the T section's sinh(theta)/Y without forming 1 + ZY/4, which cancels
  // near cutoff.
  const Complex y_image = ladder.shape == model::Shape::t ? root_ratio * reciprocal(cosh_half)
                                                            : root_ratio * cosh_half;
  // e^{theta/2} = q + cosh(theta/2), as asinh(q) = log(q + sqrt(1 + q^2)), of magnitude at
  // least 1 for Re q >= 0, so e^{-N theta} = (q + cosh(theta/2))^{-2N}: an integer power of a
  // number of magnitude at most 1, a dozen products for a thousand sections instead of a complex
  // log and exp, none of which can overflow. It serves where coth_csch takes the decaying form,
  // |N theta| >= 1, which |theta/2| >= asinh|q| >= |q|/(1 + |q|) guarantees here.
  const double n = static_cast<double>(ladder.sections);
  const double size = std::sqrt(std::norm(q));
  CothCsch h;
  if (2.0 * n * size >= 1.0 + size) {
    h = coth_csch_of_decay(integer_power(reciprocal(q + cosh_half), 2LL * ladder.sections));
  } else {
    // Near q = 0 the log of a number near 1 loses digits, and asinh's series is used.
    const Complex theta = 2.0 * (std::norm(q) < 1e-6 ? std::asinh(q) : std::log(q + cosh_half));
    h = coth_csch(n * theta);
  }
  Admittance a{h.coth * y_image, -h.csch * y_image, h.coth * y_image};
  if (ladder.shape == model::Shape::l) {
    // (Z, Y)^N = shunt(-Y/2) (pi section)^N shunt(+Y/2): the near port loses the pi ladder's
    // C/2, the far port gains another C/2.
    a.y11 -= 0.5 * zy.y;
    a.y22 += 0.5 * zy.y;
  }
  return a;
}

}  // namespace rungs::sim
