// How fast decks are written and how much memory it takes: 1,000 lines whose sections grow
// from 50 to 2,000 each (about 1e5, 1e6 and 4e6 ladder elements), in this process through
// the emit stage and end to end through the `rungs emit` binary, against copying a file of
// the same size, the speed of writing the file at all.
#include <benchmark/benchmark.h>
#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include <fcntl.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include "bench_support.h"
#include "6_emit/netlist.h"
#include "6_emit/sha256.h"
#include "6_emit/templates.h"
#include "5_plan/plan.h"

namespace {

namespace fs = std::filesystem;
using rungs::bench::Planned;
using rungs::bench::scratch;

constexpr int kLines = 1000;

/// Sections a line so that kLines pi ladders (2N + 1 elements each) hold about `elements`.
int sections_for(long long elements) {
  return static_cast<int>(std::max(1LL, elements / kLines / 2));
}

long long elements_of(int sections) {
  return kLines * rungs::plan::ladder_elements(sections, rungs::model::Shape::pi, false, false);
}

/// An invented test board: kLines separate 48 ohm runs, each with its own driver and its
/// own terminated receiver, every run split into `sections` sections.
std::string design_text(int sections) {
  std::string text = "design bench_board\n";
  for (int i = 0; i < kLines; ++i) {
    const std::string n = std::to_string(i);
    text += "line run" + n + " tx" + n + " -> rx" + n +
            " ideal z0=48ohm delay=2.3ns sections=" + std::to_string(sections) + "\n" + "drive tx" +
            n + " step 0V to 1V rise=200ps source=50ohm\n" + "load rx" + n + " 50ohm || 2pF\n";
  }
  return text;
}

/// Only the current size is kept, so that the memory figures of a size do not include the
/// designs of the sizes before it.
const Planned& planned(int sections) {
  static std::unique_ptr<Planned> current;
  if (current && current->plan.lines.front().sections == sections) return *current;
  current.reset();
  current = rungs::bench::read_and_plan("bench_board.rungs", design_text(sections));
  return *current;
}

double seconds_since(std::chrono::steady_clock::time_point start) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
}

/// Copies `from` to `to` as plainly as a file can be written: reads and writes of 1 MiB,
/// nothing else. With `durable`, as `rungs emit` writes a deck (9_cli/output_file.cpp): into a
/// temporary file beside `to`, flushed to the disk, then renamed over `to`. False on failure.
bool copy_file(const fs::path& from, const fs::path& to, bool durable) {
  const fs::path target = durable ? fs::path(to.string() + ".tmp") : to;
  const int in = ::open(from.c_str(), O_RDONLY);
  const int out = ::open(target.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0666);
  bool ok = in >= 0 && out >= 0;
  std::unique_ptr<char[]> chunk(new char[1 << 20]);
  for (ssize_t n = 1; ok && n > 0;) {
    n = ::read(in, chunk.get(), 1 << 20);
    ok = n >= 0 && ::write(out, chunk.get(), static_cast<std::size_t>(n)) == n;
  }
  if (ok && durable) ok = ::fsync(out) == 0;
  if (in >= 0) ::close(in);
  if (out >= 0) ok = ::close(out) == 0 && ok;
  if (ok && durable) ok = ::rename(target.c_str(), to.c_str()) == 0;
  return ok;
}

/// The median wall time of `runs` copies of `deck`, s (see copy_file).
double copy_seconds(const fs::path& deck, bool durable, int runs) {
  std::vector<double> times;
  for (int i = 0; i < runs; ++i) {
    const auto start = std::chrono::steady_clock::now();
    if (!copy_file(deck, scratch() / "copy.cir", durable)) return 0.0;
    times.push_back(seconds_since(start));
  }
  std::nth_element(times.begin(), times.begin() + runs / 2, times.end());
  return times[static_cast<std::size_t>(runs / 2)];
}

/// The counters every benchmark here reports, for `elements` ladder elements a run. With a
/// `deck` and the mean wall time of a run, also `times_copy`: that time over the median of 5
/// copies of the deck (copy_file, `durable` as the run writes), measured right after the runs.
void report(benchmark::State& state, double elements, const fs::path& deck, double per_run,
            bool durable) {
  state.counters["elements"] = elements;
  state.counters["elements_per_second"] =
      benchmark::Counter(elements, benchmark::Counter::kIsIterationInvariantRate);
  state.counters["deck_MB"] = static_cast<double>(fs::file_size(deck)) / 1e6;
  if (per_run > 0.0) state.counters["times_copy"] = per_run / copy_seconds(deck, durable, 5);
}

