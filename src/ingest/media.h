// Binary and media files: recognised so the indexer skips them quietly
// instead of reporting a failure (private to src/ingest/).
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace lode::ingest {

// "image (.png)" when the file name's extension (case-insensitive) is one of
// a media, archive, font or program kind no reader handles; else nullopt.
// Decided from the name alone, so such a file is never opened, whatever its size.
std::optional<std::string> media_by_extension(std::string_view name);

// "image (PNG signature)" when `head`, the file's first bytes, starts with
// the signature of a media, archive, database or program format no reader
// handles; else nullopt. Formats lode reads (PDF, zip containers, gzip) are
// never reported. Signatures from the formats' own specifications.
std::optional<std::string> media_by_signature(std::string_view head);

}  // namespace lode::ingest
