// Parsing SPICE3 raw files, ASCII and binary, and resampling their points.
#include "4_sim/raw_file.h"

#include <algorithm>
#include <charconv>
#include <cstring>
#include <stdexcept>

#include <fmt/format.h>

#include "1_syntax/text.h"

namespace rungs::sim {

namespace {

bool is_raw_space(char c) {
  return c == ' ' || c == '\t' || c == '\r' || c == '\n';
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_raw_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_raw_space(s.back())) s.remove_suffix(1);
  return s;
}

/// A cursor over the bytes that knows its line number, for messages.
class RawReader {
 public:
  explicit RawReader(std::string_view bytes) : bytes_(bytes) {}

  bool at_end() const { return pos_ >= bytes_.size(); }
  std::size_t offset() const { return pos_; }
  int line() const { return line_; }

  /// The next line without its line break.
  std::string_view next_line() {
    const std::size_t end = bytes_.find('\n', pos_);
    const std::size_t stop = end == std::string_view::npos ? bytes_.size() : end;
    std::string_view text = bytes_.substr(pos_, stop - pos_);
    pos_ = end == std::string_view::npos ? bytes_.size() : end + 1;
    ++line_;
    if (!text.empty() && text.back() == '\r') text.remove_suffix(1);
    return text;
  }

  /// Skips whitespace and blank lines.
  void skip_space() {
    while (pos_ < bytes_.size() && is_raw_space(bytes_[pos_])) {
      if (bytes_[pos_] == '\n') ++line_;
      ++pos_;
    }
  }

  /// The next whitespace-separated word (empty at the end).
  std::string_view next_word() {
    skip_space();
    const std::size_t start = pos_;
    while (pos_ < bytes_.size() && !is_raw_space(bytes_[pos_])) ++pos_;
    return bytes_.substr(start, pos_ - start);
  }

  std::string_view take(std::size_t n) {
    const std::string_view out = bytes_.substr(pos_, n);
    pos_ += out.size();
    return out;
  }
  std::size_t remaining() const { return bytes_.size() - pos_; }

