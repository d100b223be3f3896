// Atomic file replacement through a temporary file and rename, and byte comparison.
#include "9_cli/output_file.h"

#include <algorithm>
#include <cerrno>
#include <csignal>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <functional>
#include <iostream>
#include <streambuf>
#include <vector>

#include <fcntl.h>
#include <fmt/format.h>
#include <unistd.h>

#include "6_emit/netlist.h"
#include "9_cli/errors.h"

namespace rungs::cli {

namespace fs = std::filesystem;

namespace {

/// A stream buffer that compares what is written with an existing file as it goes and
/// keeps the first bytes written. With an `open_sink`, it also writes the content to the
/// stream buffer that `open_sink` opens, but only from the first byte that differs (copying
/// the equal part from the existing file then), so a file that stays the same costs no
/// write at all. It gathers small writes in its own buffer and takes large ones as they
/// come.
class ComparingBuffer : public std::streambuf {
 public:
  using SinkOpener = std::function<std::streambuf*()>;

  ComparingBuffer(std::istream* existing, SinkOpener open_sink, std::size_t head_bytes)
      : existing_(existing),
        open_sink_(std::move(open_sink)),
        head_bytes_(head_bytes),
        same_(existing != nullptr),
        pending_(1 << 16) {
    setp(pending_.data(), pending_.data() + pending_.size());
    if (!same_) start_sink();
  }

  /// True when every byte written matched and the existing file has no more. Call once,
  /// after the last write; when it is false, the sink holds the whole content.
  bool finish() {
    drain();
    if (same_ && existing_->peek() != std::char_traits<char>::eof()) {
      same_ = false;  // the new content is a prefix of the old
      start_sink();
    }
    return same_;
  }
  bool sink_failed() const { return sink_failed_; }
  const std::string& head() const { return head_; }

 protected:
  int_type overflow(int_type c) override {
    drain();
    if (!traits_type::eq_int_type(c, traits_type::eof())) {
      *pptr() = traits_type::to_char_type(c);
      pbump(1);
    }
    return traits_type::not_eof(c);
  }
  int sync() override {
    drain();
    return 0;
  }
  /// A large write (a deck comes in pieces of up to a megabyte) is taken as it is, after
  /// what was gathered before it, instead of being copied through the buffer.
  std::streamsize xsputn(const char* data, std::streamsize n) override {
    if (static_cast<std::size_t>(n) < pending_.size()) return std::streambuf::xsputn(data, n);
    drain();
    take(data, static_cast<std::size_t>(n));
    return n;
  }

 private:
  /// Opens the sink and copies into it the `matched_` bytes that were equal.
  void start_sink() {
    if (!open_sink_ || sink_) return;
    sink_ = open_sink_();
    if (!sink_) {
      sink_failed_ = true;
      return;
    }
    if (matched_ == 0) return;
    existing_->clear();
    existing_->seekg(0);
    std::vector<char> chunk(1 << 16);
    for (std::size_t left = matched_; left > 0 && !sink_failed_;) {
      const std::size_t n = std::min(left, chunk.size());
      existing_->read(chunk.data(), static_cast<std::streamsize>(n));
      if (existing_->gcount() != static_cast<std::streamsize>(n)) sink_failed_ = true;
      put(chunk.data(), n);
      left -= n;
    }
  }

  void put(const char* data, std::size_t n) {
    if (sink_ &&
        sink_->sputn(data, static_cast<std::streamsize>(n)) != static_cast<std::streamsize>(n))
      sink_failed_ = true;
  }

  /// Passes on what was gathered and empties the buffer.
  void drain() {
    take(pbase(), static_cast<std::size_t>(pptr() - pbase()));
    setp(pending_.data(), pending_.data() + pending_.size());
  }

  /// Compares `n` bytes of content with the existing file and writes them to the sink once
  /// they differ (or there is no file).
  void take(const char* data, std::size_t n) {
    if (n == 0) return;
    if (head_.size() < head_bytes_) head_.append(data, std::min(n, head_bytes_ - head_.size()));
    if (same_) {
      compare_.resize(n);
      existing_->read(compare_.data(), static_cast<std::streamsize>(n));
      same_ = existing_->gcount() == static_cast<std::streamsize>(n) &&
              std::memcmp(compare_.data(), data, n) == 0;
      if (same_)
        matched_ += n;
      else
        start_sink();
    }
    if (!same_) put(data, n);
  }

