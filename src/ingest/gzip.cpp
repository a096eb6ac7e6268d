// gzip (RFC 1952) through zlib: every member of a multi-member file, pulled
// a piece at a time (GzipInflater) or unpacked whole within a budget (gunzip).
#include <zlib.h>

#include <algorithm>

#include "ingest/readers.h"

namespace lode::ingest {

struct GzipInflater::Stream {
  z_stream z{};
};

GzipInflater::GzipInflater(std::string path, Input input)
    : path_(std::move(path)), input_(std::move(input)), stream_(std::make_unique<Stream>()) {
  ok_ = inflateInit2(&stream_->z, 15 + 16) == Z_OK;
}

GzipInflater::~GzipInflater() {
  if (ok_) inflateEnd(&stream_->z);
}

Status GzipInflater::damaged(const char* why) const {
  return Status::Corruption(path_ + ": damaged gzip data (" + (why != nullptr ? why : "truncated") + ")");
}

Result<std::size_t> GzipInflater::read(char* dst, std::size_t want) {
  if (!ok_) return Status::IOError(path_ + ": cannot start gzip decoder");
  z_stream& z = stream_->z;
  z.next_out = reinterpret_cast<Bytef*>(dst);
  z.avail_out = static_cast<uInt>(std::min<std::size_t>(want, 1u << 30));
  const uInt asked = z.avail_out;
  while (z.avail_out > 0 && !done_) {
    if (z.avail_in == 0 && !input_done_) {
      auto more = input_();
      if (!more) return more.status();
      if (more->empty()) {
        input_done_ = true;
      } else {
        z.next_in = reinterpret_cast<Bytef*>(const_cast<char*>(more->data()));
        z.avail_in = static_cast<uInt>(more->size());
      }
    }
    if (z.avail_in == 0 && input_done_) {
      if (!member_ended_) return damaged(nullptr);
      done_ = true;
      break;
    }
    if (member_ended_) {  // another member follows
      inflateReset(&z);
      member_ended_ = false;
    }
    const int rc = inflate(&z, Z_NO_FLUSH);
    if (rc == Z_STREAM_END) {
      member_ended_ = true;
    } else if (rc != Z_OK && !(rc == Z_BUF_ERROR && z.avail_in == 0)) {
      return damaged(z.msg);
    }
  }
  return static_cast<std::size_t>(asked - z.avail_out);
}

Result<std::string> gunzip(std::string_view bytes, const std::string& path, std::int64_t max_unpacked,
                           std::int64_t keep, bool* cut) {
  GzipInflater inflater(path, [bytes]() mutable -> Result<std::string_view> {
    const std::string_view piece = bytes.substr(0, std::size_t{1} << 30);
    bytes.remove_prefix(piece.size());
    return piece;
  });
  if (cut != nullptr) *cut = false;
  constexpr std::size_t kPiece = 65536;
  // Grown by doubling up to the bound and no further: a string left to
  // double by itself would hold up to twice the limit at its last step.
  const std::int64_t bound = keep > 0 && (max_unpacked <= 0 || keep < max_unpacked) ? keep : max_unpacked;
  std::string out;
  char buf[kPiece];
  for (;;) {
    auto got = inflater.read(buf, sizeof buf);
    if (!got) return got.status();
    if (*got == 0) return out;
    if (keep > 0 && static_cast<std::int64_t>(out.size() + *got) > keep) {
      out.append(buf, static_cast<std::size_t>(keep) - out.size());
      *cut = true;
      return out;
    }
    if (out.size() + *got > out.capacity()) {
      std::size_t want = std::max<std::size_t>(out.capacity() * 2, std::size_t{1} << 20);
      if (bound > 0) want = std::min(want, static_cast<std::size_t>(bound) + kPiece);
      out.reserve(std::max(want, out.size() + *got));
    }
    out.append(buf, *got);
    if (max_unpacked > 0 && static_cast<std::int64_t>(out.size()) > max_unpacked)
      return Status::Limit(path + ": gzip data expands past " + std::to_string(max_unpacked) +
                           " bytes (limit on unpacked size)");
  }
}

}  // namespace lode::ingest
