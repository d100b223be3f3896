// SHA-256 of a text, to name the exact source a netlist was made from.
#pragma once
#include <string>
#include <string_view>

namespace rungs::emit {

/// The SHA-256 digest of `data` as 64 lower-case hex digits (FIPS PUB 180-4, 2015).
std::string sha256_hex(std::string_view data);

}  // namespace rungs::emit
