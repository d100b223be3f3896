// Streaming the elements of a lumped ladder.
#include "6_emit/ladder.h"

#include "6_emit/spice_number.h"

namespace rungs::emit {

namespace {

/// Part of a name: a port's name, a letter or two, a section number.
using Name = ShortText<16>;
/// What follows an element's nodes: " <value>[ IC=<volts>]\n". A value is at most 24
/// characters (spice_number: sign, 17 digits, point, exponent), so 64 bytes hold it all.
using Tail = ShortText<64>;

Tail tail(double value, const std::string& ic) {
  Tail t(" ");
  t.add(spice_number(value)).add(ic).add("\n");
  return t;
}

/// Element tails, made once per line since every section repeats them.
struct Tails {
  Tail l, half_l, c, half_c, r, half_r, g, half_g;
};

/// An element's or a node's name in two parts: a word ("L", "near", "n") and a section
/// number (empty for a port).
struct Label {
  const Name* word;
  const Name* number;
};

/// The section numbers k-1, k and k+1 as text, starting at k = 1, with k+2 counted ahead.
/// Each slot is counted up in place, a byte at a time, sections before it is read whole:
/// reading bytes back whole right after writing them one at a time stalls the processor
/// until the writes are done (measured: about half the ladder's time when counted just
/// before use).
class SectionNumbers {
 public:
  SectionNumbers() : slots_{Name("0"), Name("1"), Name("2"), Name("3")} {}

  const Name& previous() const { return slots_[(at_ + 3) % 4]; }
  const Name& current() const { return slots_[at_]; }
  const Name& next() const { return slots_[(at_ + 1) % 4]; }

  /// Moves on to k + 1: the slot of k - 1 becomes that of k + 3.
  void advance() {
    slots_[(at_ + 3) % 4].count_up(4);
    at_ = (at_ + 1) % 4;
  }

 private:
  Name slots_[4];
  unsigned at_ = 1;
};

class LadderWriter {
 public:
  LadderWriter(DeckBuffer& out, const plan::LinePlan& line, std::optional<double> charged)
      : out_(out), has_r_(line.section_r > 0.0), has_g_(line.section_g > 0.0) {
    const std::string none;
    const std::string ic = charged ? " IC=" + spice_number(*charged) : "";
    t_.l = tail(line.section_l, none);
    t_.half_l = tail(line.section_l / 2, none);
    t_.c = tail(line.section_c, ic);
    t_.half_c = tail(line.section_c / 2, ic);
    if (has_r_) {
      t_.r = tail(line.section_r, none);
      t_.half_r = tail(line.section_r / 2, none);
    }
    if (has_g_) {
      t_.g = tail(1.0 / line.section_g, none);
      t_.half_g = tail(2.0 / line.section_g, none);
    }
  }

  /// Series element k from a to b, with its resistance beside it through m<k>.
  void series(const Name& number, Label a, Label b, bool half) {
    char* at = out_.reserve(2 * kElementRoom);
    if (has_r_) {
      const Label m{&kM, &number};
      at = element(at, {&kR, &number}, a, m, half ? t_.half_r : t_.r);
      at = element(at, {&kL, &number}, m, b, half ? t_.half_l : t_.l);
      count_ += 2;
    } else {
      at = element(at, {&kL, &number}, a, b, half ? t_.half_l : t_.l);
      ++count_;
    }
    out_.commit(at);
  }

  /// Shunt element k from node to ref, with its conductance beside it.
  void shunt(const Name& number, Label node, bool half) {
    char* at = out_.reserve(2 * kElementRoom);
    at = element(at, {&kC, &number}, node, kRef, half ? t_.half_c : t_.c);
    ++count_;
    if (has_g_) {
      at = element(at, {&kG, &number}, node, kRef, half ? t_.half_g : t_.g);
      ++count_;
    }
    out_.commit(at);
  }

  long long count() const { return count_; }

 private:
  /// The room an element line takes in the buffer: its names and nodes copied whole.
  static constexpr std::size_t kElementRoom = 6 * sizeof(Name) + 2 + sizeof(Tail);

  /// One element line, `<name> <a> <b><tail>`, written at `at`; returns its end. The
  /// cursor stays in a register: through the buffer's own pointer, every piece written
  /// would wait for the pointer's last store (measured: 1.7 times the time).
  static char* element(char* at, Label name, Label a, Label b, const Tail& tail) {
    at = label(at, name);
    *at++ = ' ';
    at = label(at, a);
    *at++ = ' ';
    at = label(at, b);
    return tail.copy_to(at);
  }
  static char* label(char* at, Label l) { return l.number->copy_to(l.word->copy_to(at)); }

  inline static const Name kL{"L"}, kC{"C"}, kR{"R"}, kG{"RG"}, kM{"m"}, kRefWord{"ref"}, kNone{};
  inline static const Label kRef{&kRefWord, &kNone};

  DeckBuffer& out_;
  bool has_r_;
  bool has_g_;
  Tails t_;
  long long count_ = 0;
};

}  // namespace

long long write_ladder(DeckBuffer& out, const plan::LinePlan& line, std::optional<double> charged) {
  LadderWriter w(out, line, charged);
  const int n = line.sections;
  static const Name near("near"), far("far"), inner("n"), none;
  const Label near_port{&near, &none};
  const Label far_port{&far, &none};
  static const Name zero("0");
  SectionNumbers k;
  switch (line.shape) {
    case model::Shape::pi:
    case model::Shape::l: {
      // Shunt node k: near at 0, far at n, n<k> between; pi also shunts near, with half a C.
      const bool pi = line.shape == model::Shape::pi;
      if (pi) w.shunt(zero, near_port, true);
      for (int i = 1; i <= n; ++i, k.advance()) {
        const Label from = i == 1 ? near_port : Label{&inner, &k.previous()};
        const Label to = i == n ? far_port : Label{&inner, &k.current()};
        w.series(k.current(), from, to, false);
        w.shunt(k.current(), to, pi && i == n);
      }
      break;
    }
    case model::Shape::t:
      // Shunt nodes n1..nN are all inner; halves of L at both ports.
      w.series(zero, near_port, {&inner, &k.current()}, true);
      for (int i = 1; i <= n; ++i, k.advance()) {
        const Label node{&inner, &k.current()};
        w.shunt(k.current(), node, false);
        w.series(k.current(), node, i == n ? far_port : Label{&inner, &k.next()}, i == n);
      }
      break;
  }
  return w.count();
}

long long write_ladder(std::ostream& out, const plan::LinePlan& line,
                       std::optional<double> charged) {
  DeckBuffer buffer(out);
  return write_ladder(buffer, line, charged);
}

}  // namespace rungs::emit
