// A progress line on the terminal for work that takes more than a moment.
#pragma once
#include <atomic>
#include <string>
#include <thread>

namespace rungs::cli {

/// While alive, and only when standard error is a terminal, shows "rungs: LABEL... 3 s" on
/// standard error once the work has taken more than a second, updated twice a second, and
/// clears it when done. Silent otherwise, so logs and CI output stay clean.
class ProgressNote {
 public:
  explicit ProgressNote(std::string label);
  ~ProgressNote();
  ProgressNote(const ProgressNote&) = delete;
  ProgressNote& operator=(const ProgressNote&) = delete;

 private:
  std::string label_;
  std::atomic<bool> done_{false};
  std::thread ticker_;
};

}  // namespace rungs::cli
