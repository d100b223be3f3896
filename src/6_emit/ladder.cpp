// Streaming the elements of a lumped ladder.
#include "6_emit/ladder.h"

#include <fmt/format.h>

#include "6_emit/spice_number.h"

namespace rungs::emit {

namespace {

/// Element values as text, formatted once per line since every section repeats them.
struct Values {
  std::string l, half_l, c, half_c, r, half_r, g_resistance, half_g_resistance, ic;
};

class LadderWriter {
 public:
  LadderWriter(std::ostream& out, const plan::LinePlan& line, std::optional<double> charged)
      : out_(out), has_r_(line.section_r > 0.0), has_g_(line.section_g > 0.0) {
    v_.l = spice_number(line.section_l);
    v_.half_l = spice_number(line.section_l / 2);
    v_.c = spice_number(line.section_c);
    v_.half_c = spice_number(line.section_c / 2);
    if (has_r_) {
      v_.r = spice_number(line.section_r);
      v_.half_r = spice_number(line.section_r / 2);
    }
    if (has_g_) {
      v_.g_resistance = spice_number(1.0 / line.section_g);
      v_.half_g_resistance = spice_number(2.0 / line.section_g);
    }
    if (charged) v_.ic = " IC=" + spice_number(*charged);
  }
  ~LadderWriter() { flush(); }

  /// Series element k from a to b, with its resistance beside it through m<k>.
  void series(int k, std::string_view a, std::string_view b, bool half) {
    if (has_r_) {
      fmt::format_to(std::back_inserter(buffer_), "R{} {} m{} {}\nL{} m{} {} {}\n", k, a, k,
                     half ? v_.half_r : v_.r, k, k, b, half ? v_.half_l : v_.l);
      count_ += 2;
    } else {
      fmt::format_to(std::back_inserter(buffer_), "L{} {} {} {}\n", k, a, b,
                     half ? v_.half_l : v_.l);
      ++count_;
    }
    maybe_flush();
  }

  /// Shunt element k from node to ref, with its conductance beside it.
  void shunt(int k, std::string_view node, bool half) {
    fmt::format_to(std::back_inserter(buffer_), "C{} {} ref {}{}\n", k, node,
                   half ? v_.half_c : v_.c, v_.ic);
    ++count_;
    if (has_g_) {
      fmt::format_to(std::back_inserter(buffer_), "RG{} {} ref {}\n", k, node,
                     half ? v_.half_g_resistance : v_.g_resistance);
      ++count_;
    }
    maybe_flush();
  }

  long long count() const { return count_; }

 private:
  void maybe_flush() {
    if (buffer_.size() > (1u << 16)) flush();
  }
  void flush() {
    out_.write(buffer_.data(), static_cast<std::streamsize>(buffer_.size()));
    buffer_.clear();
  }

  std::ostream& out_;
  bool has_r_;
  bool has_g_;
  Values v_;
  fmt::memory_buffer buffer_;
  long long count_ = 0;
};

std::string inner(int k) { return fmt::format("n{}", k); }

}  // namespace

long long write_ladder(std::ostream& out, const plan::LinePlan& line,
                       std::optional<double> charged) {
  LadderWriter w(out, line, charged);
  const int n = line.sections;
  // Shunt node k of a pi or L ladder: near at 0, far at n, n<k> between.
  auto node = [n](int k) { return k == 0 ? std::string("near") : k == n ? std::string("far") : inner(k); };
  switch (line.shape) {
    case model::Shape::pi:
      w.shunt(0, "near", true);
      for (int k = 1; k <= n; ++k) {
        w.series(k, node(k - 1), node(k), false);
        w.shunt(k, node(k), k == n);
      }
      break;
    case model::Shape::l:
      for (int k = 1; k <= n; ++k) {
        w.series(k, node(k - 1), node(k), false);
        w.shunt(k, node(k), false);
      }
      break;
    case model::Shape::t:
      // Shunt nodes n1..nN are all inner; halves of L at both ports.
      w.series(0, "near", inner(1), true);
      for (int k = 1; k <= n; ++k) {
        w.shunt(k, inner(k), false);
        w.series(k, inner(k), k == n ? std::string("far") : inner(k + 1), k == n);
      }
      break;
  }
  return w.count();
}

}  // namespace rungs::emit
