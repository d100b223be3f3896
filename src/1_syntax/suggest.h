// "Did you mean": the nearest known word to a misspelt one.
#pragma once
#include <span>
#include <string>
#include <string_view>

namespace rungs::syntax {

/// Edit distance (insertions, deletions, substitutions, transpositions of neighbours)
/// between two words, ASCII case folded.
int edit_distance(std::string_view a, std::string_view b);

/// The candidate closest to `word` when it is close enough to be a likely slip (distance at
/// most 2, and under half the word's length), else an empty string.
std::string nearest(std::string_view word, std::span<const std::string_view> candidates);

/// "; did you mean 'x'?" when a near candidate exists, else "; expected one of a, b, c".
std::string did_you_mean(std::string_view word, std::span<const std::string_view> candidates);

}  // namespace rungs::syntax
