// gzip (RFC 1952) through zlib, every member of a multi-member file, within
// the unpacked-size budget.
#include <zlib.h>

#include "ingest/readers.h"

namespace lode::ingest {

Result<std::string> gunzip(std::string_view bytes, const std::string& path, std::int64_t max_unpacked) {
  std::string out;
  z_stream z{};
  if (inflateInit2(&z, 15 + 16) != Z_OK) return Status::IOError(path + ": cannot start gzip decoder");
  z.next_in = reinterpret_cast<Bytef*>(const_cast<char*>(bytes.data()));
  std::size_t left = bytes.size();
  char buf[65536];
  int rc = Z_OK;
  for (;;) {
    if (z.avail_in == 0 && left > 0) {
      const auto chunk = static_cast<uInt>(std::min<std::size_t>(left, 1u << 30));
      z.avail_in = chunk;
      left -= chunk;
    }
    z.next_out = reinterpret_cast<Bytef*>(buf);
    z.avail_out = sizeof buf;
    rc = inflate(&z, Z_NO_FLUSH);
    out.append(buf, sizeof buf - z.avail_out);
    if (max_unpacked > 0 && static_cast<std::int64_t>(out.size()) > max_unpacked) {
      inflateEnd(&z);
      return Status::Limit(path + ": gzip data expands past " + std::to_string(max_unpacked) +
                           " bytes (limit on unpacked size)");
    }
    if (rc == Z_STREAM_END) {
      if (z.avail_in == 0 && left == 0) break;
      inflateReset(&z);  // another member follows
      continue;
    }
    if (rc != Z_OK) {
      const std::string why = z.msg != nullptr ? z.msg : "truncated";
      inflateEnd(&z);
      return Status::Corruption(path + ": damaged gzip data (" + why + ")");
    }
    if (z.avail_in == 0 && left == 0 && z.avail_out != 0) {
      inflateEnd(&z);
      return Status::Corruption(path + ": damaged gzip data (truncated)");
    }
  }
  inflateEnd(&z);
  return out;
}

}  // namespace lode::ingest
