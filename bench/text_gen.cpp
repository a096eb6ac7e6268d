// English-like document generation (see text_gen.h).
#include "text_gen.h"

namespace lode::bench {
namespace {

void capitalise(std::string& s, std::size_t at) {
  if (at < s.size() && s[at] >= 'a' && s[at] <= 'z') s[at] = static_cast<char>(s[at] - 'a' + 'A');
}

void number(Rng& rng, std::string& out) {
  const double r = rng.uniform();
  if (r < 0.4) out += std::to_string(1700 + rng.below(330));  // a year
  else if (r < 0.8) out += std::to_string(rng.between(2, 500));  // a count
  else {  // a decimal; one draw per statement (operand order is unspecified)
    out += std::to_string(rng.below(100));
    out += '.';
    out += std::to_string(rng.below(10));
  }
}

}  // namespace

void TextGenerator::word(Rng& rng, std::string& out) const {
  if (rng.chance(opt_.number_rate)) return number(rng, out);
  if (rng.chance(opt_.novel_rate)) {
    const std::size_t at = out.size();
    out += Vocabulary::invent_word(rng, opt_.accented_share);
    if (rng.chance(0.5)) capitalise(out, at);  // half of the long tail are names
    return;
  }
  const std::size_t rank = vocab_.sample_rank(rng);
  const Lemma& l = vocab_.lemma(rank);
  const std::size_t at = out.size();
  out += vocab_.sample_form(rank, rng);
  if (l.cls == WordClass::kCommon) return;
  if (rng.chance(opt_.name_rate)) capitalise(out, at);
  if (l.cls == WordClass::kNoun && out.back() != 's' && rng.chance(opt_.possessive_rate)) out += "'s";
}

void TextGenerator::sentence(Rng& rng, std::string& out) const {
  std::size_t words = rng.between(5, 12);
  words += rng.below(17);  // 5..28 words, mean ~16.5
  const std::size_t first = out.size();
  for (std::size_t i = 0; i < words; ++i) {
    if (i > 0) {
      if (rng.chance(opt_.dash_rate)) out += " \u2014 ";
      else out += ' ';
    }
    word(rng, out);
    if (i + 1 < words && i > 1 && rng.chance(opt_.comma_rate)) out += ',';
  }
  capitalise(out, first);
  const double r = rng.uniform();
  out += r < 0.90 ? '.' : r < 0.96 ? '?' : '!';
}

void TextGenerator::title(Rng& rng, std::string& out) const {
  const std::size_t words = rng.between(3, 8);
  for (std::size_t i = 0; i < words; ++i) {
    if (i > 0) out += ' ';
    const std::size_t at = out.size();
    const std::size_t rank = vocab_.sample_rank(rng);
    out += vocab_.sample_form(rank, rng);
    if (i == 0 || vocab_.lemma(rank).cls != WordClass::kCommon) capitalise(out, at);
  }
  out += "\n\n";
}

void TextGenerator::wrap_into(const std::string& paragraph, std::string& out) const {
  std::size_t line_start = 0;  // in paragraph
  while (paragraph.size() - line_start > opt_.wrap_columns) {
    std::size_t cut = paragraph.rfind(' ', line_start + opt_.wrap_columns);
    if (cut == std::string::npos || cut <= line_start) cut = paragraph.find(' ', line_start + opt_.wrap_columns);
    if (cut == std::string::npos) break;
    out.append(paragraph, line_start, cut - line_start);
    out += '\n';
    line_start = cut + 1;
  }
  out.append(paragraph, line_start, std::string::npos);
  out += '\n';
}

void TextGenerator::document(std::size_t target_bytes, Rng& rng, std::string& out) const {
  const std::size_t start = out.size();
  title(rng, out);
  std::string paragraph;
  bool first = true;
  while (out.size() - start < target_bytes) {
    paragraph.clear();
    const std::size_t sentences = rng.between(2, 7);
    for (std::size_t s = 0; s < sentences; ++s) {
      if (s > 0) paragraph += ' ';
      sentence(rng, paragraph);
    }
    if (!first) out += '\n';  // blank line between paragraphs (the title has its own)
    first = false;
    wrap_into(paragraph, out);
  }
}

}  // namespace lode::bench
