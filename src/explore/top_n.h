// Keep the n best of a vector, in order (private to src/explore).
#pragma once

#include <algorithm>
#include <cstddef>
#include <vector>

namespace lode::explore {

// Sorts `v` by `better` and keeps its first `n` elements (partial sort when
// that is less work).
template <typename T, typename Better>
void keep_top(std::vector<T>& v, std::size_t n, Better better) {
  if (v.size() > n) {
    std::partial_sort(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(n), v.end(), better);
    v.resize(n);
  } else {
    std::sort(v.begin(), v.end(), better);
  }
}

}  // namespace lode::explore
