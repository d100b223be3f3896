// The shared thread pool: loops whose callers help, nested loops on the same threads.
#include "5_plan/thread_pool.h"

#include <algorithm>
#include <exception>

namespace rungs::plan {

struct ThreadPool::Loop {
  const std::function<void(std::size_t)>* task = nullptr;
  std::size_t count = 0;
  std::size_t limit = 0;
  std::size_t next = 0;     // the next item to start; count when none is left (or one threw)
  std::size_t running = 0;  // items started and not finished
  std::exception_ptr failure;

  bool can_start() const { return next < count && running < limit; }
};

ThreadPool::ThreadPool(unsigned size) : size_(std::max(1u, size)) {
  for (unsigned i = 1; i < size_; ++i) workers_.emplace_back([this] { work(); });
}

ThreadPool::~ThreadPool() {
  {
    const std::lock_guard<std::mutex> hold(lock_);
    stopping_ = true;
  }
  changed_.notify_all();
  for (std::thread& worker : workers_) worker.join();
}

unsigned ThreadPool::core_count() {
  return std::max(1u, std::thread::hardware_concurrency());
}

void ThreadPool::for_each(std::size_t count, const std::function<void(std::size_t)>& task,
                          unsigned limit) {
  if (count == 0) return;
  Loop loop;
  loop.task = &task;
  loop.count = count;
  loop.limit = limit == 0 ? size_ : limit;
  std::unique_lock<std::mutex> hold(lock_);
  open_.push_back(&loop);
  changed_.notify_all();
  // The caller runs its own loop's items and nothing else: waiting for the last items that
  // others run, it does no work, so the threads doing work stay within the pool's size.
  while (loop.next < loop.count || loop.running > 0) {
    if (loop.can_start())
      run_next(loop, hold);
    else
      changed_.wait(hold);
  }
  open_.erase(std::find(open_.begin(), open_.end(), &loop));
  hold.unlock();
  if (loop.failure) std::rethrow_exception(loop.failure);
}

void ThreadPool::run_next(Loop& loop, std::unique_lock<std::mutex>& hold) {
  const std::size_t item = loop.next++;
  ++loop.running;
  hold.unlock();
  std::exception_ptr failure;
  try {
    (*loop.task)(item);
  } catch (...) {
    failure = std::current_exception();
  }
  hold.lock();
  if (failure && !loop.failure) {
    loop.failure = failure;
    loop.next = loop.count;
  }
  --loop.running;
  changed_.notify_all();
}

ThreadPool::Loop* ThreadPool::startable() const {
  // The newest first: a nested loop's items finish the item that waits for them.
  for (auto it = open_.rbegin(); it != open_.rend(); ++it)
    if ((*it)->can_start()) return *it;
  return nullptr;
}

void ThreadPool::work() {
  std::unique_lock<std::mutex> hold(lock_);
  for (;;) {
    if (Loop* loop = startable())
      run_next(*loop, hold);
    else if (stopping_)
      return;
    else
      changed_.wait(hold);
  }
}

}  // namespace rungs::plan