  std::istream* existing_;
  SinkOpener open_sink_;
  std::size_t head_bytes_;
  bool same_;
  std::streambuf* sink_ = nullptr;
  bool sink_failed_ = false;
  std::size_t matched_ = 0;  // bytes equal so far, not yet in the sink
  std::string head_;
  std::vector<char> pending_;
  std::vector<char> compare_;
};

std::string temporary_name(const fs::path& target) {
  return fmt::format(".{}.rungs-{}.tmp", target.filename().string(), ::getpid());
}

/// Removes temporary files that an earlier, killed rungs left beside `target`: those named
/// for it whose process no longer runs. Another running build's file is left alone.
void remove_leftover_temporaries(const fs::path& target) {
  const std::string prefix = fmt::format(".{}.rungs-", target.filename().string());
  std::error_code ec;
  const fs::path folder = target.parent_path().empty() ? fs::path(".") : target.parent_path();
  for (const auto& entry : fs::directory_iterator(folder, ec)) {
    const std::string name = entry.path().filename().string();
    if (name.size() <= prefix.size() + 4 || name.compare(0, prefix.size(), prefix) != 0 ||
        name.compare(name.size() - 4, 4, ".tmp") != 0)
      continue;
    const std::string digits = name.substr(prefix.size(), name.size() - prefix.size() - 4);
    if (digits.empty() || !std::all_of(digits.begin(), digits.end(), ::isdigit)) continue;
    const long pid = std::strtol(digits.c_str(), nullptr, 10);
    if (pid == ::getpid()) continue;
    if (::kill(static_cast<pid_t>(pid), 0) == -1 && errno == ESRCH) fs::remove(entry.path(), ec);
  }
}

/// Flushes a written file's data to the disk, so that a crash after the rename cannot
/// leave the new name on an empty file.
bool sync_file(const fs::path& path) {
  const int fd = ::open(path.c_str(), O_RDONLY);
  if (fd < 0) return false;
  const bool ok = ::fsync(fd) == 0;
  ::close(fd);
  return ok;
}

void refuse_foreign(const std::string& path, OutputKind kind, bool force) {
  if (!force && is_foreign_file(path, kind)) throw RefusedOverwrite(path);
}

/// The first `count` lines of `path` (fewer when it has fewer), without line breaks, reading
/// at most `limit` bytes.
std::vector<std::string> first_lines(const std::string& path, std::size_t count,
                                     std::size_t limit) {
  std::ifstream in(path, std::ios::binary);
  std::vector<std::string> lines;
  std::string text(limit, '\0');
  in.read(text.data(), static_cast<std::streamsize>(limit));
  text.resize(static_cast<std::size_t>(in.gcount()));
  std::size_t start = 0;
  while (lines.size() < count && start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string::npos) end = text.size();
    std::string line = text.substr(start, end - start);
    if (!line.empty() && line.back() == '\r') line.pop_back();
    lines.push_back(std::move(line));
    start = end + 1;
  }
  return lines;
}

/// A depfile as project::make_depfile writes it: rule lines ("TARGETS: \\", "PATH:"),
/// indented prerequisites, blank lines; a makefile's recipes (a tab) or assignments are not.
bool is_depfile_text(const std::vector<std::string>& lines) {
  for (const std::string& line : lines) {
    if (line.empty()) continue;
    if (line.front() == '\t') return false;
    if (line.starts_with("  ")) continue;
    if (!line.ends_with(":") && !line.ends_with(" \\")) return false;
  }
  return !lines.empty();
}

/// The file a path names after following links, as a key to compare outputs by; "-" stays.
std::string identity_of(const std::string& path) {
  if (path == "-") return path;
  std::error_code ec;
  fs::path resolved = fs::weakly_canonical(fs::absolute(path, ec), ec);
  if (ec) resolved = fs::absolute(path, ec).lexically_normal();
  return resolved.string();
}

/// Writes `path` through a temporary file beside it; with `keep_if_same`, an existing file
/// that already holds the bytes is left as it is, and no temporary file is made. Returns
/// whether the file was replaced; throws FileError.
bool write_through_temporary(const std::string& path, const ContentWriter& write,
                             bool keep_if_same) {
  std::error_code ec;
  // Write through a link to the file it names, so the link stays; refuse anything that is
  // not a plain file (a device, a folder), which the rename would replace.
  fs::path target(path);
  if (fs::is_symlink(target, ec)) target = fs::weakly_canonical(target, ec);
  if (fs::exists(target, ec) && !fs::is_regular_file(target, ec))
    throw FileError(
        fmt::format("'{}' is not a plain file; name a file to write, or - for "
                    "standard output",
                    path));
  const fs::path temporary = target.parent_path() / temporary_name(target);
  std::filebuf file;
  int open_errno = 0;
  auto open_temporary = [&]() -> std::streambuf* {
    if (file.open(temporary, std::ios::out | std::ios::binary | std::ios::trunc)) return &file;
    open_errno = errno;
    return nullptr;
  };
  std::ifstream existing;
  if (keep_if_same) existing.open(target, std::ios::binary);
  ComparingBuffer buffer(existing.is_open() ? &existing : nullptr, open_temporary, 0);
  std::ostream out(&buffer);
  write(out);
  const bool same = buffer.finish();
  if (same) return false;
  if (open_errno != 0)
    throw FileError(fmt::format("cannot write '{}': {}", path, std::strerror(open_errno)));
  const bool closed = file.close() != nullptr;
  const int saved_errno = errno;
  if (buffer.sink_failed() || !closed || !out) {
    fs::remove(temporary, ec);
    throw FileError(fmt::format("cannot write '{}': {}", path, std::strerror(saved_errno)));
  }
  if (!sync_file(temporary)) {
    const std::string reason = std::strerror(errno);
    fs::remove(temporary, ec);
    throw FileError(fmt::format("cannot write '{}': {}", path, reason));
  }
  // The new file keeps the permissions of the one it replaces (an executable script, a
  // file kept private).
  if (const fs::file_status old = fs::status(target, ec); !ec && fs::exists(old))
    fs::permissions(temporary, old.permissions(), ec);
  fs::rename(temporary, target, ec);
  if (ec) {
    const std::string reason = ec.message();
    fs::remove(temporary, ec);
    throw FileError(fmt::format("cannot replace '{}': {}", path, reason));
  }
  remove_leftover_temporaries(target);
  return true;
}

}  // namespace