 private:
  std::string_view bytes_;
  std::size_t pos_ = 0;
  int line_ = 0;  // lines read so far: the number of the last line read
};

std::size_t count_of(std::string_view value, std::string_view key, int line) {
  std::size_t n = 0;
  const std::string_view v = trim(value);
  const auto [end, ec] = std::from_chars(v.data(), v.data() + v.size(), n);
  if (ec != std::errc() || end != v.data() + v.size())
    throw RawFileError(
        fmt::format("raw file line {}: '{}' must be a whole number, not '{}'", line, key, v));
  return n;
}

double number_of(std::string_view word, std::size_t point, int line) {
  double x = 0.0;
  const auto [end, ec] = std::from_chars(word.data(), word.data() + word.size(), x);
  if (ec != std::errc() || end != word.data() + word.size())
    throw RawFileError(
        fmt::format("raw file line {}: point {} holds '{}' where a real number "
                    "belongs",
                    line, point, word));
  return x;
}

/// The values of a plot with `n` variables and `points` points, ASCII ("Values:").
void read_ascii(RawReader& in, RawPlot& plot, std::size_t points) {
  const std::size_t n = plot.variables.size();
  for (std::size_t p = 0; p < points; ++p) {
    const std::string_view index = in.next_word();
    std::size_t i = 0;
    const auto [end, ec] = std::from_chars(index.data(), index.data() + index.size(), i);
    if (index.empty())
      throw RawFileError(fmt::format("raw file ends at point {} of the {} it declares", p, points));
    if (ec != std::errc() || end != index.data() + index.size() || i != p)
      throw RawFileError(fmt::format("raw file line {}: expected the index of point {}, found '{}'",
                                     in.line() + 1, p, index));
    for (std::size_t v = 0; v < n; ++v) {
      const std::string_view word = in.next_word();
      if (word.empty())
        throw RawFileError(
            fmt::format("raw file ends at point {} of the {} it declares", p, points));
      plot.values[v][p] = number_of(word, p, in.line() + 1);
    }
  }
}

/// The values of a plot, binary ("Binary:"): doubles, a point's variables together.
void read_binary(RawReader& in, RawPlot& plot, std::size_t points) {
  const std::size_t n = plot.variables.size();
  const std::size_t need = n * points * sizeof(double);
  if (in.remaining() < need)
    throw RawFileError(
        fmt::format("raw file: binary data from byte {} holds {} bytes, but {} "
                    "points of {} variables need {}",
                    in.offset(), in.remaining(), points, n, need));
  const std::string_view data = in.take(need);
  for (std::size_t p = 0; p < points; ++p)
    for (std::size_t v = 0; v < n; ++v)
      std::memcpy(&plot.values[v][p], data.data() + (p * n + v) * sizeof(double), sizeof(double));
}

/// One plot, from its header to the end of its values.
RawPlot read_plot(RawReader& in) {
  RawPlot plot;
  std::size_t variables = 0, points = 0;
  bool have_variables = false, have_points = false;
  for (;;) {
    if (in.at_end())
      throw RawFileError(
          fmt::format("raw file ends in a header, at line {}, before its "
                      "'Values:' or 'Binary:'",
                      in.line()));
    const std::string_view line = in.next_line();
    const std::size_t colon = line.find(':');
    if (colon == std::string_view::npos) {
      if (trim(line).empty()) continue;
      throw RawFileError(
          fmt::format("raw file line {}: expected 'Key: value' in a header, found "
                      "'{}'",
                      in.line(), line.substr(0, 60)));
    }
    const std::string key = syntax::fold_case(trim(line.substr(0, colon)));
    const std::string_view value = trim(line.substr(colon + 1));
    if (key == "title") {
      plot.title = value;
    } else if (key == "plotname") {
      plot.name = value;
    } else if (key == "flags") {
      if (syntax::fold_case(value).find("complex") != std::string::npos)
        throw RawFileError(
            fmt::format("raw file line {}: plot '{}' holds complex data; only "
                        "real data (a transient analysis) is read",
                        in.line(), plot.name));
    } else if (key == "no. variables") {
      variables = count_of(value, "No. Variables", in.line());
      have_variables = true;
    } else if (key == "no. points") {
      points = count_of(value, "No. Points", in.line());
      have_points = true;
    } else if (key == "variables") {
      if (!have_variables || variables == 0)
        throw RawFileError(
            fmt::format("raw file line {}: 'Variables:' comes before a non-zero "
                        "'No. Variables:'",
                        in.line()));
      for (std::size_t i = 0; i < variables; ++i) {
        if (in.at_end())
          throw RawFileError(fmt::format("raw file ends in its list of {} variables", variables));
        const std::string_view entry = in.next_line();
        // "\tINDEX\tNAME\tTYPE": the name is the second word.
        RawReader words(entry);
        const std::string_view index = words.next_word();
        const std::string_view name = words.next_word();
        if (name.empty() || count_of(index, "a variable's index", in.line()) != i)
          throw RawFileError(
              fmt::format("raw file line {}: expected variable {} as 'INDEX NAME "
                          "TYPE', found '{}'",
                          in.line(), i, trim(entry)));
        plot.variables.emplace_back(name);
      }
    } else if (key == "values" || key == "binary") {
      if (!have_points || plot.variables.empty())
        throw RawFileError(
            fmt::format("raw file line {}: data begins before 'No. Points:' and "
                        "'Variables:'",
                        in.line()));
      plot.values.assign(plot.variables.size(), std::vector<double>(points));
      plot.binary = key == "binary";
      if (plot.binary)
        read_binary(in, plot, points);
      else
        read_ascii(in, plot, points);
      return plot;
    }
    // Date, Command, Option, Dimensions and any other key say nothing the values need.
  }
}

}  // namespace

const std::vector<double>* RawPlot::find(std::string_view variable) const {
  for (std::size_t i = 0; i < variables.size() && i < values.size(); ++i)
    if (syntax::equals_folded(variables[i], variable)) return &values[i];
  const std::string voltage = "v(" + std::string(variable) + ")";
  for (std::size_t i = 0; i < variables.size() && i < values.size(); ++i)
    if (syntax::equals_folded(variables[i], voltage)) return &values[i];
  return nullptr;
}

std::vector<RawPlot> read_raw_file(std::string_view bytes) {
  RawReader in(bytes);
  std::vector<RawPlot> plots;
  for (;;) {
    in.skip_space();
    if (in.at_end()) break;
    plots.push_back(read_plot(in));
  }
  if (plots.empty()) throw RawFileError("raw file is empty: it holds no plot");
  return plots;
}

std::vector<double> interpolate_linear(std::span<const double> t, std::span<const double> v,
                                       std::span<const double> at) {
  if (t.empty() || t.size() != v.size())
    throw std::invalid_argument("interpolation needs equal, non-empty samples");
  std::vector<double> out;
  out.reserve(at.size());
  std::size_t k = 1;  // t[k - 1] <= x < t[k] for the current x, when inside
  for (const double x : at) {
    if (x <= t.front()) {
      out.push_back(v.front());
      continue;
    }
    if (x >= t.back()) {
      out.push_back(v.back());
      continue;
    }
    // `at` usually ascends: walk on from the last place, else search again.
    if (k >= t.size() || t[k - 1] > x) k = 1;
    if (!(t[k] > x))
      k = static_cast<std::size_t>(
          std::upper_bound(t.begin() + static_cast<std::ptrdiff_t>(k), t.end(), x) - t.begin());
    const double t0 = t[k - 1], t1 = t[k];
    out.push_back(t1 == t0 ? v[k] : v[k - 1] + (v[k] - v[k - 1]) * (x - t0) / (t1 - t0));
  }
  return out;
}

}  // namespace rungs::sim
