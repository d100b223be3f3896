// Why an output on disk is not what rungs would write now, for `rungs build --check`.
#pragma once
#include <string>
#include <string_view>

namespace rungs::project {

/// How many bytes of each file stale_reason looks at.
inline constexpr std::size_t kHeadBytes = 1024;

/// A short reason, for one line of `rungs build --check`, why a netlist whose bytes differ
/// from the ones rungs would write now is stale. `existing` and `expected` are the first
/// kHeadBytes (or fewer) of the file on disk and of the new text. In order: it is empty; it was not
/// written by rungs; another version of rungs wrote it; it was made from another source;
/// its description changed (the header's source sha256 differs); otherwise it was edited, or
/// the manifest's defaults or the templates changed.
std::string netlist_stale_reason(std::string_view existing, std::string_view expected);

}  // namespace rungs::project