/// write_netlist into a file, after parsing, resolving and planning outside the timing.
void BM_write_netlist(benchmark::State& state) {
  const Planned& p = planned(sections_for(state.range(0)));
  const std::string hash = rungs::emit::sha256_hex(p.file.text);
  const fs::path out = scratch() / "in_process.cir";
  const auto start = std::chrono::steady_clock::now();
  for (auto _ : state) {
    std::ofstream file(out, std::ios::binary | std::ios::trunc);
    const std::string error = rungs::emit::write_netlist(file, p.circuit, p.plan, {p.file.name, hash},
                                                      rungs::emit::builtin_templates(), {});
    file.close();
    if (!error.empty() || !file) state.SkipWithError("write_netlist failed");
  }
  const double per_run = seconds_since(start) / static_cast<double>(state.iterations());
  report(state, static_cast<double>(p.plan.elements), out, per_run, false);
  // The process's high-water mark so far: the sizes run smallest first, so growth with the
  // section count would show here as a rising figure.
  state.counters["peak_rss_MiB"] = rungs::bench::peak_rss_mib();
}

/// Runs `argv` and prints its peak resident memory in KiB. Called as a fresh process
/// (`emit_bench --peak-rss-of PROGRAM ARGS...`): Linux carries a process's peak into what it
/// executes, so a child started from the benchmark itself would report the benchmark's peak;
/// forked from this small process, it reports its own.
int peak_rss_of(char** argv) {
  const pid_t pid = fork();
  if (pid == 0) {
    execv(argv[0], argv);
    _exit(127);
  }
  int status = 0;
  rusage usage{};
  if (pid < 0 || wait4(pid, &status, 0, &usage) != pid) return 126;
  std::printf("%ld\n", usage.ru_maxrss);
  return WIFEXITED(status) ? WEXITSTATUS(status) : 125;
}

/// `rungs emit FILE --analytic -o OUT -q` end to end: reading, planning, writing, renaming into
/// place. --analytic, because the verified planner (emit's default) would measure every line
/// against the exact reference first, which verify_bench times on its own.
void BM_rungs_emit(benchmark::State& state) {
  const int sections = sections_for(state.range(0));
  const fs::path input = scratch() / ("board_" + std::to_string(sections) + ".rungs");
  const fs::path out = scratch() / "binary.cir";
  std::ofstream(input, std::ios::binary) << design_text(sections);
  const std::string command = fmt::format("'{}' --peak-rss-of '{}' emit '{}' --analytic -q -o '{}'",
                                          fs::read_symlink("/proc/self/exe").string(), RUNGS_BINARY,
                                          input.string(), out.string());
  double child_peak = 0.0;
  const auto start = std::chrono::steady_clock::now();
  for (auto _ : state) {
    FILE* pipe = popen(command.c_str(), "r");
    long kib = 0;
    const bool read = pipe && std::fscanf(pipe, "%ld", &kib) == 1;
    if (!pipe || pclose(pipe) != 0 || !read) {
      state.SkipWithError("rungs emit failed");
      break;
    }
    child_peak = std::max(child_peak, static_cast<double>(kib) / 1024.0);
  }
  const double per_run = seconds_since(start) / static_cast<double>(state.iterations());
  report(state, static_cast<double>(elements_of(sections)), out, per_run, true);
  state.counters["peak_rss_MiB"] = child_peak;  // of the rungs process alone
}

/// Copying a deck of this size (written once, outside the timing) with copy_file: the second
/// argument 0 copies plainly, as BM_write_netlist writes; 1 durably, as `rungs emit` writes.
void BM_copy_deck(benchmark::State& state) {
  const int sections = sections_for(state.range(0));
  const bool durable = state.range(1) != 0;
  const fs::path deck = scratch() / ("deck_" + std::to_string(sections) + ".cir");
  if (!fs::exists(deck)) {
    const Planned& p = planned(sections);
    std::ofstream file(deck, std::ios::binary);
    rungs::emit::write_netlist(file, p.circuit, p.plan, {p.file.name, rungs::emit::sha256_hex(p.file.text)},
                               rungs::emit::builtin_templates(), {});
  }
  for (auto _ : state) {
    if (!copy_file(deck, scratch() / "copy.cir", durable)) state.SkipWithError("copy failed");
  }
  report(state, static_cast<double>(elements_of(sections)), deck, 0.0, durable);
}

BENCHMARK(BM_write_netlist)
    ->Arg(100000)
    ->Arg(1000000)
    ->Arg(4000000)
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();
BENCHMARK(BM_rungs_emit)
    ->Arg(100000)
    ->Arg(1000000)
    ->Arg(4000000)
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();
BENCHMARK(BM_copy_deck)
    ->ArgsProduct({{100000, 1000000, 4000000}, {0, 1}})
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();

}  // namespace

int main(int argc, char** argv) {
  if (argc >= 3 && std::string(argv[1]) == "--peak-rss-of") return peak_rss_of(argv + 2);
  return rungs::bench::run_benchmarks(argc, argv);
}
