// Reading entries of a zip container held in memory (private to
// src/ingest/), for DOCX, ODT and EPUB. libzip does the format; this wrapper
// adds the limits: the bytes all entries expand to are counted against one
// budget, read in chunks, so a zip bomb is stopped whatever sizes it claims.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::ingest {

class ZipArchive {
 public:
  // Opens the container. Corruption naming `path` and libzip's reason when
  // the bytes are not a readable zip. `max_unpacked` (0 = none) is the budget
  // for everything read() returns over the archive's life.
  // REQUIRES: `bytes` outlives the archive.
  static Result<std::unique_ptr<ZipArchive>> open(std::string_view bytes, const std::string& path,
                                                  std::int64_t max_unpacked);
  ~ZipArchive();
  ZipArchive(const ZipArchive&) = delete;
  ZipArchive& operator=(const ZipArchive&) = delete;

  bool has(const std::string& name) const;
  // The entry's content. NotFound when absent; Unsupported when encrypted
  // ("password-protected"); Corruption when it does not inflate; Limit
  // ("expands past N bytes") when the budget runs out.
  Result<std::string> read(const std::string& name);

 private:
  struct Impl;
  explicit ZipArchive(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

}  // namespace lode::ingest
