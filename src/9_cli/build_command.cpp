// `rungs build`: every netlist of a manifest, in parallel, rewriting only what changed.
#include <algorithm>
#include <filesystem>
#include <iostream>

#include <fmt/format.h>

#include "8_project/depfile.h"
#include "8_project/manifest.h"
#include "8_project/staleness.h"
#include "9_cli/commands.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/parallel.h"
#include "9_cli/subcommands.h"
#include "7_report/plan_report.h"

namespace rungs::cli {

namespace {

namespace fs = std::filesystem;

/// rungs.toml in the current folder or the nearest folder above it, as a path from the
/// current folder ("rungs.toml", "../rungs.toml"...); empty when there is none.
std::string find_manifest() {
  std::error_code ec;
  fs::path folder = fs::current_path(ec);
  if (ec) return "";
  std::string up;
  for (;;) {
    if (fs::is_regular_file(folder / build::kManifestName, ec))
      return up + std::string(build::kManifestName);
    if (!folder.has_relative_path()) return "";
    folder = folder.parent_path();
    up += "../";
  }
}

/// A path written in the manifest, as this process opens it.
std::string from_manifest(const fs::path& folder, const std::string& path) {
  const fs::path written(path);
  if (written.is_absolute() || folder.empty()) return written.lexically_normal().string();
  return (folder / written).lexically_normal().string();
}

/// The manifest read and checked, with its jobs; empty (and `exit_code` set) on failure.
struct LoadedManifest {
  std::string path;
  std::vector<NetlistJob> jobs;
};

std::optional<LoadedManifest> load_manifest(const BuildOptions& options, int& exit_code) {
  std::string path = options.manifest;
  std::error_code ec;
  if (path.empty()) {
    path = find_manifest();
    if (path.empty()) {
      fmt::print(stderr,
                 "rungs: no {} in this folder or any folder above it; give one with "
                 "--manifest FILE\n",
                 build::kManifestName);
      exit_code = kExitBadInput;
      return std::nullopt;
    }
  } else if (fs::is_directory(path, ec)) {
    path = (fs::path(path) / build::kManifestName).string();
  }
  std::string error;
  const auto file = read_source(path, error);
  if (!file) {
    std::cerr << error;
    exit_code = kExitInternal;
    return std::nullopt;
  }
  syntax::Diagnostics diagnostics(*file);
  const build::Manifest manifest = build::parse_manifest(diagnostics);
  const fs::path folder = fs::path(path).parent_path();
  LoadedManifest loaded{path, {}};
  if (!diagnostics.has_errors()) {
    for (const build::NetlistEntry& entry : manifest.netlists) {
      NetlistJob job;
      job.source = from_manifest(folder, entry.source);
      job.header_name = fs::path(entry.source).lexically_normal().generic_string();
      job.output = from_manifest(folder, entry.output);
      if (!entry.report.empty()) job.report = from_manifest(folder, entry.report);
      if (!entry.report_json.empty()) job.report_json = from_manifest(folder, entry.report_json);
      const std::string templates = build::templates_of(manifest, entry);
      if (!templates.empty()) job.templates = from_manifest(folder, templates);
      job.library = entry.library;
      job.with_ideal = entry.with_ideal;
      job.defaults = manifest.defaults.settings;
      job.analytic = options.analytic;
      // Paths that lead nowhere are the manifest's mistake: point at them there.
      if (!fs::is_regular_file(job.source, ec))
        diagnostics.error(entry.source_span,
                          fmt::format("no description at '{}' (paths are relative to the "
                                      "manifest's folder)",
                                      job.source));
      if (!job.templates.empty() && !fs::is_directory(job.templates, ec))
        diagnostics.error(
            entry.templates.empty() ? manifest.defaults.templates_span : entry.templates_span,
            fmt::format("no template folder at '{}' (paths are relative to the "
                        "manifest's folder)",
                        job.templates));
      loaded.jobs.push_back(std::move(job));
    }
  }
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) {
    fmt::print(stderr, "{}: {} error{}; nothing written\n", file->name, diagnostics.error_count(),
               diagnostics.error_count() == 1 ? "" : "s");
    exit_code = kExitBadInput;
    return std::nullopt;
  }
  return loaded;
}

/// One file to write or check, and what became of it.
struct Task {
  std::size_t job = 0;
  JobOutput output;
  WriteOutcome written;
  Comparison compared;
};

std::string stale_reason(const Task& task) {
  if (!task.compared.exists) return "missing";
  if (task.output.is_netlist)
    return build::netlist_stale_reason(task.compared.existing_head, task.compared.expected_head);
  return "differs from what rungs writes now";
}

/// Writes one output if its bytes change, making its folder first: a fresh checkout has no
/// empty folders, since git keeps none.
WriteOutcome write_output(const JobOutput& output) {
  const fs::path folder = fs::path(output.path).parent_path();
  std::error_code ec;
  if (!folder.empty() && !fs::is_directory(folder, ec)) {
    fs::create_directories(folder, ec);
    if (ec) return {fmt::format("cannot make the folder '{}': {}", folder.string(), ec.message())};
  }
  return write_if_changed(output.path, output.write, false, true);
}

/// The depfile of a build: every output, made from the manifest, the descriptions and the
/// templates. Empty, with `error` set, when a path cannot be written in make syntax.
std::string build_depfile(const LoadedManifest& manifest, const std::vector<Task>& tasks,
                          const std::vector<Preparation>& prepared, std::string& error) {
  std::vector<std::string> targets, prerequisites;
  for (const Task& task : tasks) targets.push_back(task.output.path);
  std::error_code ec;
  prerequisites.push_back(fs::absolute(manifest.path, ec).lexically_normal().string());
  for (std::size_t i = 0; i < manifest.jobs.size(); ++i)
    for (std::string& path : job_prerequisites(manifest.jobs[i], *prepared[i].netlist))
      prerequisites.push_back(std::move(path));
  error = build::depfile_problem(targets, prerequisites);
  return build::make_depfile(targets, prerequisites);
}

/// Reads and plans every description on `threads` threads; prints their messages in
/// manifest order. Returns the worst exit code.
int prepare_all(const LoadedManifest& manifest, unsigned threads,
                std::vector<Preparation>& prepared) {
  prepared.resize(manifest.jobs.size());
  for_each_parallel(prepared.size(), threads, [&](std::size_t i) {
    try {
      prepared[i] = prepare_netlist(manifest.jobs[i]);
    } catch (const std::exception& e) {
      prepared[i].messages = fmt::format("rungs: internal error: {}\n", e.what());
      prepared[i].exit_code = kExitInternal;
    }
  });
  int exit_code = kExitOk;
  for (const Preparation& p : prepared) {
    std::cerr << p.messages;
    if (!p.netlist) exit_code = std::max(exit_code, p.exit_code);
  }
  return exit_code;
}

/// True (having said why) when a netlist to be written would replace a foreign file.
bool refuse_foreign_outputs(const std::vector<Task>& tasks) {
  bool refused = false;
  for (const Task& task : tasks) {
    if (task.output.is_netlist && is_foreign_file(task.output.path)) {
      fmt::print(stderr,
                 "rungs: '{}' exists and was not written by rungs; not overwriting "
                 "it (use --force to replace it)\n",
                 task.output.path);
      refused = true;
    }
  }
  return refused;
}

/// Prints what became of each task, in manifest order; returns how many were stale (with
/// --check) or written, and sets `exit_code` on a write error.
std::size_t print_outcomes(const std::vector<Task>& tasks, const std::vector<Preparation>& prepared,
                           const BuildOptions& options, int& exit_code) {
  std::size_t count = 0;
  for (const Task& task : tasks) {
    if (!task.written.error.empty()) {
      fmt::print(stderr, "rungs: {}\n", task.written.error);
      exit_code = kExitInternal;
    } else if (options.check && !task.compared.same) {
      fmt::print("{}: {}\n", task.output.path, stale_reason(task));
      ++count;
    } else if (!options.check && task.written.changed) {
      const PreparedNetlist& netlist = *prepared[task.job].netlist;
      if (!options.quiet && task.output.is_netlist)
        fmt::print(stderr, "rungs: wrote {}: {}\n", task.output.path,
                   report::plan_summary(netlist.circuit, netlist.plan, verification_of(netlist)));
      else if (!options.quiet)
        fmt::print(stderr, "rungs: wrote {}\n", task.output.path);
      ++count;
    }
  }
  std::fflush(stdout);
  return count;
}

}  // namespace

