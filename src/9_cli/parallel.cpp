// A minimal pool: threads that take the next task index until none is left.
#include "9_cli/parallel.h"

#include <algorithm>
#include <atomic>
#include <thread>
#include <vector>

namespace rungs::cli {

void for_each_parallel(std::size_t count, unsigned threads,
                       const std::function<void(std::size_t)>& task) {
  std::atomic<std::size_t> next{0};
  auto work = [&] {
    for (std::size_t i = next++; i < count; i = next++) task(i);
  };
  const std::size_t helpers = std::min<std::size_t>(std::max(threads, 1u), count);
  std::vector<std::thread> pool;
  for (std::size_t t = 1; t < helpers; ++t) pool.emplace_back(work);
  work();
  for (std::thread& thread : pool) thread.join();
}

unsigned default_thread_count() {
  return std::max(1u, std::thread::hardware_concurrency());
}

}  // namespace rungs::cli
