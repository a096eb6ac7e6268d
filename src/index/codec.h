// Byte encodings of the index blobs (see docs/index-format.md, format 4).
// Encoders append to a std::string; decoders check every length and return
// Corruption naming the blob instead of reading past the end.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"

struct ZSTD_CCtx_s;  // zstd.h stays out of this header

namespace lode::codec {

// LEB128 unsigned varint, at most 10 bytes for 64 bits: written at `p`
// (returns the end), or appended to `out`.
inline char* put_varint(char* p, std::uint64_t v) {
  while (v >= 0x80) {
    *p++ = static_cast<char>((v & 0x7f) | 0x80);
    v >>= 7;
  }
  *p++ = static_cast<char>(v);
  return p;
}
void put_varint(std::string& out, std::uint64_t v);

// A bounds-checked reader over a blob.
class Reader {
 public:
  explicit Reader(std::string_view data) : p_(data.data()), end_(data.data() + data.size()) {}
  // False on truncation or overlong varint (the reader is then failed()).
  bool varint(std::uint64_t& v);
  bool varint32(std::uint32_t& v);
  bool u32le(std::uint32_t& v);
  bool bytes(std::size_t n, std::string_view& out);
  bool at_end() const { return p_ == end_; }
  bool failed() const { return failed_; }
  std::size_t remaining() const { return static_cast<std::size_t>(end_ - p_); }

 private:
  const char* p_;
  const char* end_;
  bool failed_ = false;
};

// Positions of a block: for each doc in order, tf varints of position deltas
// (first from 0). `starts` receives each doc's byte offset into the blob.
Status split_positions(std::string_view data, const std::vector<std::uint32_t>& tfs,
                       std::vector<std::uint32_t>& starts);
// Decodes `tf` positions starting at byte `start`.
Status decode_positions(std::string_view data, std::uint32_t start, std::uint32_t tf,
                        std::vector<std::uint32_t>& out);
void encode_positions(std::string& out, const std::vector<std::uint32_t>& positions);

// Forward index of one document: for each field f in 0..kFieldCount-1:
//   varint count, then count × (varint term-id delta, varint tf), term ids ascending.
using ForwardList = std::vector<std::pair<TermId, std::uint32_t>>;
std::string encode_forward(const std::vector<ForwardList>& per_field);
Status decode_forward(std::string_view data, std::vector<ForwardList>& per_field);

// Norms chunk: kNormsPerChunk entries, each flags u32le (bit 0: live) then
// kFieldCount u32le lengths. Chunk c holds docs c*kNormsPerChunk ... +kNormsPerChunk-1.
inline constexpr std::uint32_t kNormsPerChunk = 1024;
inline constexpr std::size_t kNormEntryBytes = 4 * (1 + kFieldCount);
struct NormEntry {
  bool live = false;
  std::array<std::uint32_t, kFieldCount> length{};
};
void put_norm(std::string& chunk, std::uint32_t slot, const NormEntry& e);
NormEntry get_norm(std::string_view chunk, std::uint32_t slot);  // REQUIRES: chunk sized

// Stored text: 1 byte method (0 raw, 1 zstd) then the bytes.
// Page map of a paged document: count, then per page the deltas of its first
// word position and its byte offset from the previous page's (both
// non-decreasing); an empty blob is a document without pages. Corruption on
// truncation, trailing bytes or overflow.
std::string encode_page_map(const std::vector<PageStart>& pages);
Status decode_page_map(std::string_view data, std::vector<PageStart>& out);

// Stored text blobs: see "Stored text" above. A TextCompressor keeps one zstd
// context for many texts (creating a context per text costs more than
// compressing a short one). Not thread-safe.
class TextCompressor {
 public:
  TextCompressor();
  ~TextCompressor();
  TextCompressor(const TextCompressor&) = delete;
  TextCompressor& operator=(const TextCompressor&) = delete;
  std::string compress(std::string_view text);

 private:
  ::ZSTD_CCtx_s* cctx_;
};
std::string compress_text(std::string_view text);  // one-off, for tests and tools
Result<std::string> decompress_text(std::string_view blob);

}  // namespace lode::codec
