// Two-ports of uniform lines and lumped ladders at a complex frequency, in chain and admittance
// form.
#pragma once
#include <complex>

#include "2_physics/complex.h"
#include "3_model/circuit.h"

namespace rungs::sim {

using physics::Complex;
using physics::reciprocal;

/// A whole line's series L (H), shunt C (F), series R (ohm) and shunt G (S).
struct LineTotals {
  double l = 0.0;
  double c = 0.0;
  double r = 0.0;
  double g = 0.0;
};

/// The totals of a resolved line: L = Z0 delay and C = delay / Z0 (its lossless figures, as the
/// planner sizes the ladder), R = R' length and G = G' length (zero when the line has no length).
LineTotals line_totals(const model::Line& line);

/// Chain (ABCD) matrix: [V1; I1] = [A B; C D] [V2; I2], with I1 flowing into port 1 and I2
/// flowing out of port 2 (Pozar, Microwave Engineering, 4th ed., sec. 4.4; section numbers in
/// this file are recalled from memory).
struct Abcd {
  Complex a{1.0, 0.0};
  Complex b{0.0, 0.0};
  Complex c{0.0, 0.0};
  Complex d{1.0, 0.0};
};

/// The cascade of `first` then `second` (the matrix product).
Abcd operator*(const Abcd& first, const Abcd& second);

/// Short-circuit admittances of a reciprocal two-port, both currents flowing into the ports:
/// [I1; I2] = [y11 y12; y12 y22] [V1; V2].
struct Admittance {
  Complex y11;
  Complex y12;
  Complex y22;
};

/// The admittances of a reciprocal (AD - BC = 1) chain matrix: y11 = D/B, y12 = -1/B,
/// y22 = A/B (Pozar 4th ed., Table 4.2). Needs B != 0; inherits any overflow of the entries.
Admittance admittance_from_abcd(const Abcd& m);

/// The exact uniform line: with gamma l = sqrt((R + sL)(G + sC)) and Zc = sqrt((R + sL)/(G + sC))
/// (Pozar 4th ed., eqs. 2.5 and 2.7), A = D = cosh(gamma l), B = Zc sinh(gamma l),
/// C = sinh(gamma l)/Zc. The roots take the branch with Re gamma > 0 and Re Zc > 0. Needs
/// Re s > 0, or s = 0 with R and G positive. Overflows once Re(gamma l) passes about 710.
Abcd line_abcd(const LineTotals& line, Complex s);

/// The same line's admittances, y11 = y22 = coth(gamma l)/Zc and y12 = -csch(gamma l)/Zc,
/// evaluated in the decaying form (coth w = (1 + e^-2w)/(1 - e^-2w), csch w = 2 e^-w/(1 - e^-2w)),
/// which stays finite at any length and frequency. Same domain as line_abcd.
Admittance line_admittance(const LineTotals& line, Complex s);

/// How a line is cut into a ladder.
struct LadderSpec {
  int sections = 1;
  model::Shape shape = model::Shape::pi;
};

/// One section of a ladder of `line` cut into ladder.sections, in the emitted shape, with series
/// Z = (R + sL)/N and shunt Y = (G + sC)/N: pi = Y/2 | Z | Y/2, T = Z/2 | Y | Z/2, L = Z then Y.
/// The entries are polynomials in ZY: pi [1 + ZY/2, Z; Y (1 + ZY/4), 1 + ZY/2],
/// T [1 + ZY/2, Z (1 + ZY/4); Y, 1 + ZY/2], L [1 + ZY, Z; Y, 1]; every one has AD - BC = 1.
Abcd section_abcd(const LineTotals& line, LadderSpec ladder, Complex s);

/// The propagation of one section: cosh(theta) = 1 + ZY/2 for every shape (the dispersion
/// cos(beta dz) = 1 - w^2 LC/2 of a periodic ladder on the j-omega axis; Brillouin, Wave
/// Propagation in Periodic Structures, 1946, recalled from memory). theta = 2 asinh(sqrt(ZY)/2),
/// which is exact where 1 + ZY/2 would lose digits, with Re theta > 0 for Re s > 0.
Complex section_propagation(const LineTotals& line, int sections, Complex s);

/// The N-section ladder's chain matrix in closed form: by Cayley-Hamilton (M^2 = 2 cosh(theta) M
/// - I for a matrix of unit determinant), M^N = U_{N-1} M - U_{N-2} I with the Chebyshev values
/// U_{n-1} = sinh(n theta)/sinh(theta). Overflows above cutoff once N Re(theta) passes about 710;
/// ladder_admittance does not.
Abcd ladder_abcd(const LineTotals& line, LadderSpec ladder, Complex s);

/// The N-section ladder's admittances, finite for any N and frequency. A pi or T ladder is
/// symmetric: y11 = y22 = coth(N theta)/Zi, y12 = -csch(N theta)/Zi, with the image impedance
/// Zi = Z/sinh(theta) for pi and sinh(theta)/Y for T (Z0/sqrt(1 - x^2) and Z0 sqrt(1 - x^2) on
/// the j-omega axis, x = f/f_c; Zobel, BSTJ 1923, recalled from memory), evaluated in the
/// decaying form of line_admittance. An L ladder (Z, Y)^N equals a pi ladder with -Y/2 shunted at
/// its near port and +Y/2 at its far port, so y11 -= Y/2 and y22 += Y/2. Needs Re s > 0, or
/// s = 0 with R and G positive.
Admittance ladder_admittance(const LineTotals& line, LadderSpec ladder, Complex s);

/// coth(w) and csch(w) in the decaying form, finite for every w with Re w >= 0 except w = 0.
struct CothCsch {
  Complex coth;
  Complex csch;
};
CothCsch coth_csch(Complex w);

/// e^z - 1 without the cancellation of exp(z) - 1 near z = 0.
Complex expm1(Complex z);

}  // namespace rungs::sim
