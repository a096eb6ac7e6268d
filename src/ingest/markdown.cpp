// Markdown to plain text, block level: one pass over the lines with a little
// state (inside a code fence, an HTML comment, a table; whether the previous
// line was paragraph text, for setext headings). Each line's content then goes
// through strip_inline(). Not a CommonMark parser: the goal is the words a
// reader sees, in order, with no markup and no URLs, for any input, in time
// linear in its size.
#include <string>
#include <utility>
#include <vector>

#include "ingest/markdown_inline.h"
#include "ingest/front_matter.h"
#include "ingest/readers.h"
#include "ingest/text_util.h"
#include "lode/ingest.h"

namespace lode {
namespace {

using ingest::FrontMatter;
using ingest::front_matter;
using ingest::make_title;
using ingest::split_lines;
using ingest::trim;
using ingest::trim_left;

bool all_of_chars(std::string_view s, std::string_view allowed) {
  return s.find_first_not_of(allowed) == std::string_view::npos;
}

// "---", "***", "___", "- - -": three or more of one marker, blanks between.
bool is_thematic_break(std::string_view t) {
  t = trim(t);
  if (t.empty() || (t[0] != '-' && t[0] != '*' && t[0] != '_')) return false;
  std::size_t marks = 0;
  for (const char c : t) {
    if (c == t[0]) {
      ++marks;
    } else if (c != ' ' && c != '\t') {
      return false;
    }
  }
  return marks >= 3;
}

// A setext underline: only '=' or only '-' (one or more), blanks around.
bool is_setext_underline(std::string_view line) {
  const std::string_view t = trim(line);
  return !t.empty() && (all_of_chars(t, "=") || all_of_chars(t, "-"));
}

// A table delimiter row such as "|---|:--:|" or "--- | ---".
bool is_delimiter_row(std::string_view t) {
  t = trim(t);
  return t.find('|') != std::string_view::npos && t.find('-') != std::string_view::npos &&
         all_of_chars(t, "|-: \t");
}

// Length of a list marker ("- ", "* ", "+ ", "12. ", "3) ") at the start of
// `t`, with the blanks after it; 0 when there is none.
std::size_t list_marker(std::string_view t) {
  std::size_t n = 0;
  if (!t.empty() && (t[0] == '-' || t[0] == '*' || t[0] == '+')) {
    n = 1;
  } else {
    while (n < t.size() && n < 9 && t[n] >= '0' && t[n] <= '9') ++n;
    if (n == 0 || n >= t.size() || (t[n] != '.' && t[n] != ')')) return 0;
    ++n;
  }
  if (n < t.size() && t[n] != ' ' && t[n] != '\t') return 0;
  while (n < t.size() && (t[n] == ' ' || t[n] == '\t')) ++n;
  // Task list box: "[ ] " or "[x] ".
  if (t.size() >= n + 3 && t[n] == '[' && t[n + 2] == ']' &&
      (t[n + 1] == ' ' || t[n + 1] == 'x' || t[n + 1] == 'X') &&
      (t.size() == n + 3 || t[n + 3] == ' ' || t[n + 3] == '\t')) {
    n += 3;
  }
  return n;
}

struct Heading {
  int level = 0;          // 1-6; 0: not an ATX heading
  std::string_view text;  // without the '#' marks
};

// "## Title ##" -> {2, "Title"}; "#hashtag" is no heading.
Heading atx_heading(std::string_view t) {
  std::size_t n = 0;
  while (n < t.size() && t[n] == '#') ++n;
  if (n == 0 || n > 6 || (n < t.size() && t[n] != ' ' && t[n] != '\t')) return {};
  std::string_view rest = trim(t.substr(n));
  // Optional closing sequence, which must follow a blank.
  std::size_t end = rest.size();
  while (end > 0 && rest[end - 1] == '#') --end;
  if (end == 0 || rest[end - 1] == ' ' || rest[end - 1] == '\t') rest = trim(rest.substr(0, end));
  return Heading{static_cast<int>(n), rest};
}

// Opening code fence: 3+ backticks or tildes. Returns the run (char, length).
std::string_view fence_run(std::string_view t) {
  if (t.empty() || (t[0] != '`' && t[0] != '~')) return {};
  std::size_t n = 0;
  while (n < t.size() && t[n] == t[0]) ++n;
  if (n < 3) return {};
  // A backtick fence's info string may not hold a backtick (that is inline code).
  if (t[0] == '`' && t.find('`', n) != std::string_view::npos) return {};
  return t.substr(0, n);
}

bool closes_fence(std::string_view line, std::string_view open) {
  const std::string_view t = trim(line);
  return t.size() >= open.size() && all_of_chars(t, open.substr(0, 1));
}

// "[label]: destination": a link reference definition, dropped whole.
bool is_reference_definition(std::string_view t) {
  if (t.size() < 4 || t[0] != '[' || t[1] == ']') return false;
  const std::size_t close = t.find("]:");
  return close != std::string_view::npos && t.substr(1, close - 1).find('[') == std::string_view::npos;
}

// The line-by-line pass. One instance per document.
class BlockPass {
 public:
  explicit BlockPass(std::string_view markdown) : lines_(split_lines(markdown)) {
    doc_.kind = "markdown";
  }

