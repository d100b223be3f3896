// One set of worker threads for every parallel loop of a run: the planner's and `rungs build`'s.
#pragma once
#include <condition_variable>
#include <cstddef>
#include <functional>
#include <mutex>
#include <thread>
#include <vector>

namespace rungs::plan {

/// A fixed number of threads that run the items of parallel loops. The thread that starts a
/// loop works on its items too, and a loop started inside an item (nested) runs on the same
/// threads, so at most size() threads do work at once however deeply loops nest, as long as
/// one thread from outside the pool uses it at a time.
class ThreadPool {
 public:
  /// A pool of `size` threads doing work (at least one): the caller and size - 1 workers.
  explicit ThreadPool(unsigned size);
  /// Stops the workers; no loop may be running.
  ~ThreadPool();
  ThreadPool(const ThreadPool&) = delete;
  ThreadPool& operator=(const ThreadPool&) = delete;

  unsigned size() const { return size_; }

  /// Calls task(i) once for every i in [0, count), on the calling thread and on workers that
  /// are free, at most `limit` items at once (0: as many as the pool has threads), and
  /// returns when every item is done. Items start in order of i, on any thread, so a task
  /// must touch only what belongs to its item. When a task throws, the items not yet started
  /// are skipped, and the first exception is thrown again once the started ones are done.
  void for_each(std::size_t count, const std::function<void(std::size_t)>& task,
                unsigned limit = 0);

  /// The machine's cores (at least one): the size of a pool when nothing else says.
  static unsigned core_count();

 private:
  struct Loop;
  /// Runs the next item of `loop`, unlocking `hold` meanwhile.
  void run_next(Loop& loop, std::unique_lock<std::mutex>& hold);
  /// The newest loop with an item that may start now, or null.
  Loop* startable() const;
  void work();

  unsigned size_;
  std::mutex lock_;
  std::condition_variable changed_;  // a loop opened, or an item finished
  std::vector<Loop*> open_;          // loops started and not yet returned, oldest first
  bool stopping_ = false;
  std::vector<std::thread> workers_;
};

}  // namespace rungs::plan
