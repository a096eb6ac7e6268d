// UTF-8 validation and repair.
// Sources: The Unicode Standard 15.0, section 3.9, Table 3-7 (well-formed
// byte sequences) and "U+FFFD Substitution of Maximal Subparts" (Table 3-8);
// ICU's UTF-8 -> UTF-16 conversion as an independent implementation.
#include <doctest/doctest.h>
#include <unicode/ustring.h>

#include <random>
#include <string>

#include "lode/analysis.h"

namespace {

const std::string kFffd = "\xEF\xBF\xBD";

// ICU's conversion with U+FFFD substitution, back to UTF-8.
std::string icu_repair(const std::string& bytes) {
  UErrorCode st = U_ZERO_ERROR;
  std::u16string u16(bytes.size() + 1, u'\0');
  int32_t len = 0;
  u_strFromUTF8WithSub(u16.data(), static_cast<int32_t>(u16.size()), &len, bytes.data(),
                       static_cast<int32_t>(bytes.size()), 0xFFFD, nullptr, &st);
  REQUIRE(U_SUCCESS(st));
  std::string out(static_cast<std::size_t>(len) * 3 + 1, '\0');
  int32_t out_len = 0;
  u_strToUTF8(out.data(), static_cast<int32_t>(out.size()), &out_len, u16.data(), len, &st);
  REQUIRE(U_SUCCESS(st));
  out.resize(static_cast<std::size_t>(out_len));
  return out;
}

}  // namespace

TEST_CASE("utf8: valid text is returned unchanged") {
  // Boundaries of Table 3-7: U+0000, U+007F, U+0080, U+07FF, U+0800, U+D7FF,
  // U+E000, U+FFFF, U+10000, U+10FFFF are all well-formed.
  const std::string ok = std::string("\x00\x7F", 2) + "\xC2\x80\xDF\xBF\xE0\xA0\x80\xED\x9F\xBF" +
                         "\xEE\x80\x80\xEF\xBF\xBF\xF0\x90\x80\x80\xF4\x8F\xBF\xBF" +
                         "plain ASCII that is longer than eight bytes";
  CHECK(lode::is_valid_utf8(ok));
  const lode::Utf8Repair r = lode::repair_utf8(ok);
  CHECK(r.text == ok);
  CHECK(r.replaced == 0);
  CHECK(r.first_bad_offset == 0);
  CHECK(lode::is_valid_utf8(""));
}

TEST_CASE("utf8: each class of ill-formed sequence is replaced") {
  struct Case {
    const char* what;
    std::string in;
    std::string out;
    std::size_t replaced;
    std::size_t first_bad;
  };
  // Expected outputs follow the maximal-subpart rule of Unicode 15.0 section 3.9.
  const Case cases[] = {
      {"overlong 2-byte (C0 80 = U+0000)", "a\xC0\x80z", "a" + kFffd + kFffd + "z", 2, 1},
      {"overlong 3-byte (E0 80 80)", "a\xE0\x80\x80z", "a" + kFffd + kFffd + kFffd + "z", 3, 1},
      {"overlong 4-byte (F0 80 80 80)", "\xF0\x80\x80\x80", kFffd + kFffd + kFffd + kFffd, 4, 0},
      {"surrogate U+D800 (ED A0 80)", "x\xED\xA0\x80", "x" + kFffd + kFffd + kFffd, 3, 1},
      {"above U+10FFFF (F4 90 80 80)", "\xF4\x90\x80\x80!", kFffd + kFffd + kFffd + kFffd + "!", 4, 0},
      {"lead byte F5 never valid", "ab\xF5\x80", "ab" + kFffd + kFffd, 2, 2},
      {"lone continuation byte", "ab\x80" "cd", "ab" + kFffd + "cd", 1, 2},
      {"truncated 3-byte at end (E2 82)", "euro \xE2\x82", "euro " + kFffd, 1, 5},
      {"truncated 4-byte before ASCII", "\xF0\x9F\x98" "a", kFffd + "a", 1, 0},
      {"FE and FF bytes", "\xFE\xFF", kFffd + kFffd, 2, 0},
  };
  for (const Case& c : cases) {
    CAPTURE(c.what);
    CHECK_FALSE(lode::is_valid_utf8(c.in));
    const lode::Utf8Repair r = lode::repair_utf8(c.in);
    CHECK(r.text == c.out);
    CHECK(r.replaced == c.replaced);
    CHECK(r.first_bad_offset == c.first_bad);
    CHECK(lode::is_valid_utf8(r.text));
  }
}

TEST_CASE("utf8: the worked example of maximal subparts") {
  // Unicode 15.0 section 3.9, Table 3-8 (recalled from memory; ICU below
  // confirms it): 61 F1 80 80 E1 80 C2 62 80 63 80 BF 64 ->
  // a FFFD FFFD FFFD b FFFD c FFFD FFFD d.
  const std::string in = "\x61\xF1\x80\x80\xE1\x80\xC2\x62\x80\x63\x80\xBF\x64";
  const std::string want = "a" + kFffd + kFffd + kFffd + "b" + kFffd + "c" + kFffd + kFffd + "d";
  CHECK(lode::repair_utf8(in).text == want);
  CHECK(icu_repair(in) == want);
}

TEST_CASE("utf8: repair agrees with ICU on random bytes") {
  // ICU >= 60 substitutes maximal subparts too (independent implementation).
  std::mt19937 rng(20240501);
  // Bytes drawn mostly from lead/continuation ranges so errors are frequent.
  const unsigned char pool[] = {'a', ' ', 0x80, 0x8F, 0x90, 0x9F, 0xA0, 0xBF, 0xC0, 0xC1, 0xC2,
                                0xDF, 0xE0, 0xE1, 0xED, 0xEE, 0xEF, 0xF0, 0xF1, 0xF4, 0xF5, 0xFF};
  std::uniform_int_distribution<std::size_t> pick(0, sizeof(pool) - 1);
  std::uniform_int_distribution<int> length(0, 24);
  int disagreements = 0;
  for (int i = 0; i < 20000; ++i) {
    std::string s;
    for (int n = length(rng); n > 0; --n) s.push_back(static_cast<char>(pool[pick(rng)]));
    const lode::Utf8Repair r = lode::repair_utf8(s);
    if (r.text != icu_repair(s) || lode::is_valid_utf8(s) != (r.replaced == 0)) ++disagreements;
  }
  CHECK(disagreements == 0);
}
