#include "index/codec.h"

#include <zstd.h>

#include <cstring>

namespace lode::codec {

void put_varint(std::string& out, std::uint64_t v) {
  char buf[10];
  out.append(buf, static_cast<std::size_t>(put_varint(buf, v) - buf));
}

bool Reader::varint(std::uint64_t& v) {
  v = 0;
  for (int shift = 0; shift < 64; shift += 7) {
    if (p_ == end_) return !(failed_ = true);
    auto byte = static_cast<std::uint8_t>(*p_++);
    v |= static_cast<std::uint64_t>(byte & 0x7f) << shift;
    if (!(byte & 0x80)) return true;
  }
  return !(failed_ = true);  // more than 10 bytes
}

bool Reader::varint32(std::uint32_t& v) {
  std::uint64_t w = 0;
  if (!varint(w) || w > 0xffffffffu) return !(failed_ = true);
  v = static_cast<std::uint32_t>(w);
  return true;
}

bool Reader::u32le(std::uint32_t& v) {
  if (remaining() < 4) return !(failed_ = true);
  auto* b = reinterpret_cast<const std::uint8_t*>(p_);
  v = std::uint32_t{b[0]} | std::uint32_t{b[1]} << 8 | std::uint32_t{b[2]} << 16 |
      std::uint32_t{b[3]} << 24;
  p_ += 4;
  return true;
}

bool Reader::bytes(std::size_t n, std::string_view& out) {
  if (remaining() < n) return !(failed_ = true);
  out = std::string_view(p_, n);
  p_ += n;
  return true;
}

Status split_positions(std::string_view data, const std::vector<std::uint32_t>& tfs,
                       std::vector<std::uint32_t>& starts) {
  starts.clear();
  Reader r(data);
  for (auto tf : tfs) {
    starts.push_back(static_cast<std::uint32_t>(data.size() - r.remaining()));
    for (std::uint32_t i = 0; i < tf; ++i) {
      std::uint64_t v = 0;
      if (!r.varint(v)) return Status::Corruption("positions blob: truncated");
    }
  }
  if (!r.at_end()) return Status::Corruption("positions blob: trailing bytes");
  return Status();
}

Status decode_positions(std::string_view data, std::uint32_t start, std::uint32_t tf,
                        std::vector<std::uint32_t>& out) {
  out.clear();
  if (start > data.size()) return Status::Corruption("positions blob: offset past end");
  Reader r(data.substr(start));
  std::uint64_t pos = 0;
  for (std::uint32_t i = 0; i < tf; ++i) {
    std::uint64_t d = 0;
    if (!r.varint(d)) return Status::Corruption("positions blob: truncated");
    pos += d;
    if (pos > 0xffffffffu) return Status::Corruption("positions blob: position overflow");
    out.push_back(static_cast<std::uint32_t>(pos));
  }
  return Status();
}

void encode_positions(std::string& out, const std::vector<std::uint32_t>& positions) {
  std::uint32_t prev = 0;
  for (auto p : positions) {
    put_varint(out, p - prev);
    prev = p;
  }
}

std::string encode_forward(const std::vector<ForwardList>& per_field) {
  std::string out;
  for (int f = 0; f < kFieldCount; ++f) {
    const ForwardList empty;
    const ForwardList& l = static_cast<std::size_t>(f) < per_field.size() ? per_field[static_cast<std::size_t>(f)] : empty;
    put_varint(out, l.size());
    TermId prev = 0;
    for (auto& [id, tf] : l) {
      put_varint(out, static_cast<std::uint64_t>(id - prev));
      put_varint(out, tf);
      prev = id;
    }
  }
  return out;
}

Status decode_forward(std::string_view data, std::vector<ForwardList>& per_field) {
  per_field.assign(kFieldCount, {});
  Reader r(data);
  for (int f = 0; f < kFieldCount; ++f) {
    std::uint64_t n = 0;
    if (!r.varint(n) || n > r.remaining()) return Status::Corruption("forward index: bad count");
    auto& l = per_field[static_cast<std::size_t>(f)];
    l.reserve(n);
    std::uint64_t id = 0;
    for (std::uint64_t i = 0; i < n; ++i) {
      std::uint64_t d = 0;
      std::uint32_t tf = 0;
      if (!r.varint(d) || !r.varint32(tf) || (i > 0 && d == 0))
        return Status::Corruption("forward index: truncated entry");
      id += d;
      l.emplace_back(static_cast<TermId>(id), tf);
    }
  }
  if (!r.at_end()) return Status::Corruption("forward index: trailing bytes");
  return Status();
}

static void put_u32le(char* p, std::uint32_t v) {
  for (int i = 0; i < 4; ++i) p[i] = static_cast<char>((v >> (8 * i)) & 0xff);
}
static std::uint32_t get_u32le(const char* p) {
  auto* b = reinterpret_cast<const std::uint8_t*>(p);
  return std::uint32_t{b[0]} | std::uint32_t{b[1]} << 8 | std::uint32_t{b[2]} << 16 |
         std::uint32_t{b[3]} << 24;
}

void put_norm(std::string& chunk, std::uint32_t slot, const NormEntry& e) {
  chunk.resize(kNormsPerChunk * kNormEntryBytes, '\0');
  char* p = chunk.data() + slot * kNormEntryBytes;
  put_u32le(p, e.live ? 1u : 0u);
  for (int f = 0; f < kFieldCount; ++f) put_u32le(p + 4 * (f + 1), e.length[static_cast<std::size_t>(f)]);
}

NormEntry get_norm(std::string_view chunk, std::uint32_t slot) {
  NormEntry e;
  if ((slot + 1) * kNormEntryBytes > chunk.size()) return e;
  const char* p = chunk.data() + slot * kNormEntryBytes;
  e.live = (get_u32le(p) & 1u) != 0;
  for (int f = 0; f < kFieldCount; ++f) e.length[static_cast<std::size_t>(f)] = get_u32le(p + 4 * (f + 1));
  return e;
}

TextCompressor::TextCompressor() : cctx_(ZSTD_createCCtx()) {}
TextCompressor::~TextCompressor() { ZSTD_freeCCtx(cctx_); }

std::string compress_text(std::string_view text) { return TextCompressor().compress(text); }

// Level 1: about twice as fast as the default 3 for a few percent more bytes;
// stored text is read only for snippets, so indexing speed matters more.
constexpr int kLevel = 1;

std::string TextCompressor::compress(std::string_view text) {
  std::string out;
  if (text.size() < 128) {  // not worth a zstd frame header
    out.push_back('\0');
    out.append(text);
    return out;
  }
  out.resize(1 + ZSTD_compressBound(text.size()));
  out[0] = '\1';
  std::size_t n = cctx_ ? ZSTD_compressCCtx(cctx_, out.data() + 1, out.size() - 1, text.data(), text.size(), kLevel)
                        : ZSTD_compress(out.data() + 1, out.size() - 1, text.data(), text.size(), kLevel);
  if (ZSTD_isError(n)) {
    out.assign(1, '\0');
    out.append(text);
    return out;
  }
  out.resize(1 + n);
  return out;
}

Result<std::string> decompress_text(std::string_view blob) {
  if (blob.empty()) return Status::Corruption("stored text: empty blob");
  std::string_view body = blob.substr(1);
  if (blob[0] == '\0') return std::string(body);
  if (blob[0] != '\1') return Status::Corruption("stored text: unknown method byte");
  unsigned long long size = ZSTD_getFrameContentSize(body.data(), body.size());
  if (size == ZSTD_CONTENTSIZE_ERROR || size == ZSTD_CONTENTSIZE_UNKNOWN || size > (1ull << 32))
    return Status::Corruption("stored text: bad zstd frame");
  std::string out(static_cast<std::size_t>(size), '\0');
  std::size_t n = ZSTD_decompress(out.data(), out.size(), body.data(), body.size());
  if (ZSTD_isError(n) || n != size) return Status::Corruption("stored text: zstd decode failed");
  return out;
}

std::string encode_page_map(const std::vector<PageStart>& pages) {
  std::string out;
  put_varint(out, pages.size());
  PageStart prev;
  for (const PageStart& p : pages) {
    put_varint(out, p.position - prev.position);
    put_varint(out, p.offset - prev.offset);
    prev = p;
  }
  return out;
}

Status decode_page_map(std::string_view data, std::vector<PageStart>& out) {
  out.clear();
  if (data.empty()) return Status();  // a document without pages
  Reader r(data);
  std::uint64_t n = 0;
  if (!r.varint(n) || n > r.remaining()) return Status::Corruption("page map: bad page count");
  std::uint64_t pos = 0, off = 0;
  for (std::uint64_t i = 0; i < n; ++i) {
    std::uint64_t dp = 0, doff = 0;
    if (!r.varint(dp) || !r.varint(doff)) return Status::Corruption("page map: truncated");
    pos += dp;
    off += doff;
    if (pos > UINT32_MAX || off > UINT32_MAX) return Status::Corruption("page map: value out of range");
    out.push_back(PageStart{static_cast<std::uint32_t>(pos), static_cast<std::uint32_t>(off)});
  }
  if (!r.at_end()) return Status::Corruption("page map: trailing bytes");
  return Status();
}

}  // namespace lode::codec
