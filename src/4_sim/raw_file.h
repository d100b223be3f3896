// Reading a simulator's results: the SPICE3 raw file (ASCII or binary) that ngspice writes with -r.
#pragma once
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace rungs::sim {

/// One plot of a raw file: one analysis, its vectors over the same points.
struct RawPlot {
  std::string title;                        // the deck's first line, as the simulator echoes it
  std::string name;                         // "Transient Analysis", ...
  std::vector<std::string> variables;       // as written: "time", "v(rx1)"
  std::vector<std::vector<double>> values;  // [variable][point]
  bool binary = false;                      // its values were binary ("Binary:"), else ASCII

  std::size_t points() const { return values.empty() ? 0 : values.front().size(); }
  /// The values of `variable`, its name compared with ASCII case folded (simulators fold
  /// names); a bare node name ("rx1") also finds its voltage "v(rx1)". Null when absent.
  const std::vector<double>* find(std::string_view variable) const;
};

/// A raw file that cannot be read: the message says what was expected and where (a line
/// number in the header, a byte offset in binary data).
class RawFileError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Every plot of a SPICE3 raw file, in file order, from its bytes: the header keys Title,
/// Plotname, Flags, No. Variables, No. Points and Variables (others are skipped), then either
/// "Values:" (ASCII: per point its index and one number a variable) or "Binary:" (doubles, a
/// point's variables together, in this machine's byte order, as a simulator on it writes them).
/// Real data only: a plot whose Flags say complex throws, as does a file with no plot, a
/// header that does not fill, or data that ends before its points do. Parses only; reads no
/// file.
std::vector<RawPlot> read_raw_file(std::string_view bytes);

/// The samples (t, v) (t ascending, repeats allowed) interpolated linearly at each of `at`;
/// held at the first and last value outside t. Needs equal, non-empty t and v.
std::vector<double> interpolate_linear(std::span<const double> t, std::span<const double> v,
                                       std::span<const double> at);

}  // namespace rungs::sim
