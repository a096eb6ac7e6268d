// Test helpers for JsonlStream (lode/ingest.h), shared by the ingest and
// formats suites: read a stream to its end, and compare what it gave with
// what read_file gives for the same file.
#pragma once

#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "lode/ingest.h"

namespace lode::testing {

struct Streamed {
  std::vector<Document> documents;
  Status error;         // the first failing next(), if any; then `finish` is unset
  ReadResult finish{};  // stream.finish(), once next() returned no document
};

// Reads the rest of `stream` in slices of `slice` bytes.
inline Streamed read_rest(JsonlStream& stream, std::size_t slice) {
  Streamed out;
  for (;;) {
    auto part = stream.next(slice);
    if (!part.ok()) {
      out.error = part.status();
      return out;
    }
    if (part->empty()) break;
    for (auto& d : *part) out.documents.push_back(std::move(d));
  }
  out.finish = stream.finish();
  CHECK(out.finish.size == stream.bytes_read());
  return out;
}

// Opens `path` and reads all of it; the stream must not fail.
inline Streamed read_streamed(const std::string& path, std::size_t slice, const ReadOptions& options = {}) {
  auto stream = JsonlStream::open(path, options);
  REQUIRE_MESSAGE(stream.ok(), stream.status().to_string());
  Streamed out = read_rest(**stream, slice);
  REQUIRE_MESSAGE(out.error.ok(), out.error.to_string());
  return out;
}

// The stream gave what read_file gave: records, warnings, hash, size, mtime.
inline void check_same_as_whole(const Streamed& s, const ReadResult& whole) {
  REQUIRE(s.documents.size() == whole.documents.size());
  for (std::size_t i = 0; i < s.documents.size(); ++i) {
    CHECK(s.documents[i].external_id == whole.documents[i].external_id);
    CHECK(s.documents[i].title == whole.documents[i].title);
    CHECK(s.documents[i].body == whole.documents[i].body);
    CHECK(s.documents[i].kind == "jsonl");
  }
  CHECK(s.finish.warnings == whole.warnings);
  CHECK(s.finish.content_hash == whole.content_hash);
  CHECK(s.finish.size == whole.size);
  CHECK(s.finish.mtime_ns == whole.mtime_ns);
  CHECK(s.finish.documents.empty());
}

}  // namespace lode::testing
