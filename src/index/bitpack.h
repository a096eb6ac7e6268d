// Fixed-width bit packing of small unsigned integers, for postings blocks
// (docs/index-format.md, "postings.data"). Values are written least
// significant bit first into a little-endian bit stream: value i occupies
// bits [i*width, (i+1)*width). A block of n values takes ceil(n*width/8)
// bytes; width 0 stores nothing (every value is 0).
//
// The decoder, specialised per width, reads 64-bit words where at least 8
// bytes remain and falls back to byte loads near the end, so it never reads
// past the blob.
#pragma once

#include <algorithm>
#include <array>
#include <bit>
#include <cstdint>
#include <cstring>
#include <string>
#include <utility>

namespace lode::codec {

inline constexpr unsigned kMaxPackWidth = 32;

// Bits needed for `v` (0 for 0).
inline unsigned bits_for(std::uint32_t v) { return static_cast<unsigned>(std::bit_width(v)); }

inline std::size_t packed_bytes(std::size_t n, unsigned width) { return (n * width + 7) / 8; }

// Appends values[0..n) packed at `width` bits each. REQUIRES: every value
// fits in `width` bits, width <= 32.
inline void pack(std::string& out, const std::uint32_t* values, std::size_t n, unsigned width) {
  const std::size_t start = out.size();
  out.resize(start + packed_bytes(n, width), '\0');
  if (width == 0) return;
  auto* p = reinterpret_cast<unsigned char*>(out.data() + start);
  std::uint64_t acc = 0;
  unsigned have = 0;
  for (std::size_t i = 0; i < n; ++i) {
    acc |= static_cast<std::uint64_t>(values[i]) << have;
    have += width;
    while (have >= 8) {
      *p++ = static_cast<unsigned char>(acc);
      acc >>= 8;
      have -= 8;
    }
  }
  if (have > 0) *p = static_cast<unsigned char>(acc);
}

namespace detail {
// Full blocks with the width known at compile time: the shifts and masks
// become constants and the loop unrolls. REQUIRES: `bytes` >= packed_bytes(n, W).
template <unsigned W>
void unpack_fixed(const unsigned char* in, std::size_t bytes, std::uint32_t* out, std::size_t n) {
  constexpr std::uint64_t kMask = (std::uint64_t{1} << W) - 1;
  std::size_t i = 0;
  // Values whose 8-byte window lies inside the blob.
  const std::size_t safe = bytes >= 8 ? std::min(n, ((bytes - 8) * 8) / W + 1) : 0;
  for (; i < safe; ++i) {
    const std::size_t bit = i * W;
    std::uint64_t w;
    std::memcpy(&w, in + (bit >> 3), 8);
    if constexpr (std::endian::native == std::endian::big) w = __builtin_bswap64(w);
    out[i] = static_cast<std::uint32_t>((w >> (bit & 7)) & kMask);
  }
  for (; i < n; ++i) {
    const std::size_t bit = i * W, at = bit >> 3;
    std::uint64_t w = 0;
    for (std::size_t k = 0; k < 8 && at + k < bytes; ++k) w |= static_cast<std::uint64_t>(in[at + k]) << (8 * k);
    out[i] = static_cast<std::uint32_t>((w >> (bit & 7)) & kMask);
  }
}

using UnpackFn = void (*)(const unsigned char*, std::size_t, std::uint32_t*, std::size_t);
template <std::size_t... W>
constexpr std::array<UnpackFn, sizeof...(W)> unpack_table(std::index_sequence<W...>) {
  return {&unpack_fixed<static_cast<unsigned>(W) + 1>...};
}
inline constexpr auto kUnpack = unpack_table(std::make_index_sequence<kMaxPackWidth>());
}  // namespace detail

// Reads n values of `width` bits from `in` (which holds packed_bytes(n,
// width) bytes) into out[0..n). REQUIRES: width <= 32.
inline void unpack(const unsigned char* in, std::size_t bytes, std::uint32_t* out, std::size_t n, unsigned width) {
  if (width == 0) {
    std::memset(out, 0, n * sizeof(std::uint32_t));
    return;
  }
  detail::kUnpack[width - 1](in, bytes, out, n);
}

}  // namespace lode::codec
