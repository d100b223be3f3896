// `rungs build`: every netlist of a manifest, in parallel, rewriting only what changed.
#include <algorithm>
#include <filesystem>
#include <iostream>

#include <fmt/format.h>

#include "5_plan/thread_pool.h"
#include "7_report/plan_report.h"
#include "8_project/depfile.h"
#include "8_project/manifest.h"
#include "8_project/staleness.h"
#include "9_cli/errors.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/progress.h"
#include "9_cli/subcommands.h"

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
    if (fs::is_regular_file(folder / project::kManifestName, ec))
      return up + std::string(project::kManifestName);
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

/// The manifest read and checked, with its jobs.
struct LoadedManifest {
  std::string path;
  std::vector<NetlistJob> jobs;
};

/// The manifest to read: --manifest (a folder means its rungs.toml), else the nearest
/// rungs.toml. Throws BadInput when there is none.
std::string manifest_path(const BuildOptions& options) {
  std::error_code ec;
  if (options.manifest.empty()) {
    std::string path = find_manifest();
    if (path.empty())
      throw BadInput(
          fmt::format("no {} in this folder or any folder above it; give one with --manifest FILE",
                      project::kManifestName));
    return path;
  }
  if (fs::is_directory(options.manifest, ec))
    return (fs::path(options.manifest) / project::kManifestName).string();
  return options.manifest;
}

/// The job of one [[netlist]]; paths that lead nowhere are errors in `diagnostics`, pointed
/// at in the manifest, since they are its mistake.
NetlistJob job_of(const project::Manifest& manifest, const project::NetlistEntry& entry,
                  const fs::path& folder, const BuildOptions& options,
                  syntax::Diagnostics& diagnostics) {
  NetlistJob job;
  job.source = from_manifest(folder, entry.source);
  job.header_name = fs::path(entry.source).lexically_normal().generic_string();
  job.output = from_manifest(folder, entry.output);
  if (!entry.report.empty()) job.report = from_manifest(folder, entry.report);
  if (!entry.report_json.empty()) job.report_json = from_manifest(folder, entry.report_json);
  // A manifest writes inside its own project: an output outside it (absolute, or climbing
  // out with "..") could be any file of the machine.
  const std::pair<const std::string*, const syntax::Span*> written[] = {
      {&entry.output, &entry.output_span},
      {&entry.report, &entry.report_span},
      {&entry.report_json, &entry.report_json_span}};
  for (const auto& [path, span] : written) {
    if (path->empty()) continue;
    const fs::path relative = fs::path(*path).lexically_normal();
    if (relative.is_absolute() || relative.has_root_name() ||
        (!relative.empty() && *relative.begin() == ".."))
      diagnostics.error(*span, fmt::format("'{}' is outside the manifest's folder; a build writes "
                                           "only inside its project: write a path relative to "
                                           "the manifest, without '..'",
                                           *path));
  }
  job.output_named_by = fmt::format("the manifest's output for {}", entry.source);
  job.report_named_by = fmt::format("the manifest's report for {}", entry.source);
  job.report_json_named_by = fmt::format("the manifest's report_json for {}", entry.source);
  const std::string templates = project::templates_of(manifest, entry);
  if (!templates.empty()) job.templates = from_manifest(folder, templates);
  job.library = entry.library;
  job.with_ideal = entry.with_ideal;
  job.defaults = manifest.defaults.settings;
  job.analytic = options.analytic;
  std::error_code ec;
  if (!fs::is_regular_file(job.source, ec))
    diagnostics.error(entry.source_span,
                      fmt::format("no description at '{}' (paths are relative to the "
                                  "manifest's folder)",
                                  job.source));
  if (!job.templates.empty() && !fs::is_directory(job.templates, ec))
    diagnostics.error(
        entry.templates.empty() ? manifest.defaults.templates_span : entry.templates_span,
        fmt::format("no template folder at '{}' (paths are relative to the manifest's folder)",
                    job.templates));
  return job;
}

/// The manifest read and checked, its diagnostics printed. Throws BadInput, FileError, or
/// FileHasErrors when the manifest has errors.
LoadedManifest load_manifest(const BuildOptions& options) {
  const std::string path = manifest_path(options);
  const syntax::InputFile file = read_source(path);
  syntax::Diagnostics diagnostics(file);
  const project::Manifest manifest = project::parse_manifest(diagnostics);
  LoadedManifest loaded{path, {}};
  if (!diagnostics.has_errors()) {
    for (const project::NetlistEntry& entry : manifest.netlists)
      loaded.jobs.push_back(
          job_of(manifest, entry, fs::path(path).parent_path(), options, diagnostics));
  }
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) throw FileHasErrors(file.name, diagnostics.error_count());
  return loaded;
}

/// One file to write or check, and what became of it.
struct Task {
  std::size_t job = 0;
  JobOutput output;
  bool changed = false;  // written: its bytes changed
  Comparison compared;   // with --check
  std::optional<Error> error;
};