std::string read_first_line(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::string line;
  std::getline(in, line);
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return line;
}

bool written_by_rungs(const std::string& path, OutputKind kind) {
  switch (kind) {
    case OutputKind::netlist:
      return emit::is_deck_marker(read_first_line(path));
    case OutputKind::report: {
      // report::plan_text's first line: "design NAME (SOURCE): N lines, tolerance ..."
      const std::string line = read_first_line(path);
      return line.starts_with("design ") && line.find("): ") != std::string::npos &&
             line.find(", tolerance ") != std::string::npos;
    }
    case OutputKind::report_json: {
      const std::vector<std::string> lines = first_lines(path, 2, 4096);
      return lines.size() == 2 && lines[0] == "{" && lines[1].starts_with("  \"version\": ");
    }
    case OutputKind::depfile:
      return is_depfile_text(first_lines(path, 100000, 1 << 20));
    case OutputKind::chart: {
      // report::svg_plot's first two lines.
      const std::vector<std::string> lines = first_lines(path, 2, 4096);
      return lines.size() == 2 &&
             lines[0].starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\"") &&
             lines[1] == "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>";
    }
  }
  return false;
}

void refuse_before_writing(const std::string& path, OutputKind kind, bool force) {
  if (path == "-") return;
  refuse_foreign(path, kind, force);
  std::error_code ec;
  const fs::file_status status = fs::status(path, ec);  // through a link
  if (fs::exists(status) && !fs::is_regular_file(status))
    throw FileError(fmt::format(
        "'{}' is not a plain file; name a file to write, or - for standard output", path));
}

bool is_foreign_file(const std::string& path, OutputKind kind) {
  std::error_code ec;
  if (!fs::exists(path, ec) || !fs::is_regular_file(path, ec) || fs::is_empty(path, ec))
    return false;
  return !written_by_rungs(path, kind);
}

void refuse_clashing_outputs(const std::vector<NamedOutput>& inputs,
                             const std::vector<NamedOutput>& outputs) {
  std::vector<std::pair<std::string, const NamedOutput*>> seen;
  for (const NamedOutput& input : inputs)
    if (input.path != "-") seen.emplace_back(identity_of(input.path), &input);
  const std::size_t input_count = seen.size();
  for (const NamedOutput& output : outputs) {
    const std::string key = identity_of(output.path);
    for (std::size_t i = 0; i < seen.size(); ++i) {
      if (seen[i].first != key) continue;
      const NamedOutput& other = *seen[i].second;
      if (i < input_count)
        throw BadInput(
            fmt::format("{} names '{}', which is {}: rungs never writes over what it "
                        "reads; name another file",
                        output.named_by, output.path, other.named_by));
      if (key == "-")
        throw BadInput(
            fmt::format("{} and {} both name standard output ('-'), which would mix "
                        "the two; send one of them to a file",
                        other.named_by, output.named_by));
      throw BadInput(fmt::format("{} and {} both name '{}'; give each output its own file",
                                 other.named_by, output.named_by, output.path));
    }
    seen.emplace_back(key, &output);
  }
}

void write_atomically(const std::string& path, const ContentWriter& write, OutputKind kind,
                      bool force) {
  if (path == "-") {
    write(std::cout);
    finish_standard_output();
    return;
  }
  refuse_foreign(path, kind, force);
  write_through_temporary(path, write, /*keep_if_same=*/false);
}

void finish_standard_output() {
  std::cout.flush();
  if (!std::cout) throw FileError("cannot write to standard output");
}

bool write_if_changed(const std::string& path, const ContentWriter& write, OutputKind kind,
                      bool force) {
  refuse_foreign(path, kind, force);
  return write_through_temporary(path, write, /*keep_if_same=*/true);
}

Comparison compare_with_file(const std::string& path, const ContentWriter& write,
                             std::size_t head_bytes) {
  Comparison result;
  std::ifstream existing(path, std::ios::binary);
  result.exists = existing.is_open();
  if (result.exists) {
    result.existing_head.resize(head_bytes);
    existing.read(result.existing_head.data(), static_cast<std::streamsize>(head_bytes));
    result.existing_head.resize(static_cast<std::size_t>(existing.gcount()));
    existing.clear();
    existing.seekg(0);
  }
  ComparingBuffer buffer(result.exists ? &existing : nullptr, {}, head_bytes);
  std::ostream out(&buffer);
  write(out);
  result.same = buffer.finish();
  result.expected_head = buffer.head();
  return result;
}

}  // namespace rungs::cli
