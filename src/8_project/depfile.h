// Depfiles in make syntax, so make, ninja and CMake know what a netlist was made from.
#pragma once
#include <span>
#include <string>
#include <string_view>

namespace rungs::project {

/// `path` escaped for a make rule as GCC's dependency writer escapes it (libcpp/mkdeps.cc):
/// a space or tab as `\ ` with the backslashes before it doubled, `#` as `\#`, `$` as `$$`.
/// Make and ninja read these back to the path. A path with a line break cannot be written;
/// see depfile_can_name.
std::string escape_make_path(std::string_view path);

/// True when `path` can appear in a depfile (it holds no line break and is not empty).
bool depfile_can_name(std::string_view path);

/// An error message naming the first path of either list that a depfile cannot name, or
/// empty when make_depfile can write them all.
std::string depfile_problem(std::span<const std::string> targets,
                            std::span<const std::string> prerequisites);

/// A depfile: one rule `TARGETS: PREREQUISITES`, one prerequisite a line (each line but the
/// last ends in ` \`), then an empty rule for each prerequisite, as `gcc -MP` writes them, so
/// that make does not stop when a description is deleted or renamed. Prerequisites are
/// written once each, in the order given. Every path must pass depfile_can_name.
std::string make_depfile(std::span<const std::string> targets,
                         std::span<const std::string> prerequisites);

}  // namespace rungs::project
