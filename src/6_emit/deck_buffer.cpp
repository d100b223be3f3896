// Gathering deck text into large writes.
#include "6_emit/deck_buffer.h"

#include <algorithm>

namespace rungs::emit {

DeckBuffer::DeckBuffer(std::ostream& out)
    : out_(out),
      data_(std::make_unique_for_overwrite<char[]>(kCapacity)),
      end_(data_.get()),
      limit_(data_.get() + kCapacity) {}

void DeckBuffer::write(std::string_view text) {
  while (!text.empty()) {
    char* at = reserve(std::min(text.size(), kCapacity));
    const std::size_t n = std::min(text.size(), static_cast<std::size_t>(limit_ - at));
    std::memcpy(at, text.data(), n);
    commit(at + n);
    text.remove_prefix(n);
  }
}

void DeckBuffer::flush() {
  const char* start = data_.get();
  if (end_ == start) return;
  out_.write(start, end_ - start);
  end_ = data_.get();
}

}  // namespace rungs::emit