int build_command(const BuildOptions& options) {
  if (options.check && !options.depfile.empty()) {
    fmt::print(stderr, "rungs: --check writes nothing; leave out --depfile\n");
    return kExitBadInput;
  }
  int exit_code = kExitOk;
  const auto manifest = load_manifest(options, exit_code);
  if (!manifest) return exit_code;
  const unsigned threads = options.jobs == 0 ? default_thread_count() : options.jobs;

  // Every description is read and planned before anything is written, so that one bad
  // description leaves every output as it was.
  std::vector<Preparation> prepared;
  exit_code = prepare_all(*manifest, threads, prepared);
  if (exit_code != kExitOk) {
    fmt::print(stderr, "rungs: nothing written\n");
    return exit_code;
  }
  std::vector<Task> tasks;
  for (std::size_t i = 0; i < manifest->jobs.size(); ++i)
    for (JobOutput& output : job_outputs(manifest->jobs[i], *prepared[i].netlist))
      tasks.push_back({i, std::move(output), {}, {}});
  if (!options.check && !options.force && refuse_foreign_outputs(tasks)) {
    fmt::print(stderr, "rungs: nothing written\n");
    return kExitBadInput;
  }

  for_each_parallel(tasks.size(), threads, [&](std::size_t i) {
    Task& task = tasks[i];
    try {
      if (options.check)
        task.compared = compare_with_file(task.output.path, task.output.write, build::kHeadBytes);
      else
        task.written = write_output(task.output);
    } catch (const std::exception& e) {
      task.written.error = fmt::format("internal error: {}", e.what());
    }
  });
  const std::size_t count = print_outcomes(tasks, prepared, options, exit_code);
  if (exit_code != kExitOk) return exit_code;

  if (options.check) {
    if (count > 0) {
      if (!options.quiet)
        fmt::print(stderr, "rungs: {} of {} output{} stale or missing; run rungs build\n", count,
                   tasks.size(), tasks.size() == 1 ? " is" : "s are");
      return kExitCheckFailed;
    }
    if (!options.quiet)
      fmt::print(stderr, "rungs: all {} output{} up to date\n", tasks.size(),
                 tasks.size() == 1 ? " is" : "s are");
    return kExitOk;
  }
  if (!options.depfile.empty()) {
    std::string error;
    const std::string text = build_depfile(*manifest, tasks, prepared, error);
    if (error.empty())
      error = write_if_changed(
                  options.depfile, [&](std::ostream& out) { out << text; }, false, true)
                  .error;
    if (!error.empty()) {
      fmt::print(stderr, "rungs: {}\n", error);
      return kExitInternal;
    }
  }
  if (!options.quiet)
    fmt::print(stderr, "rungs: {} output{}: {} written, {} unchanged\n", tasks.size(),
               tasks.size() == 1 ? "" : "s", count, tasks.size() - count);
  return kExitOk;
}

}  // namespace rungs::cli
