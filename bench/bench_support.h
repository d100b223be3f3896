// Shared by the benchmarks: a design read and planned as the command line does it, the
// scratch folder, and the main that runs Google Benchmark inside it.
#pragma once
#include <benchmark/benchmark.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <memory>
#include <string>

#include <sys/resource.h>

#include "3_model/circuit.h"
#include "3_model/resolve.h"
#include "5_plan/plan.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/parser.h"

namespace rungs::bench {

namespace fs = std::filesystem;

/// A description read, resolved and planned (analytically), as `rungs plan` does before it
/// verifies anything.
struct Planned {
  syntax::InputFile file;
  model::Circuit circuit;
  plan::Plan plan;
};

/// Reads `text` under `name` through the library's parser; a design with an error is a
/// broken benchmark, so its messages are printed and the process stops.
inline std::unique_ptr<Planned> read_and_plan(const std::string& name, std::string text) {
  auto p = std::make_unique<Planned>();
  p->file = {name, std::move(text)};
  syntax::Diagnostics diagnostics(p->file);
  const auto description = syntax::parse_description(diagnostics);
  p->circuit = model::resolve(description, diagnostics);
  if (!diagnostics.has_errors()) p->plan = plan::plan_circuit(p->circuit, diagnostics);
  if (diagnostics.has_errors()) {
    std::fputs(diagnostics.render().c_str(), stderr);
    std::abort();
  }
  return p;
}

/// This process's peak resident memory so far, MiB.
inline double peak_rss_mib() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  return static_cast<double>(usage.ru_maxrss) / 1024.0;
}

/// The benchmarks' scratch folder (set by run_benchmarks).
inline fs::path& scratch() {
  static fs::path dir;
  return dir;
}

/// Runs the registered benchmarks with scratch files in RUNGS_BENCH_DIR if set (a disk, not a
/// RAM-backed /tmp, measures the file system too), else in a fresh folder under the temporary
/// folder; the folder is removed at the end.
inline int run_benchmarks(int argc, char** argv) {
  const char* where = std::getenv("RUNGS_BENCH_DIR");
  std::string pattern =
      ((where ? fs::path(where) : fs::temp_directory_path()) / "rungs_bench_XXXXXX").string();
  if (!mkdtemp(pattern.data())) {
    std::perror("rungs bench: cannot make a scratch folder");
    return 1;
  }
  scratch() = pattern;
  benchmark::Initialize(&argc, argv);
  if (benchmark::ReportUnrecognizedArguments(argc, argv)) return 1;
  benchmark::RunSpecifiedBenchmarks();
  benchmark::Shutdown();
  std::error_code ec;
  fs::remove_all(scratch(), ec);
  return 0;
}

}  // namespace rungs::bench
