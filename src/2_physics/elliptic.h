// Complete elliptic integrals of the first kind, by the arithmetic-geometric mean.
#pragma once

namespace rungs::physics {

/// K(k) for modulus 0 <= k < 1: K = pi / (2 AGM(1, sqrt(1 - k^2))) (Abramowitz & Stegun,
/// Handbook of Mathematical Functions, 1964, 17.6). Converges quadratically.
double elliptic_k(double k);

/// K(k)/K(k') given k and its complement k' = sqrt(1 - k^2) separately, so that neither
/// loses digits when the other is close to 1; equals AGM(1, k)/AGM(1, k').
double elliptic_k_ratio(double k, double k_complement);

}  // namespace rungs::physics
