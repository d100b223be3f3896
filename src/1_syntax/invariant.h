// RUNGS_ASSERT: an internal invariant, something no input can break, checked in every build.
#pragma once
#include <cstdio>
#include <cstdlib>

namespace rungs::syntax {

/// Prints "FILE:LINE: internal invariant broken: WHAT" on standard error and aborts. A broken
/// invariant is a bug in rungs, not a mistake in its input, so no message tells a user what
/// to change, and nothing goes on to write a netlist from a wrong state.
[[noreturn]] inline void invariant_broken(const char* what, const char* file, int line) {
  std::fprintf(stderr, "%s:%d: internal invariant broken: %s\n", file, line, what);
  std::abort();
}

}  // namespace rungs::syntax

/// Aborts (invariant_broken) unless `condition` holds; unlike assert, also in release builds.
#define RUNGS_ASSERT(condition) \
  ((condition) ? void(0) : ::rungs::syntax::invariant_broken(#condition, __FILE__, __LINE__))

/// Marks a place no input can reach, such as the end of a switch over every enumerator.
#define RUNGS_UNREACHABLE(what) ::rungs::syntax::invariant_broken(what, __FILE__, __LINE__)