  Document run() {
    const FrontMatter fm = front_matter(lines_);
    set_title(fm.title);
    doc_.author = fm.author;
    doc_.date = fm.date;
    for (std::size_t li = fm.body_start; li < lines_.size(); ++li) line(li);
    // Blank lines at either end carry nothing.
    std::string& body = doc_.body;
    const std::size_t last = body.find_last_not_of(" \t\n");
    body.erase(last == std::string::npos ? 0 : last + 1);
    const std::size_t lead = body.find_first_not_of('\n');
    body.erase(0, lead == std::string::npos ? body.size() : lead);
    return std::move(doc_);
  }

 private:
  void set_title(std::string_view text) {
    if (!doc_.title.empty()) return;
    doc_.title = make_title(text);
  }

  void blank() {
    doc_.body += '\n';
    prev_paragraph_ = in_table_ = false;
  }

  void line(std::size_t li) {
    std::string_view line = lines_[li];
    if (!fence_.empty()) {
      if (closes_fence(line, fence_)) {
        fence_ = {};
      } else {
        doc_.body.append(line).push_back('\n');
      }
      return;
    }
    if (in_comment_) {
      const std::size_t close = line.find("-->");
      if (close == std::string_view::npos) return;
      line = line.substr(close + 3);
      in_comment_ = false;
    }
    if (trim(line).empty()) return blank();
    if (prev_paragraph_ && is_setext_underline(line)) {
      // The paragraph just written is a heading.
      if (doc_.title.empty()) {
        std::string text = doc_.body.substr(paragraph_start_);
        for (char& c : text) c = c == '\n' ? ' ' : c;
        set_title(text);
      }
      prev_paragraph_ = false;
      return;
    }
    if (is_thematic_break(line)) {
      prev_paragraph_ = false;
      return;
    }
    // Container markers: blockquote '>' and list markers, any depth. Each
    // round consumes input, so the loop is linear in the line.
    std::string_view t = trim_left(line);
    bool contained = false;
    for (;;) {
      if (!t.empty() && t[0] == '>') {
        t = trim_left(t.substr(1));
      } else if (const std::size_t m = list_marker(t); m > 0) {
        t = t.substr(m);
      } else {
        break;
      }
      contained = true;
    }
    if (trim(t).empty() || (contained && is_thematic_break(t))) return blank();
    content(li, t, contained);
  }

  // A line's content once container markers are gone.
  void content(std::size_t li, std::string_view t, bool contained) {
    if (const Heading h = atx_heading(t); h.level > 0) {
      const std::string text = ingest::strip_inline(h.text).text;
      set_title(text);
      doc_.body.append(trim(text)).push_back('\n');
      prev_paragraph_ = false;
      return;
    }
    if (const std::string_view run = fence_run(t); !run.empty()) {
      fence_ = run;
      prev_paragraph_ = false;
      return;
    }
    if (is_reference_definition(t)) return;
    bool table_row = false;
    if (t.find('|') != std::string_view::npos) {
      if (in_table_ && is_delimiter_row(t)) return;
      if (in_table_ || (li + 1 < lines_.size() && is_delimiter_row(lines_[li + 1]))) {
        in_table_ = table_row = true;
      }
    }
    ingest::InlineText out = ingest::strip_inline(t);
    in_comment_ = out.comment_open;
    if (table_row) {
      for (char& c : out.text) c = c == '|' ? ' ' : c;
    }
    const std::string_view text = trim(out.text);
    if (text.empty()) return blank();  // e.g. a line holding only an HTML comment
    const bool paragraph = !contained && !table_row;
    if (paragraph && !prev_paragraph_) paragraph_start_ = doc_.body.size();
    prev_paragraph_ = paragraph;
    doc_.body.append(text).push_back('\n');
  }

  const std::vector<std::string_view> lines_;
  Document doc_;
  std::string_view fence_;          // the open code fence's marker run; empty when none
  bool in_comment_ = false;         // inside a multi-line HTML comment
  bool in_table_ = false;           // inside a pipe table
  bool prev_paragraph_ = false;     // the previous line was plain paragraph text
  std::size_t paragraph_start_ = 0;  // body offset where that paragraph began
};

}  // namespace

Document markdown_to_document(std::string_view markdown_utf8) {
  return BlockPass(markdown_utf8).run();
}

namespace ingest {

Parsed read_markdown(std::string_view text, const std::string& path) {
  Parsed out;
  if (trim(text).empty()) {
    out.warnings.push_back("empty file");
    return out;
  }
  Document doc = markdown_to_document(text);
  if (doc.title.empty() && trim(doc.body).empty()) {
    out.warnings.push_back("no text left once the Markdown markup is removed");
    return out;
  }
  doc.external_id = path;
  out.documents.push_back(std::move(doc));
  return out;
}

}  // namespace ingest
}  // namespace lode
