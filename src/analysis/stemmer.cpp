// libstemmer wrapper (see stemmer.h).
#include "analysis/stemmer.h"

#include <libstemmer.h>

#include <algorithm>
#include <climits>

namespace lode::analysis {

std::vector<std::string> snowball_algorithms() {
  std::vector<std::string> names;
  for (const char** p = sb_stemmer_list(); *p != nullptr; ++p) {
    // Keep only the algorithms built with a UTF-8 variant.
    if (sb_stemmer* s = sb_stemmer_new(*p, "UTF_8")) {
      sb_stemmer_delete(s);
      names.emplace_back(*p);
    }
  }
  std::sort(names.begin(), names.end());
  return names;
}

void Stemmer::Close::operator()(sb_stemmer* s) const { sb_stemmer_delete(s); }

Result<Stemmer> Stemmer::open(std::string_view language) {
  Stemmer out;
  if (language == "none") return out;
  const std::vector<std::string> known = snowball_algorithms();
  if (std::find(known.begin(), known.end(), language) == known.end()) {
    std::string list;
    for (const std::string& k : known) list += (list.empty() ? "" : ", ") + k;
    return Status::InvalidArgument("analysis: unknown language '" + std::string(language) +
                                   "' (known: " + list + ", none)");
  }
  out.stemmer_.reset(sb_stemmer_new(std::string(language).c_str(), "UTF_8"));
  if (!out.stemmer_) {  // defensive: listed but failed, i.e. out of memory
    return Status::InvalidArgument("analysis: libstemmer could not open language '" +
                                   std::string(language) + "'");
  }
  return out;
}

std::string_view Stemmer::stem(std::string_view word) {
  if (!stemmer_ || word.size() > static_cast<std::size_t>(INT_MAX)) return word;
  const sb_symbol* s = sb_stemmer_stem(stemmer_.get(), reinterpret_cast<const sb_symbol*>(word.data()),
                                       static_cast<int>(word.size()));
  if (s == nullptr) return word;  // libstemmer's out-of-memory signal
  return {reinterpret_cast<const char*>(s), static_cast<std::size_t>(sb_stemmer_length(stemmer_.get()))};
}

}  // namespace lode::analysis