std::string stale_reason(const Task& task) {
  if (!task.compared.exists) return "missing";
  if (task.output.kind == OutputKind::netlist)
    return project::netlist_stale_reason(task.compared.existing_head, task.compared.expected_head);
  return "differs from what rungs writes now";
}

/// Writes one output if its bytes change, making its folder first: a fresh checkout has no
/// empty folders, since git keeps none. Returns whether it was written; throws FileError.
bool write_output(const JobOutput& output) {
  const fs::path folder = fs::path(output.path).parent_path();
  std::error_code ec;
  if (!folder.empty() && !fs::is_directory(folder, ec)) {
    fs::create_directories(folder, ec);
    if (ec)
      throw FileError(
          fmt::format("cannot make the folder '{}': {}", folder.string(), ec.message()));
  }
  return write_if_changed(output.path, output.write, output.kind, /*force=*/true);
}

/// Writes the depfile of a build, if it changes: every output, made from the manifest, the
/// descriptions and the templates. Throws FileError.
void write_build_depfile(const std::string& depfile, const LoadedManifest& manifest,
                         const std::vector<Task>& tasks, const std::vector<Preparation>& prepared) {
  std::vector<std::string> targets, prerequisites;
  for (const Task& task : tasks) targets.push_back(task.output.path);
  std::error_code ec;
  prerequisites.push_back(fs::absolute(manifest.path, ec).lexically_normal().string());
  for (std::size_t i = 0; i < manifest.jobs.size(); ++i)
    for (std::string& path : job_prerequisites(manifest.jobs[i], *prepared[i].netlist))
      prerequisites.push_back(std::move(path));
  if (std::string problem = project::depfile_problem(targets, prerequisites); !problem.empty())
    throw FileError(problem);
  const std::string text = project::make_depfile(targets, prerequisites);
  write_if_changed(
      depfile, [&](std::ostream& out) { out << text; }, OutputKind::depfile, /*force=*/true);
}

/// Reads and plans every description, `jobs` at once on `pool`; prints their messages and
/// errors in manifest order. Returns the worst exit code.
int prepare_all(const LoadedManifest& manifest, plan::ThreadPool& pool, unsigned jobs,
                std::vector<Preparation>& prepared) {
  prepared.resize(manifest.jobs.size());
  {
    // The one progress line of the build, from this thread: the tasks print nothing.
    const bool quick = std::all_of(manifest.jobs.begin(), manifest.jobs.end(),
                                   [](const NetlistJob& job) { return job.analytic; });
    const ProgressNote note(quick ? ""
                                  : fmt::format("verifying the ladders of {} description{}",
                                                prepared.size(), prepared.size() == 1 ? "" : "s"));
    pool.for_each(
        prepared.size(),
        [&](std::size_t i) {
          try {
            prepared[i] = prepare_netlist(manifest.jobs[i], pool);
          } catch (const std::exception& e) {
            prepared[i].error = InternalError(e);
          }
        },
        jobs);
  }
  int exit_code = kExitOk;
  for (const Preparation& p : prepared) {
    std::cerr << p.messages;
    if (p.error) exit_code = std::max(exit_code, report(*p.error));
  }
  return exit_code;
}

/// Every output of every job, netlists first within a job.
std::vector<Task> tasks_of(const LoadedManifest& manifest,
                           const std::vector<Preparation>& prepared) {
  std::vector<Task> tasks;
  for (std::size_t i = 0; i < manifest.jobs.size(); ++i)
    for (JobOutput& output : job_outputs(manifest.jobs[i], *prepared[i].netlist))
      tasks.push_back({i, std::move(output), false, {}, std::nullopt});
  return tasks;
}

/// Reports each netlist to be written that would replace a foreign file; returns the exit
/// code of that (kExitOk when there is none).
int refuse_foreign_outputs(const std::vector<Task>& tasks, const BuildOptions& options) {
  int exit_code = kExitOk;
  for (const Task& task : tasks)
    if (is_foreign_file(task.output.path, task.output.kind))
      exit_code = std::max(exit_code, report(RefusedOverwrite(task.output.path)));
  if (!options.depfile.empty() && is_foreign_file(options.depfile, OutputKind::depfile))
    exit_code = std::max(exit_code, report(RefusedOverwrite(options.depfile)));
  return exit_code;
}

/// Writes, or with --check compares, every output, `jobs` at once on `pool`; what became of
/// each is in its task.
void run_tasks(std::vector<Task>& tasks, const BuildOptions& options, plan::ThreadPool& pool,
               unsigned jobs) {
  pool.for_each(
      tasks.size(),
      [&](std::size_t i) {
        Task& task = tasks[i];
        try {
          if (options.check)
            task.compared =
                compare_with_file(task.output.path, task.output.write, project::kHeadBytes);
          else
            task.changed = write_output(task.output);
        } catch (const Error& e) {
          task.error = e;
        } catch (const std::exception& e) {
          task.error = InternalError(e);
        }
      },
      jobs);
}

