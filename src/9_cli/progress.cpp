// The terminal progress line: a ticker thread that speaks only after a second, only to a TTY.
#include "9_cli/progress.h"

#include <chrono>
#include <cstdio>

#include <unistd.h>

namespace rungs::cli {

namespace {
// Whether a note holds the terminal line: two would overwrite each other's \r.
std::atomic<bool> line_taken{false};
}  // namespace

ProgressNote::ProgressNote(std::string label) : label_(std::move(label)) {
  if (label_.empty() || !::isatty(STDERR_FILENO) || line_taken.exchange(true)) return;
  showing_ = true;
  ticker_ = std::thread([this] { tick(); });
}

void ProgressNote::tick() {
  using clock = std::chrono::steady_clock;
  const auto start = clock::now();
  bool shown = false;
  while (!done_.load()) {
    std::this_thread::sleep_for(std::chrono::milliseconds(100));
    const double elapsed = std::chrono::duration<double>(clock::now() - start).count();
    if (elapsed < 1.0 || done_.load()) continue;
    // Twice a second is enough to show life without flooding a slow terminal.
    if (static_cast<int>(elapsed * 10) % 5 != 0) continue;
    std::fprintf(stderr, "\rrungs: %s... %.0f s ", label_.c_str(), elapsed);
    std::fflush(stderr);
    shown = true;
  }
  if (shown) {
    std::fprintf(stderr, "\r\033[K");
    std::fflush(stderr);
  }
}

ProgressNote::~ProgressNote() {
  done_.store(true);
  if (ticker_.joinable()) ticker_.join();
  if (showing_) line_taken.store(false);
}

}  // namespace rungs::cli
