// Complex numbers of the frequency domain: the type, and a reciprocal without scaling cost.
#pragma once
#include <complex>

namespace rungs::physics {

using Complex = std::complex<double>;

/// 1/z as conj(z)/|z|^2 where |z|^2 neither overflows nor underflows (1e-150 < |z| < 1e150),
/// else by the library's scaled division: the same value, without the scaling's cost in loops.
inline Complex reciprocal(Complex z) {
  const double n = std::norm(z);
  if (n > 1e-300 && n < 1e300) return {z.real() / n, -z.imag() / n};
  return 1.0 / z;
}

}  // namespace rungs::physics
