// The emit stage's output buffer: text arrives whole and in order however it is written, in
// pieces of at most the buffer's capacity, and the short texts a ladder repeats count up
// as decimal numbers do.
#include <catch2/catch.hpp>

#include <algorithm>
#include <sstream>
#include <streambuf>
#include <string>
#include <vector>

#include "6_emit/deck_buffer.h"

namespace emit = rungs::emit;

namespace {

/// A stream buffer that keeps what arrives and the size of each write.
struct RecordingBuffer : std::streambuf {
  std::string text;
  std::vector<std::size_t> writes;
  std::streamsize xsputn(const char* data, std::streamsize n) override {
    text.append(data, static_cast<std::size_t>(n));
    writes.push_back(static_cast<std::size_t>(n));
    return n;
  }
  int overflow(int c) override {
    text.push_back(static_cast<char>(c));
    writes.push_back(1);
    return c;
  }
};

/// `n` bytes of text that differ from one place to the next, so a byte out of place shows.
std::string varied_text(std::size_t n, unsigned seed) {
  std::string out(n, ' ');
  for (std::size_t i = 0; i < n; ++i) out[i] = static_cast<char>('a' + (i * 7 + seed) % 26);
  return out;
}

}  // namespace

TEST_CASE("DeckBuffer passes on every byte in order, in writes of at most its capacity") {
  RecordingBuffer sink;
  std::ostream out(&sink);
  std::string expected;
  {
    emit::DeckBuffer buffer(out);
    // Short pieces, a piece longer than the whole buffer, and pieces through the cursor,
    // mixed, so that flushes fall inside every kind of write.
    const emit::ShortText<16> word("near");
    for (unsigned i = 0; i < 60000; ++i) {
      const std::string piece = varied_text(1 + i % 97, i);
      buffer.write(piece);
      expected += piece;
      char* at = buffer.reserve(2 * sizeof word);
      at = word.copy_to(at);
      *at++ = '\n';
      buffer.commit(at);
      expected += "near\n";
      if (i == 30000) {
        const std::string long_piece = varied_text(emit::DeckBuffer::kCapacity * 5 / 2, 7);
        buffer << long_piece;
        expected += long_piece;
      }
    }
  }  // destroyed: the rest is flushed
  CHECK(expected.size() > 3 * emit::DeckBuffer::kCapacity);
  CHECK(sink.text.size() == expected.size());
  CHECK(sink.text == expected);
  CHECK(sink.writes.size() > 3);
  CHECK(*std::max_element(sink.writes.begin(), sink.writes.end()) <= emit::DeckBuffer::kCapacity);
}

TEST_CASE("DeckBuffer writes nothing until it is full or flushed") {
  RecordingBuffer sink;
  std::ostream out(&sink);
  emit::DeckBuffer buffer(out);
  buffer << "* a deck\n";
  CHECK(sink.text.empty());
  buffer.flush();
  CHECK(sink.text == "* a deck\n");
  buffer.flush();  // nothing more to write
  CHECK(sink.writes.size() == 1);
}

TEST_CASE("ShortText copies only its text's length onward") {
  // copy_to writes all N bytes but returns the end of the text, so the next copy overwrites
  // the rest: pieces written one after another read as their concatenation.
  std::string target(64, '#');
  const emit::ShortText<16> a("L12"), b(" n"), c("far");
  char* at = target.data();
  at = c.copy_to(b.copy_to(a.copy_to(at)));
  CHECK(std::string(target.data(), at) == "L12 nfar");
  CHECK(a.view() == "L12");
  CHECK(emit::ShortText<16>("ab").add("cd").view() == "abcd");
}

TEST_CASE("ShortText counts up as decimal numbers do, across every new digit") {
  // Checked against std::to_string of the same count (the C++ standard's decimal form).
  for (int step : {1, 4, 9}) {
    INFO("step " << step);
    emit::ShortText<16> number("0");
    int value = 0;
    while (value < 1'200'000 && number.view() == std::to_string(value)) {
      number.count_up(step);
      value += step;
    }
    CHECK(number.view() == std::to_string(value));
    CHECK(value >= 1'200'000);
  }
  emit::ShortText<16> big("999999999999999");  // 15 nines: the 16th digit still fits
  big.count_up(1);
  CHECK(big.view() == "1000000000000000");
  emit::ShortText<16> start("7");
  start.count_up(3);
  CHECK(start.view() == "10");
}
