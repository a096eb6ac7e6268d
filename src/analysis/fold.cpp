// NFKC case folding of one word (see segment.h).
#include <unicode/bytestream.h>
#include <unicode/normalizer2.h>

#include "analysis/segment.h"

namespace lode::analysis {

void fold(std::string_view in, std::string& out) {
  bool ascii = true;
  for (const char c : in) ascii &= static_cast<unsigned char>(c) < 0x80;
  if (ascii) {
    // nfkc_cf maps ASCII to itself except A-Z -> a-z.
    out.assign(in);
    for (char& c : out) {
      if (c >= 'A' && c <= 'Z') c = static_cast<char>(c + ('a' - 'A'));
    }
    return;
  }
  out.clear();
  UErrorCode status = U_ZERO_ERROR;
  // A process-wide immutable singleton owned by ICU; safe from any thread.
  const icu::Normalizer2* nfkc_cf = icu::Normalizer2::getNFKCCasefoldInstance(status);
  if (U_FAILURE(status)) {  // defensive: ICU data missing; keep the word as is
    out.assign(in);
    return;
  }
  icu::StringByteSink<std::string> sink(&out);
  nfkc_cf->normalizeUTF8(0, icu::StringPiece(in.data(), static_cast<int32_t>(in.size())), sink,
                         nullptr, status);
  if (U_FAILURE(status)) out.assign(in);  // defensive, as above
}

}  // namespace lode::analysis
