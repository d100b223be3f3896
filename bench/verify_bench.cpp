// How fast the verified planner measures ladders against the exact line: an invented board of
// 1,000 separate nets planned and verified, and one line of 1,000 sections verified against the
// time ngspice takes to simulate the deck `rungs emit` writes for it.
#include <benchmark/benchmark.h>
#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <cstdlib>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include "bench_support.h"
#include "5_plan/plan.h"
#include "5_plan/verify.h"
#include "1_syntax/diagnostics.h"

namespace {

namespace fs = std::filesystem;
using rungs::bench::Planned;
using rungs::plan::Plan;

constexpr int kBoardNets = 1000;

/// An invented tester load board: `nets` separate point-to-point nets, each a 3.3 V driver, a
/// trace and a receiver. Traces alternate between the top layer (50 ohm microstrip) and an inner
/// layer (50 ohm stripline), 20 to 150 mm long; drivers have 150 to 300 ps edges behind 25, 33
/// or 50 ohm; receivers are terminated (50 ohm || 2 pF), bare CMOS inputs (10 kohm || 3 pF), a
/// leaded input (2 nH ahead of one) or an AC terminator. The figures step through their ranges
/// with different strides, so that neighbouring nets differ in every figure.
std::string board_text(int nets) {
  constexpr std::array<const char*, 2> kLayers = {
      "microstrip width=0.36mm height=0.2mm thickness=35um er=4.3",
      "stripline width=0.2mm spacing=0.5mm thickness=17um er=4.3"};
  constexpr std::array<int, 4> kRisePs = {150, 200, 250, 300};
  constexpr std::array<int, 3> kSourceOhm = {25, 33, 50};
  constexpr std::array<const char*, 4> kLoads = {
      "50ohm || 2pF", "10kohm || 3pF", "2nH + (10kohm || 3pF)", "(51ohm + 100pF) || 10kohm || 3pF"};
  std::string text = "design tester_board\n";
  for (int i = 0; i < nets; ++i)
    text += fmt::format(
        "line net{0} drv{0} -> rcv{0} {1} length={2}mm\n"
        "drive drv{0} step 0V to 3.3V rise={3}ps source={4}ohm\n"
        "load rcv{0} {5}\n",
        i, kLayers[i % 2], 20 + (i * 37) % 131, kRisePs[(i * 7) % 4], kSourceOhm[i % 3],
        kLoads[(i * 5) % 4]);
  return text;
}

/// One line of 1,000 pi sections: a 48 ohm, 2.3 ns run from a 50 ohm driver with a 200 ps edge
/// to a terminated receiver (one net of emit_bench's board, its count fixed by sections=).
std::string long_ladder_text() {
  return "design long_ladder\n"
         "line run tx -> rx ideal z0=48ohm delay=2.3ns sections=1000\n"
         "drive tx step 0V to 1V rise=200ps source=50ohm\n"
         "load rx 50ohm || 2pF\n";
}

const Planned& board(int nets) {
  static std::unique_ptr<Planned> current;
  if (!current || static_cast<int>(current->circuit.lines.size()) != nets)
    current = rungs::bench::read_and_plan("tester_board.rungs", board_text(nets));
  return *current;
}

/// What a verification found, summed over the lines.
struct Tally {
  long long sections = 0;
  int adequate = 0;
};

void count(const Plan& plan, const rungs::plan::Verification& v, Tally& tally) {
  for (const auto& lp : plan.lines) tally.sections += lp.sections;
  for (const auto& lv : v.lines) tally.adequate += lv.adequate ? 1 : 0;
}

void report(benchmark::State& state, const Planned& p, const Tally& tally) {
  state.counters["lines"] = static_cast<double>(p.circuit.lines.size());
  state.counters["sections"] = static_cast<double>(tally.sections);
  state.counters["adequate"] = tally.adequate;
  state.counters["peak_rss_MiB"] = rungs::bench::peak_rss_mib();
}

/// plan_circuit then plan_verified, as `rungs plan` runs them: the planner measures the board's
/// connected parts (here each net) side by side on the machine's cores.
void BM_plan_verified(benchmark::State& state) {
  const Planned& p = board(static_cast<int>(state.range(0)));
  Tally tally;
  for (auto _ : state) {
    rungs::syntax::Diagnostics diagnostics(p.file);
    const Plan analytic = rungs::plan::plan_circuit(p.circuit, diagnostics);
    const auto [plan, verification] = rungs::plan::plan_verified(p.circuit, analytic);
    tally = {};
    count(plan, verification, tally);
  }
  report(state, p, tally);
}

/// The plan plan_verified chooses for the board of `nets` nets, made once.
const Plan& verified_board(int nets) {
  static std::unique_ptr<Plan> current;
  const Planned& p = board(nets);
  if (!current || current->lines.size() != p.circuit.lines.size())
    current = std::make_unique<Plan>(rungs::plan::plan_verified(p.circuit, p.plan).first);
  return *current;
}

/// verify_plan alone, as `rungs check` runs it, on the plan plan_verified chose (outside the
/// timing).
void BM_verify_plan(benchmark::State& state) {
  const Planned& p = board(static_cast<int>(state.range(0)));
  const Plan& verified = verified_board(static_cast<int>(state.range(0)));
  Tally tally;
  for (auto _ : state) {
    tally = {};
    count(verified, rungs::plan::verify_plan(p.circuit, verified), tally);
  }
  report(state, p, tally);
}

const Planned& long_ladder() {
  static const std::unique_ptr<Planned> p =
      rungs::bench::read_and_plan("long_ladder.rungs", long_ladder_text());
  return *p;
}

/// verify_plan of one line fixed at 1,000 sections: the exact reference, the ladder and the
/// common rule's ladder, over the plan's window.
void BM_verify_long_ladder(benchmark::State& state) {
  const Planned& p = long_ladder();
  Tally tally;
  for (auto _ : state) {
    tally = {};
    count(p.plan, rungs::plan::verify_plan(p.circuit, p.plan), tally);
  }
  report(state, p, tally);
}

double seconds_since(std::chrono::steady_clock::time_point start) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
}

