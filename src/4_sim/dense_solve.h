// A small dense complex system solved in place, for the nodal equations of most circuit parts.
#pragma once
#include <Eigen/Core>

namespace rungs::sim {

/// Solves a x = b by Gaussian elimination with partial pivoting, overwriting b with x (and a
/// with its factors); b may hold many right-hand sides (columns). Throws std::runtime_error when
/// a pivot is zero (a singular matrix).
///
/// Kept instead of Eigen's PartialPivLU because bench/dense_solve_bench.cpp measures it faster
/// at every size the nodal solve meets (2 to 48 unknowns, two right-hand sides; median CPU
/// time, release build): 43 against 228 ns at 2 unknowns, 113 against 462 ns at 4, 3.7
/// against 7.6 us at 16, 74 against 117 us at 48. A general LU's set-up (norms, permutation
/// objects) dominates at the few unknowns of most parts.
void solve_dense_in_place(Eigen::MatrixXcd& a, Eigen::MatrixXcd& b);

}  // namespace rungs::sim
