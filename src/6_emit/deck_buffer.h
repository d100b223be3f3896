// Deck text gathered in one large buffer and handed to the stream in few, large writes.
#pragma once
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <memory>
#include <ostream>
#include <string_view>

#include "1_syntax/invariant.h"

namespace rungs::emit {

/// Text of at most N bytes kept in N bytes of storage, which DeckBuffer copies whole (one
/// fixed-size copy, no call) and then counts only the text: for the short names and values
/// that every section of a ladder repeats.
template <std::size_t N>
class ShortText {
 public:
  static_assert(N <= 255);
  ShortText() = default;
  explicit ShortText(std::string_view text) { add(text); }

  /// Adds `text` at the end; the whole must still fit in N bytes.
  ShortText& add(std::string_view text) {
    RUNGS_ASSERT(text.size() <= N - size_);
    std::memcpy(text_ + size_, text.data(), text.size());
    size_ = static_cast<std::uint8_t>(size_ + text.size());
    return *this;
  }
  /// Adds `step` (1 to 9) to the text read as a decimal number (digits only, at least one),
  /// a byte at a time: section numbers are counted rather than converted.
  void count_up(int step) {
    int carry = step;
    for (int i = size_ - 1; i >= 0; --i) {
      const int digit = text_[i] + carry;
      if (digit <= '9') {
        text_[i] = static_cast<char>(digit);
        return;
      }
      text_[i] = static_cast<char>(digit - 10);
      carry = 1;
    }
    RUNGS_ASSERT(size_ < N);  // every digit carried: one digit more, a leading 1
    for (int i = size_; i > 0; --i) text_[i] = text_[i - 1];
    text_[0] = '1';
    ++size_;
  }
  std::size_t size() const { return size_; }
  std::string_view view() const { return {text_, size_}; }
  /// Writes the text at `at` with one copy of all N bytes, returning the end of the text.
  char* copy_to(char* at) const {
    std::memcpy(at, text_, N);
    return at + size_;
  }

 private:
  char text_[N] = {};
  std::uint8_t size_ = 0;
};

/// Gathers text and writes it to `out` about a megabyte at a time, and the rest on flush()
/// or destruction, so that a ladder's many short lines cost a few copies each, not stream
/// calls. write() takes text of any length. Hot loops write through a cursor instead:
/// reserve() makes room and returns where to write, commit() takes back the end of what was
/// written. Stream errors show in `out`'s state, as with any write to it.
class DeckBuffer {
 public:
  static constexpr std::size_t kCapacity = std::size_t{1} << 20;

  explicit DeckBuffer(std::ostream& out);
  ~DeckBuffer() { flush(); }
  DeckBuffer(const DeckBuffer&) = delete;
  DeckBuffer& operator=(const DeckBuffer&) = delete;

  /// Appends `text`, flushing as often as it needs.
  void write(std::string_view text);
  DeckBuffer& operator<<(std::string_view text) {
    write(text);
    return *this;
  }
  /// Writes out everything gathered so far.
  void flush();

  /// Where to write `bytes` more (at most kCapacity), after a flush if they do not fit.
  char* reserve(std::size_t bytes) {
    if (static_cast<std::size_t>(limit_ - end_) < bytes) flush();
    return end_;
  }
  /// Takes what was written from reserve()'s cursor up to `end`.
  void commit(char* end) { end_ = end; }

 private:
  std::ostream& out_;
  std::unique_ptr<char[]> data_;
  char* end_;
  char* limit_;
};

}  // namespace rungs::emit
