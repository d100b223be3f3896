// Gaussian elimination with partial pivoting on a small dense complex matrix.
#include "4_sim/dense_solve.h"

#include <stdexcept>

#include "2_physics/complex.h"

namespace rungs::sim {

using physics::Complex;
using physics::reciprocal;

void solve_dense_in_place(Eigen::MatrixXcd& a, Eigen::MatrixXcd& b) {
  const Eigen::Index n = a.rows();
  const Eigen::Index m = b.cols();
  for (Eigen::Index k = 0; k < n; ++k) {
    Eigen::Index p = k;
    double best = std::norm(a(k, k));
    for (Eigen::Index r = k + 1; r < n; ++r)
      if (std::norm(a(r, k)) > best) {
        best = std::norm(a(r, k));
        p = r;
      }
    if (best == 0.0) throw std::runtime_error("the nodal matrix is singular");
    if (p != k) {
      a.row(k).swap(a.row(p));
      b.row(k).swap(b.row(p));
    }
    const Complex inverse = reciprocal(a(k, k));
    for (Eigen::Index r = k + 1; r < n; ++r) {
      const Complex f = a(r, k) * inverse;
      if (f == Complex(0.0, 0.0)) continue;
      for (Eigen::Index c = k + 1; c < n; ++c) a(r, c) -= f * a(k, c);
      for (Eigen::Index c = 0; c < m; ++c) b(r, c) -= f * b(k, c);
    }
  }
  for (Eigen::Index r = n; r-- > 0;) {
    const Complex inverse = reciprocal(a(r, r));
    for (Eigen::Index c = 0; c < m; ++c) {
      Complex sum = b(r, c);
      for (Eigen::Index q = r + 1; q < n; ++q) sum -= a(r, q) * b(q, c);
      b(r, c) = sum * inverse;
    }
  }
}

}  // namespace rungs::sim
