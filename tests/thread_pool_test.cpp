// The shared thread pool: every item once, nested loops within the pool's threads, a loop's
// own limit, and a task's exception thrown again.
#include <catch2/catch.hpp>

#include <algorithm>
#include <atomic>
#include <mutex>
#include <set>
#include <stdexcept>
#include <thread>
#include <vector>

#include "5_plan/thread_pool.h"

using rungs::plan::ThreadPool;

namespace {

/// Counts the tasks running at once and keeps the most seen.
struct Concurrency {
  std::atomic<int> now{0};
  std::atomic<int> most{0};
  void enter() {
    const int n = ++now;
    int seen = most.load();
    while (n > seen && !most.compare_exchange_weak(seen, n)) {
    }
  }
  void leave() { --now; }
};

/// Work long enough that other threads take items meanwhile, without any clock.
double busy(int rounds) {
  volatile double x = 1.0;
  for (int i = 0; i < rounds; ++i) x = x * 1.0000001 + 1e-9;
  return x;
}

}  // namespace

TEST_CASE("a loop calls its task once for every item") {
  ThreadPool pool(3);
  std::vector<int> calls(1000, 0);
  pool.for_each(calls.size(), [&](std::size_t i) { ++calls[i]; });
  CHECK(std::all_of(calls.begin(), calls.end(), [](int c) { return c == 1; }));
  pool.for_each(0, [&](std::size_t) { FAIL("no item to run"); });
}

TEST_CASE("nested loops run on the pool's threads, never more at once than its size") {
  ThreadPool pool(3);
  Concurrency leaves;
  std::mutex lock;
  std::set<std::thread::id> threads;
  std::vector<std::vector<int>> done(8, std::vector<int>(16, 0));
  // Eight outer items, at most two at once (as build -j 2), each a loop of sixteen leaves;
  // only the leaves work, the outer items wait for theirs.
  pool.for_each(
      done.size(),
      [&](std::size_t outer) {
        pool.for_each(done[outer].size(), [&](std::size_t inner) {
          leaves.enter();
          {
            const std::lock_guard<std::mutex> hold(lock);
            threads.insert(std::this_thread::get_id());
          }
          busy(200000);
          ++done[outer][inner];
          leaves.leave();
        });
      },
      2);
  for (const std::vector<int>& loop : done)
    CHECK(std::all_of(loop.begin(), loop.end(), [](int c) { return c == 1; }));
  CHECK(leaves.most.load() <= 3);
  CHECK(threads.size() <= 3);  // the caller and two workers, however deep the loops
}

TEST_CASE("a loop's limit caps its items at once, below the pool's size") {
  ThreadPool pool(4);
  Concurrency items;
  pool.for_each(
      64,
      [&](std::size_t) {
        items.enter();
        busy(100000);
        items.leave();
      },
      2);
  CHECK(items.most.load() >= 1);
  CHECK(items.most.load() <= 2);
}

TEST_CASE("a task's exception is thrown again by the loop, and the pool goes on working") {
  ThreadPool pool(2);
  CHECK_THROWS_WITH(pool.for_each(100,
                                  [&](std::size_t i) {
                                    if (i == 3) throw std::runtime_error("item 3 failed");
                                  }),
                    "item 3 failed");
  std::atomic<int> after{0};
  pool.for_each(10, [&](std::size_t) { ++after; });
  CHECK(after.load() == 10);
  // On one thread the items run in order, so exactly those up to the failure ran.
  ThreadPool one(1);
  int ran = 0;
  CHECK_THROWS_AS(one.for_each(100,
                               [&](std::size_t i) {
                                 ++ran;
                                 if (i == 3) throw std::runtime_error("item 3 failed");
                               }),
                  std::runtime_error);
  CHECK(ran == 4);
}

TEST_CASE("a pool of one runs everything on the calling thread") {
  ThreadPool pool(0);  // taken as one
  CHECK(pool.size() == 1);
  const std::thread::id caller = std::this_thread::get_id();
  bool elsewhere = false;
  pool.for_each(5, [&](std::size_t) {
    pool.for_each(
        5, [&](std::size_t) { elsewhere = elsewhere || std::this_thread::get_id() != caller; });
  });
  CHECK_FALSE(elsewhere);
}
