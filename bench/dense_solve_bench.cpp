// The dense nodal solve: the hand-written elimination (sim::solve_dense_in_place) against
// Eigen's PartialPivLU, at the sizes the frequency-domain nodal solve meets.
#include <benchmark/benchmark.h>

#include <complex>

#include <Eigen/Dense>

#include "4_sim/dense_solve.h"

namespace {

constexpr int kColumns = 2;  // right-hand sides: about one per source of a small part

/// A diagonally dominant complex matrix of `n` unknowns and its right-hand sides, fixed.
struct System {
  explicit System(int n)
      : a(Eigen::MatrixXcd::Random(n, n)), b(Eigen::MatrixXcd::Random(n, kColumns)) {
    a.diagonal().array() += 4.0;
  }
  Eigen::MatrixXcd a;
  Eigen::MatrixXcd b;
};

void BM_hand_written(benchmark::State& state) {
  const System sys(static_cast<int>(state.range(0)));
  Eigen::MatrixXcd a = sys.a;
  Eigen::MatrixXcd b = sys.b;
  for (auto _ : state) {
    a = sys.a;  // the solve overwrites both, as the nodal solve restamps them per frequency
    b = sys.b;
    rungs::sim::solve_dense_in_place(a, b);
    benchmark::DoNotOptimize(b.data());
  }
}

void BM_eigen_lu(benchmark::State& state) {
  const System sys(static_cast<int>(state.range(0)));
  Eigen::MatrixXcd a = sys.a;
  Eigen::MatrixXcd x = sys.b;
  Eigen::PartialPivLU<Eigen::MatrixXcd> lu(a.rows());  // storage kept, as a Stage would keep it
  for (auto _ : state) {
    a = sys.a;
    lu.compute(a);
    x = lu.solve(sys.b);
    benchmark::DoNotOptimize(x.data());
  }
}

// 48 is kDenseLimit in src/4_sim/frequency_network.cpp: larger parts are solved sparse.
BENCHMARK(BM_hand_written)->Arg(2)->Arg(3)->Arg(4)->Arg(8)->Arg(16)->Arg(48);
BENCHMARK(BM_eigen_lu)->Arg(2)->Arg(3)->Arg(4)->Arg(8)->Arg(16)->Arg(48);

}  // namespace

BENCHMARK_MAIN();
