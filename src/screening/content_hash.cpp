// The content key of a judgment (lode/screening.h).
#include <cstdio>

#include "lode/screening.h"

namespace lode {

Result<std::string> content_hash(IndexReader& reader, DocId doc) {
  std::uint64_t h = 0xcbf29ce484222325ull;  // FNV-1a 64 offset basis
  auto mix = [&h](std::string_view s) {
    for (unsigned char c : s) {
      h ^= c;
      h *= 0x100000001b3ull;  // FNV-1a 64 prime
    }
  };
  for (Field f : kAllFields) {
    auto text = reader.stored_text(doc, f);
    if (!text) return text.status();
    mix(*text);
    if (f == Field::kTitle) mix(std::string_view("\0", 1));
  }
  char out[17];
  std::snprintf(out, sizeof out, "%016llx", static_cast<unsigned long long>(h));
  return std::string(out);
}

}  // namespace lode