/// The median wall time of `runs` calls of verify_plan on the long ladder, s.
double verify_seconds(int runs) {
  const Planned& p = long_ladder();
  std::vector<double> times;
  for (int i = 0; i < runs; ++i) {
    const auto start = std::chrono::steady_clock::now();
    benchmark::DoNotOptimize(rungs::plan::verify_plan(p.circuit, p.plan));
    times.push_back(seconds_since(start));
  }
  std::nth_element(times.begin(), times.begin() + runs / 2, times.end());
  return times[static_cast<std::size_t>(runs / 2)];
}

/// `ngspice -b -r RAW DECK` on the deck `rungs emit` writes for the long ladder (written once,
/// outside the timing), over the same window; the counter `verify_speedup` is this wall time
/// over the median of 7 verify_plan runs of the same line, measured here.
void BM_ngspice_long_ladder(benchmark::State& state) {
  if (std::system("ngspice --version >/dev/null 2>&1 </dev/null") != 0) {
    state.SkipWithError("ngspice is not on PATH");
    return;
  }
  const fs::path input = rungs::bench::scratch() / "long_ladder.rungs";
  const fs::path deck = rungs::bench::scratch() / "long_ladder.cir";
  std::ofstream(input, std::ios::binary) << long_ladder_text();
  if (std::system(
          fmt::format("'{}' emit '{}' -q -o '{}'", RUNGS_BINARY, input.string(), deck.string())
              .c_str()) != 0) {
    state.SkipWithError("rungs emit failed");
    return;
  }
  const std::string command =
      fmt::format("ngspice -b -r '{0}.raw' '{0}' >'{0}.log' 2>&1 </dev/null", deck.string());
  double seconds = 0.0;
  for (auto _ : state) {
    const auto start = std::chrono::steady_clock::now();
    if (std::system(command.c_str()) != 0) {
      state.SkipWithError("ngspice failed");
      return;
    }
    seconds += seconds_since(start);
  }
  const double per_run = seconds / static_cast<double>(state.iterations());
  state.counters["verify_speedup"] = per_run / verify_seconds(7);
  state.counters["sections"] = 1000;
}

BENCHMARK(BM_plan_verified)
    ->Arg(10)
    ->Arg(100)
    ->Arg(kBoardNets)
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();
BENCHMARK(BM_verify_plan)->Arg(kBoardNets)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK(BM_verify_long_ladder)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK(BM_ngspice_long_ladder)->Unit(benchmark::kMillisecond)->UseRealTime();

}  // namespace

int main(int argc, char** argv) {
  return rungs::bench::run_benchmarks(argc, argv);
}
