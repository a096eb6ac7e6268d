// Choosing a stopword list for a Snowball algorithm (see stopwords.h).
#include "analysis/stopwords.h"

namespace lode::analysis {

const StopwordFile* stopword_file_for(std::string_view language) {
  // Variant algorithms of one language share its list.
  if (language == "porter" || language == "lovins") language = "english";
  if (language == "german2") language = "german";
  if (language == "kraaij_pohlmann") language = "dutch";
  for (std::size_t i = 0; i < kStopwordFileCount; ++i) {
    if (kStopwordFiles[i].name == language) return &kStopwordFiles[i];
  }
  return nullptr;
}

}  // namespace lode::analysis
