// Telling a user why a netlist is stale, from the deck header rungs writes.
#include "8_project/staleness.h"

#include <fmt/format.h>

#include "6_emit/netlist.h"

namespace rungs::project {

namespace {

std::string_view first_line(std::string_view text) {
  return text.substr(0, text.find('\n'));
}

/// The part of a marker between `rungs ` and ` from `: the version that wrote it.
std::string_view marker_version(std::string_view marker) {
  constexpr std::string_view kBefore = "rungs ", kAfter = " from ";
  const std::size_t begin = marker.find(kBefore);
  if (begin == std::string_view::npos) return {};
  const std::size_t end = marker.find(kAfter, begin + kBefore.size());
  if (end == std::string_view::npos) return {};
  return marker.substr(begin + kBefore.size(), end - begin - kBefore.size());
}

/// The part of a marker between ` from ` and the last `; `: the source it was made from.
std::string_view marker_source(std::string_view marker) {
  constexpr std::string_view kFrom = " from ";
  const std::size_t begin = marker.find(kFrom);
  const std::size_t end = marker.rfind("; ");
  if (begin == std::string_view::npos || end == std::string_view::npos || end < begin) return {};
  return marker.substr(begin + kFrom.size(), end - begin - kFrom.size());
}

/// The 64 hex digits after "source sha256 ", or empty when the header has none (a header
/// template may leave it out).
std::string_view source_hash(std::string_view head) {
  constexpr std::string_view kKey = "source sha256 ";
  const std::size_t at = head.find(kKey);
  if (at == std::string_view::npos) return {};
  return head.substr(at + kKey.size(), 64);
}

}  // namespace

std::string netlist_stale_reason(std::string_view existing, std::string_view expected) {
  if (existing.empty()) return "empty";
  const std::string_view old_marker = first_line(existing), new_marker = first_line(expected);
  if (!emit::is_deck_marker(old_marker)) return "not written by rungs";
  const std::string_view old_version = marker_version(old_marker);
  const std::string_view new_version = marker_version(new_marker);
  if (old_version != new_version)
    return fmt::format("written by rungs {}; this is rungs {}", old_version, new_version);
  const std::string_view old_source = marker_source(old_marker);
  const std::string_view new_source = marker_source(new_marker);
  if (old_source != new_source)
    return fmt::format("made from {}; the manifest names {}", old_source, new_source);
  const std::string_view old_hash = source_hash(existing), new_hash = source_hash(expected);
  if (!old_hash.empty() && !new_hash.empty() && old_hash != new_hash)
    return "its description changed since it was written";
  return "differs from what rungs writes now (edited by hand, or the manifest's defaults or "
         "the templates changed)";
}

}  // namespace rungs::project
