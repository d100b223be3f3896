// Running independent tasks on a few threads, for `rungs build -j N`.
#pragma once
#include <cstddef>
#include <functional>

namespace rungs::cli {

/// Calls `task(i)` once for every i in [0, count), on up to `threads` threads (at least one;
/// the calling thread is one of them), and returns when all are done. Tasks are taken in
/// order of i; `task` must not throw and must not share unguarded state with other tasks.
void for_each_parallel(std::size_t count, unsigned threads,
                       const std::function<void(std::size_t)>& task);

/// The number of threads to use when -j is not given: the machine's cores (at least one).
unsigned default_thread_count();

}  // namespace rungs::cli
