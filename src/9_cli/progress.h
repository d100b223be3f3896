// A progress line on the terminal for work that takes more than a moment.
#pragma once
#include <atomic>
#include <string>
#include <thread>

namespace rungs::cli {

/// While alive, and only when standard error is a terminal, shows "rungs: LABEL... 3 s" on
/// standard error once the work has taken more than a second, updated twice a second, and
/// clears it when done. Silent otherwise, so logs and CI output stay clean. Only the command
/// line's top level makes one, from its main thread, never the stages or the tasks of a
/// parallel loop. One shows at a time: a note made while another lives, or with an empty
/// label, stays silent.
class ProgressNote {
 public:
  explicit ProgressNote(std::string label);
  ~ProgressNote();
  ProgressNote(const ProgressNote&) = delete;
  ProgressNote& operator=(const ProgressNote&) = delete;

 private:
  void tick();

  std::string label_;
  std::atomic<bool> done_{false};
  bool showing_ = false;  // this note holds the terminal line
  std::thread ticker_;
};

}  // namespace rungs::cli
