// One UTF-8 sequence, as repair and name escaping see it (private to src/analysis/).
#pragma once

#include <cstddef>
#include <string_view>

namespace lode {

// Length of the well-formed sequence starting at s[i] (1..4), or 0 when it
// is ill-formed; then *bad is the length of its maximal subpart (>= 1).
// Well-formedness follows Unicode 15, Table 3-7 (utf8.cpp).
// REQUIRES: i < s.size().
std::size_t utf8_sequence_length(std::string_view s, std::size_t i, std::size_t* bad);

}  // namespace lode
