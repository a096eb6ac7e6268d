// Inline Markdown stripping in three linear passes over one line:
//   1. code spans: backtick runs paired with the next run of the same length;
//   2. brackets and parentheses paired with a stack (outside code spans), so
//      "[text](url)" is recognised without searching forward from each '[';
//   3. the output scan, which drops markup and jumps over link destinations.
// Each pass touches each byte a bounded number of times, whatever the input:
// no backtracking and no recursion, so deep nesting costs heap, not stack.
#include <algorithm>
#include <unordered_map>
#include <vector>

#include "ingest/markdown_inline.h"

namespace lode::ingest {
namespace {

constexpr std::size_t npos = std::string_view::npos;

bool is_ascii_punct(char c) {
  return (c >= '!' && c <= '/') || (c >= ':' && c <= '@') || (c >= '[' && c <= '`') ||
         (c >= '{' && c <= '~');
}
bool is_blank(char c) { return c == ' ' || c == '\t'; }
bool is_letter(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'); }
// Letters of other scripts count as word characters (their UTF-8 bytes are >= 0x80).
bool is_word(char c) {
  return is_letter(c) || (c >= '0' && c <= '9') || static_cast<unsigned char>(c) >= 0x80;
}

struct CodeSpan {
  std::size_t open;           // first backtick of the opening run
  std::size_t content_begin;  // after the opening run
  std::size_t content_end;    // the closing run's first backtick
  std::size_t end;            // after the closing run
};

// Pass 1. A backslash-escaped backtick neither opens nor closes a span.
std::vector<CodeSpan> find_code_spans(std::string_view s) {
  struct Run {
    std::size_t pos, len;
  };
  std::vector<Run> runs;
  for (std::size_t i = 0; i < s.size();) {
    if (s[i] == '\\' && i + 1 < s.size() && is_ascii_punct(s[i + 1])) {
      i += 2;
    } else if (s[i] == '`') {
      std::size_t e = i;
      while (e < s.size() && s[e] == '`') ++e;
      runs.push_back({i, e - i});
      i = e;
    } else {
      ++i;
    }
  }
  std::vector<CodeSpan> spans;
  if (runs.size() < 2) return spans;
  // next_same[k]: the next run with run k's length, found right to left.
  std::vector<std::size_t> next_same(runs.size(), npos);
  std::unordered_map<std::size_t, std::size_t> seen;  // length -> run index
  for (std::size_t k = runs.size(); k-- > 0;) {
    auto [it, fresh] = seen.try_emplace(runs[k].len, k);
    if (!fresh) {
      next_same[k] = it->second;
      it->second = k;
    }
  }
  for (std::size_t k = 0; k < runs.size();) {
    const std::size_t m = next_same[k];
    if (m == npos) {
      ++k;
      continue;
    }
    spans.push_back({runs[k].pos, runs[k].pos + runs[k].len, runs[m].pos, runs[m].pos + runs[m].len});
    k = m + 1;
  }
  return spans;
}

// Pass 2. partner[i] is the index of the bracket or parenthesis matching the
// one at i (npos when unmatched); only set for '[' and '('.
std::vector<std::size_t> pair_brackets(std::string_view s, const std::vector<CodeSpan>& spans) {
  std::vector<std::size_t> partner(s.size(), npos);
  std::vector<std::size_t> squares, rounds;
  std::size_t span = 0;
  for (std::size_t i = 0; i < s.size();) {
    if (span < spans.size() && spans[span].open == i) {
      i = spans[span++].end;
      continue;
    }
    const char c = s[i];
    if (c == '\\' && i + 1 < s.size() && is_ascii_punct(s[i + 1])) {
      i += 2;
      continue;
    }
    if (c == '[') squares.push_back(i);
    if (c == '(') rounds.push_back(i);
    if (c == ']' && !squares.empty()) {
      partner[squares.back()] = i;
      squares.pop_back();
    }
    if (c == ')' && !rounds.empty()) {
      partner[rounds.back()] = i;
      rounds.pop_back();
    }
    ++i;
  }
  return partner;
}

// Tags that sit inside a word ("<em>x</em>y" reads "xy"); any other tag
// separates words, so it becomes a space.
bool is_inline_tag(std::string_view name) {
  static constexpr std::string_view kInline[] = {"a",   "abbr", "b",    "code", "em",  "i",
                                                 "kbd", "mark", "s",    "small", "span", "strong",
                                                 "sub", "sup",  "u",    "del",  "ins", "q"};
  std::string lower(name);
  for (char& ch : lower) ch = static_cast<char>(ch >= 'A' && ch <= 'Z' ? ch + 32 : ch);
  return std::find(std::begin(kInline), std::end(kInline), lower) != std::end(kInline);
}

class Stripper {
 public:
  explicit Stripper(std::string_view s)
      : s_(s), spans_(find_code_spans(s)),
        partner_(s.find_first_of("[(") == npos ? std::vector<std::size_t>() : pair_brackets(s, spans_)) {
    out_.text.reserve(s.size());
  }

  InlineText run() {
    std::size_t span = 0;
    for (std::size_t i = 0; i < s_.size();) {
      while (span < spans_.size() && spans_[span].open < i) ++span;
      if (span < spans_.size() && spans_[span].open == i) {
        code_span(spans_[span]);
        i = spans_[span++].end;
        continue;
      }
      i = step(i);
      if (out_.comment_open) break;
    }
    return std::move(out_);
  }

 private:
  // Emits the markup-free text for position i; returns the next position.
  std::size_t step(std::size_t i) {
    const char c = s_[i];
    switch (c) {
      case '\\':
        if (i + 1 < s_.size() && is_ascii_punct(s_[i + 1])) return emit(s_[i + 1], i + 2);
        if (i + 1 == s_.size()) return i + 1;  // hard line break marker
        return emit(c, i + 1);
      case '!':
        if (i + 1 < s_.size() && s_[i + 1] == '[' && link_at(i + 1)) return i + 1;  // image
        return emit(c, i + 1);
      case '[':
        return link_at(i) ? i + 1 : emit(c, i + 1);
      case ']':
        if (const auto j = jumps_.find(i); j != jumps_.end()) return j->second;
        return emit(c, i + 1);
      case '<': return angle(i);
      case '&': {
        Entity e = match_entity(s_.substr(i));
        if (e.length == 0) return emit(c, i + 1);
        out_.text += e.text;
        return i + e.length;
      }
      case '*':
      case '_':
      case '~': return delimiter_run(i);
      default: return emit(c, i + 1);
    }
  }

  std::size_t emit(char c, std::size_t next) {
    out_.text += c;
    return next;
  }

  // "`` a ``" -> "a": one space is trimmed each side when both are present.
  void code_span(const CodeSpan& cs) {
    std::string_view body = s_.substr(cs.content_begin, cs.content_end - cs.content_begin);
    if (body.size() >= 2 && body.front() == ' ' && body.back() == ' ' &&
        body.find_first_not_of(' ') != npos) {
      body = body.substr(1, body.size() - 2);
    }
    out_.text += body;
  }

  // True when the '[' at i opens a link: "[text](dest)" or "[text][label]".
  // Records where to resume once the link text has been emitted.
  bool link_at(std::size_t i) {
    if (partner_.empty()) return false;
    const std::size_t close = partner_[i];
    if (close == npos || close + 1 >= s_.size()) return false;
    const char next = s_[close + 1];
    if ((next != '(' && next != '[') || partner_[close + 1] == npos) return false;
    jumps_[close] = partner_[close + 1] + 1;
    return true;
  }

  // '<': comment, autolink (address kept), tag (dropped) or a plain '<'.
  std::size_t angle(std::size_t i) {
    if (s_.substr(i, 4) == "<!--") {
      const std::size_t close = s_.find("-->", i + 4);
      if (close == npos) {
        out_.comment_open = true;
        return s_.size();
      }
      return close + 3;
    }
    // The candidate ends at the next '>' with no '<' before it. A scan that
    // fails stops at that '<', where the next attempt starts, and no '<' lies
    // inside a scanned range: the scans never overlap, the line stays linear.
    std::size_t gt = i + 1;
    while (gt < s_.size() && s_[gt] != '>' && s_[gt] != '<') ++gt;
    if (gt == s_.size() || s_[gt] == '<') return emit('<', i + 1);
    const std::string_view inner = s_.substr(i + 1, gt - i - 1);
    if (is_autolink(inner)) {
      out_.text += inner;
      return gt + 1;
    }
    const bool special = !inner.empty() && (inner[0] == '!' || inner[0] == '?');  // <!DOCTYPE>, <?pi?>
    const std::size_t n = !inner.empty() && (inner[0] == '/' || special) ? 1 : 0;
    if (!special && (n >= inner.size() || !is_letter(inner[n]))) return emit('<', i + 1);  // "a < b"
    std::size_t name_end = n;
    while (name_end < inner.size() && is_scheme_char(inner[name_end]) && inner[name_end] != '+' &&
           inner[name_end] != '.') {
      ++name_end;  // tag names: letters, digits, '-'
    }
    if (!is_inline_tag(inner.substr(n, name_end - n)) && !out_.text.empty() && out_.text.back() != ' ') {
      out_.text += ' ';
    }
    return gt + 1;
  }

  static bool is_scheme_char(char ch) {
    return is_letter(ch) || (ch >= '0' && ch <= '9') || ch == '+' || ch == '.' || ch == '-';
  }

  // "<https://example.org/x>" or "<someone@example.org>".
  static bool is_autolink(std::string_view inner) {
    if (inner.empty() || inner.find_first_of(" \t") != npos) return false;
    // Scheme: a letter, then 1-31 letters, digits, '+', '.' or '-', then ':'.
    const std::size_t colon = inner.find(':');
    if (colon != npos && colon >= 2 && colon <= 32 && is_letter(inner[0]) &&
        std::all_of(inner.begin(), inner.begin() + static_cast<std::ptrdiff_t>(colon), is_scheme_char)) {
      return true;
    }
    const std::size_t at = inner.find('@');
    return at != npos && at > 0 && inner.find('.', at) != npos && inner.back() != '.';
  }

  // Runs of '*', '_' (emphasis) and '~~' (strike-through). A run is markup
  // when it touches a word on one side; '_' inside a word (snake_case) and
  // a lone '~' are kept, as are runs with blanks on both sides ("2 * 3").
  std::size_t delimiter_run(std::size_t i) {
    const char c = s_[i];
    std::size_t e = i;
    while (e < s_.size() && s_[e] == c) ++e;
    const char before = i > 0 ? s_[i - 1] : ' ';
    const char after = e < s_.size() ? s_[e] : ' ';
    const bool opens = !is_blank(after);
    const bool closes = !is_blank(before);
    bool markup = opens || closes;
    if (c == '_') markup = (opens && !is_word(before)) || (closes && !is_word(after));
    if (c == '~') markup = markup && e - i >= 2;
    if (!markup) out_.text.append(s_.substr(i, e - i));
    return e;
  }

  std::string_view s_;
  std::vector<CodeSpan> spans_;
  std::vector<std::size_t> partner_;
  std::unordered_map<std::size_t, std::size_t> jumps_;  // link's ']' -> resume position
  InlineText out_;
};

}  // namespace

InlineText strip_inline(std::string_view line) { return Stripper(line).run(); }

}  // namespace lode::ingest
