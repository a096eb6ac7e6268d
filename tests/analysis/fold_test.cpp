// NFKC case folding of words.
// Sources: Unicode 15.0 CaseFolding.txt (status F/C mappings) and
// UnicodeData.txt (<compat>, <wide> decompositions) as applied by
// ICU's Normalizer2 NFKC_Casefold.
#include <doctest/doctest.h>

#include <string>

#include "lode/analysis.h"

namespace {

std::string fold1(const std::string& word) {
  lode::AnalyzerOptions o;
  o.language = "none";
  auto a = lode::Analyzer::create(o);
  REQUIRE(a.ok());
  const auto w = a.value()->words(word);
  REQUIRE(w.size() == 1);
  return w[0].term;
}

}  // namespace

TEST_CASE("fold: NFKC case folding examples") {
  CHECK(fold1("Straße") == "strasse");          // CaseFolding.txt: 00DF; F; 0073 0073
  CHECK(fold1("ﬁle") == "file");                // UnicodeData.txt: FB01 <compat> 0066 0069
  CHECK(fold1("ＡＢＣ") == "abc");               // UnicodeData.txt: FF21 <wide> 0041, then C
  CHECK(fold1("１２３") == "123");               // FF11 <wide> 0031
  CHECK(fold1("İ") == "i\xCC\x87");             // CaseFolding.txt: 0130; F; 0069 0307
  CHECK(fold1("ΣΊΣΥΦΟΣ") == "σίσυφοσ");         // 03A3; C; 03C3 (no final-sigma form)
  CHECK(fold1("cafe\xCC\x81") == "café");       // NFC composition: 0065 0301 -> 00E9
  CHECK(fold1("HELLO") == "hello");             // ASCII shortcut agrees with C mappings
  CHECK(fold1("soft\xC2\xADhyphen") == "softhyphen");  // 00AD is Default_Ignorable: removed
}
