// Writing output files atomically, never over a file rungs did not write, and comparing them.
#pragma once
#include <functional>
#include <ostream>
#include <string>
#include <vector>

namespace rungs::cli {

/// Produces a file's content into a stream.
using ContentWriter = std::function<void(std::ostream&)>;

/// What a file rungs writes holds; each kind is recognised by its first lines
/// (written_by_rungs), so that rungs replaces its own files and no one else's.
enum class OutputKind { netlist, report, report_json, depfile, chart };

/// A file a command is about to write, and the option or setting that named it (for messages).
struct NamedOutput {
  std::string path;
  std::string named_by;  // "-o", "--report", "the manifest's report", ...
};

/// Refuses (BadInput) a command whose outputs name one of its `inputs` (the description, the
/// manifest), or name the same file twice (by path, through links, or "-" for standard output
/// twice). Nothing has been written when it throws.
void refuse_clashing_outputs(const std::vector<NamedOutput>& inputs,
                             const std::vector<NamedOutput>& outputs);

/// Writes `path` by calling `write` on a temporary file beside it (`.NAME.rungs-PID.tmp`),
/// flushing it to disk and renaming it over `path`, so a reader, or a build killed at any
/// moment, sees the old file or the new one, never half of one. "-" writes to standard
/// output. A foreign file (is_foreign_file) is left alone unless `force`: throws
/// RefusedOverwrite. The replaced file's permissions are kept. Throws FileError when the file
/// cannot be written.
void write_atomically(const std::string& path, const ContentWriter& write, OutputKind kind,
                      bool force);

/// Throws what write_atomically would throw before writing a byte: RefusedOverwrite for a
/// foreign file (unless `force`), FileError for a path that is not a plain file. A command
/// that writes several files calls it for each before it writes the first.
void refuse_before_writing(const std::string& path, OutputKind kind, bool force);

/// As write_atomically, but when the file already holds exactly the bytes `write` produces,
/// it is left alone, timestamp included, and the temporary file is removed. The content is
/// compared while it is produced, so a large file is never held in memory. Returns whether the
/// file was replaced (or created).
bool write_if_changed(const std::string& path, const ContentWriter& write, OutputKind kind,
                      bool force);

/// Flushes standard output; throws FileError when what was written to it could not be.
void finish_standard_output();

/// How a file on disk stands against the content `write` produces.
struct Comparison {
  bool exists = false;
  bool same = false;
  std::string existing_head;  // the first bytes of each (up to `head_bytes`)
  std::string expected_head;
};

/// Compares `path` with what `write` produces, writing nothing and keeping little in memory.
Comparison compare_with_file(const std::string& path, const ContentWriter& write,
                             std::size_t head_bytes);

/// The first line of `path`, without its line break; empty when it cannot be read.
std::string read_first_line(const std::string& path);

/// True when the first lines of `path` are the way rungs begins a file of `kind`: a deck's
/// marker comment; a report's "design NAME (SOURCE): ..." line; a JSON report's "{" then its
/// "version" key; a depfile's make rules and nothing else; a chart's <svg> and white <rect>.
bool written_by_rungs(const std::string& path, OutputKind kind);

/// True when `path` exists, is not empty, and was not written_by_rungs as `kind`: a file that
/// rungs must not overwrite without --force. (An empty file holds nothing to keep.)
bool is_foreign_file(const std::string& path, OutputKind kind);

}  // namespace rungs::cli