/// Prints what became of each task, in manifest order; returns how many were stale (with
/// --check) or written, and raises `exit_code` to that of each error.
std::size_t print_outcomes(const std::vector<Task>& tasks, const std::vector<Preparation>& prepared,
                           const BuildOptions& options, int& exit_code) {
  std::size_t count = 0;
  for (const Task& task : tasks) {
    if (task.error) {
      exit_code = std::max(exit_code, report(*task.error));
    } else if (options.check && !task.compared.same) {
      fmt::print("{}: {}\n", task.output.path, stale_reason(task));
      ++count;
    } else if (!options.check && task.changed) {
      const PreparedNetlist& netlist = *prepared[task.job].netlist;
      if (!options.quiet && task.output.kind == OutputKind::netlist)
        print_note(fmt::format(
            "wrote {}: {}", task.output.path,
            report::plan_summary(netlist.circuit, netlist.plan, verification_of(netlist))));
      else if (!options.quiet)
        print_note(fmt::format("wrote {}", task.output.path));
      ++count;
    }
  }
  std::fflush(stdout);
  return count;
}

/// The end of `rungs build --check` with `stale` of `total` outputs stale or missing.
int check_outcome(std::size_t stale, std::size_t total, bool quiet) {
  const char* outputs_are = total == 1 ? " is" : "s are";
  if (stale > 0) {
    const CheckFailed failed(fmt::format("{} of {} output{} stale or missing; run rungs build",
                                         stale, total, outputs_are));
    return quiet ? failed.exit_code() : report(failed);
  }
  if (!quiet) print_note(fmt::format("all {} output{} up to date", total, outputs_are));
  return kExitOk;
}

/// What a build reads that it must never write: the manifest and every description.
std::vector<NamedOutput> build_inputs(const LoadedManifest& manifest) {
  std::vector<NamedOutput> inputs = {{manifest.path, "the manifest"}};
  for (const NetlistJob& job : manifest.jobs)
    inputs.push_back({job.source, fmt::format("the description {}", job.header_name)});
  return inputs;
}

/// Every file a build writes, and what named it.
std::vector<NamedOutput> build_outputs(const LoadedManifest& manifest,
                                       const BuildOptions& options) {
  std::vector<NamedOutput> outputs;
  for (const NetlistJob& job : manifest.jobs) {
    outputs.push_back({job.output, job.output_named_by});
    if (!job.report.empty()) outputs.push_back({job.report, job.report_named_by});
    if (!job.report_json.empty()) outputs.push_back({job.report_json, job.report_json_named_by});
  }
  if (!options.depfile.empty()) outputs.push_back({options.depfile, "--depfile"});
  return outputs;
}

/// Writes, or with --check compares, every output, and tells what became of each; returns
/// the exit code.
int write_or_check(const LoadedManifest& manifest, std::vector<Task>& tasks,
                   const std::vector<Preparation>& prepared, const BuildOptions& options,
                   plan::ThreadPool& pool, unsigned jobs) {
  run_tasks(tasks, options, pool, jobs);
  int exit_code = kExitOk;
  const std::size_t count = print_outcomes(tasks, prepared, options, exit_code);
  if (exit_code != kExitOk) return exit_code;
  if (options.check) return check_outcome(count, tasks.size(), options.quiet);
  if (!options.depfile.empty()) write_build_depfile(options.depfile, manifest, tasks, prepared);
  if (!options.quiet)
    print_note(fmt::format("{} output{}: {} written, {} unchanged", tasks.size(),
                           tasks.size() == 1 ? "" : "s", count, tasks.size() - count));
  return kExitOk;
}

}  // namespace

int build_command(const BuildOptions& options) {
  if (options.check && !options.depfile.empty())
    throw BadInput("--check writes nothing; leave out --depfile");
  const LoadedManifest manifest = load_manifest(options);
  const unsigned jobs = options.jobs == 0 ? plan::ThreadPool::core_count() : options.jobs;
  // One pool for the descriptions and the planner's measurements within each: -j N
  // descriptions at once, and never more threads at work than N or the cores, whichever is
  // more.
  plan::ThreadPool pool(std::max(jobs, plan::ThreadPool::core_count()));

  // Every description is read and planned, and every netlist's place checked, before
  // anything is written, so that one bad description leaves every output as it was.
  refuse_clashing_outputs(build_inputs(manifest), build_outputs(manifest, options));
  std::vector<Preparation> prepared;
  int exit_code = prepare_all(manifest, pool, jobs, prepared);
  std::vector<Task> tasks;
  if (exit_code == kExitOk) {
    tasks = tasks_of(manifest, prepared);
    if (!options.check && !options.force) exit_code = refuse_foreign_outputs(tasks, options);
  }
  if (exit_code != kExitOk) {
    print_note("nothing written");
    return exit_code;
  }
  return write_or_check(manifest, tasks, prepared, options, pool, jobs);
}

}  // namespace rungs::cli
