// HTML to text on gumbo's HTML5 tree, walked with an explicit stack (depth is
// bounded by the guard, but a stack keeps the walk safe either way).
#include "ingest/html.h"

#include <gumbo.h>

#include <vector>

#include "ingest/charset.h"
#include "ingest/readers.h"
#include "ingest/text_util.h"
#include "lode/analysis.h"

namespace lode::ingest {
namespace {

// Boilerplate and non-text elements whose content is not indexed.
bool skipped(GumboTag tag) {
  switch (tag) {
    case GUMBO_TAG_SCRIPT: case GUMBO_TAG_STYLE: case GUMBO_TAG_NAV: case GUMBO_TAG_HEADER:
    case GUMBO_TAG_FOOTER: case GUMBO_TAG_ASIDE: case GUMBO_TAG_TEMPLATE: case GUMBO_TAG_NOSCRIPT:
    case GUMBO_TAG_SVG: case GUMBO_TAG_MATH: case GUMBO_TAG_IFRAME:
    case GUMBO_TAG_OBJECT: case GUMBO_TAG_SELECT:
      return true;
    default:
      return false;
  }
}

bool is_heading(GumboTag t) { return t >= GUMBO_TAG_H1 && t <= GUMBO_TAG_H6; }

// Elements after which text continues on a new line.
bool is_block(GumboTag t) {
  switch (t) {
    case GUMBO_TAG_P: case GUMBO_TAG_DIV: case GUMBO_TAG_BR: case GUMBO_TAG_LI: case GUMBO_TAG_TR:
    case GUMBO_TAG_TD: case GUMBO_TAG_TH: case GUMBO_TAG_BLOCKQUOTE: case GUMBO_TAG_PRE:
    case GUMBO_TAG_SECTION: case GUMBO_TAG_ARTICLE: case GUMBO_TAG_TABLE: case GUMBO_TAG_UL:
    case GUMBO_TAG_OL: case GUMBO_TAG_DL: case GUMBO_TAG_DT: case GUMBO_TAG_DD: case GUMBO_TAG_HR:
    case GUMBO_TAG_FIGURE: case GUMBO_TAG_FIGCAPTION: case GUMBO_TAG_MAIN: case GUMBO_TAG_BODY:
    case GUMBO_TAG_ADDRESS: case GUMBO_TAG_CAPTION:
      return true;
    default:
      return is_heading(t);
  }
}

// Appends text, collapsing whitespace runs to one space (newlines kept by end_line).
void append_text(std::string& out, std::string_view text) {
  for (char c : text) {
    if (is_space(c)) {
      if (!out.empty() && out.back() != ' ' && out.back() != '\n') out += ' ';
    } else {
      out += c;
    }
  }
}

void end_line(std::string& out) {
  while (!out.empty() && out.back() == ' ') out.pop_back();
  if (!out.empty() && out.back() != '\n') out += '\n';
}

std::string node_text(const GumboNode* node) {
  std::string out;
  std::vector<const GumboNode*> stack{node};
  while (!stack.empty()) {
    const GumboNode* n = stack.back();
    stack.pop_back();
    if (n->type == GUMBO_NODE_TEXT || n->type == GUMBO_NODE_CDATA || n->type == GUMBO_NODE_WHITESPACE) {
      append_text(out, n->v.text.text);
    } else if (n->type == GUMBO_NODE_ELEMENT || n->type == GUMBO_NODE_TEMPLATE) {
      const GumboVector& kids = n->v.element.children;
      for (unsigned i = kids.length; i-- > 0;) stack.push_back(static_cast<const GumboNode*>(kids.data[i]));
    }
  }
  return std::string(trim(out));
}

struct GumboFree {
  void operator()(GumboOutput* o) const { gumbo_destroy_output(&kGumboDefaultOptions, o); }
};

}  // namespace

Result<HtmlText> html_to_text(std::string_view utf8, const std::string& path, std::uint32_t max_depth) {
  if (max_depth > 0) {
    const std::uint32_t depth = rough_html_depth(utf8);
    if (depth > max_depth)
      return Status::Limit(path + ": HTML nested " + std::to_string(depth) + " elements deep, above the limit of " +
                           std::to_string(max_depth));
  }
  GumboOptions options = kGumboDefaultOptions;
  options.max_errors = 100;  // gumbo copies the open-element stack into every error it keeps
  std::unique_ptr<GumboOutput, GumboFree> parsed(
      gumbo_parse_with_options(&options, utf8.data(), utf8.size()));
  HtmlText out;
  std::string first_heading;
  // (node, leaving): leaving entries close block elements after their children.
  std::vector<std::pair<const GumboNode*, bool>> stack{{parsed->root, false}};
  while (!stack.empty()) {
    auto [n, leaving] = stack.back();
    stack.pop_back();
    if (n->type == GUMBO_NODE_TEXT || n->type == GUMBO_NODE_CDATA || n->type == GUMBO_NODE_WHITESPACE) {
      append_text(out.body, n->v.text.text);
      continue;
    }
    if (n->type != GUMBO_NODE_ELEMENT && n->type != GUMBO_NODE_TEMPLATE && n->type != GUMBO_NODE_DOCUMENT) continue;
    const GumboVector& kids = n->type == GUMBO_NODE_DOCUMENT ? n->v.document.children : n->v.element.children;
    const GumboTag tag = n->type == GUMBO_NODE_DOCUMENT ? GUMBO_TAG_UNKNOWN : n->v.element.tag;
    if (leaving) {
      end_line(out.body);
      continue;
    }
    if (tag == GUMBO_TAG_TITLE) {  // the title is not body text
      if (out.title.empty()) out.title = make_title(node_text(n));
      continue;
    }
    if (is_heading(tag) && first_heading.empty()) first_heading = make_title(node_text(n));
    if (skipped(tag)) continue;
    if (tag == GUMBO_TAG_IMG) {
      for (unsigned i = 0; i < n->v.element.attributes.length; ++i) {
        auto* a = static_cast<const GumboAttribute*>(n->v.element.attributes.data[i]);
        if (std::string_view(a->name) == "alt") append_text(out.body, std::string(" ") + a->value + " ");
      }
    }
    if (is_block(tag)) {
      end_line(out.body);
      stack.emplace_back(n, true);
    }
    for (unsigned i = kids.length; i-- > 0;) stack.emplace_back(static_cast<const GumboNode*>(kids.data[i]), false);
  }
  end_line(out.body);
  if (out.title.empty()) out.title = first_heading;
  return out;
}

Result<Parsed> read_html(std::string_view bytes, const std::string& path, const ReadOptions& options) {
  Parsed out;
  std::string utf8;
  std::string charset = declared_html_charset(bytes);
  if (charset.empty() || charset == "utf-8" || charset == "UTF-8") {
    if (bytes.substr(0, 3) == "\xEF\xBB\xBF") bytes.remove_prefix(3);
    if (!is_valid_utf8(bytes) && charset.empty()) {
      // Undeclared and not UTF-8: ICU's guess, else the HTML standard's default.
      auto guess = detect_charset(bytes);
      charset = guess ? guess->name : "windows-1252";
      out.warnings.push_back("no charset declared and not UTF-8: decoded as " + charset);
    }
  }
  if (!charset.empty() && charset != "utf-8" && charset != "UTF-8") {
    auto converted = convert_to_utf8(bytes, charset);
    if (!converted) {
      out.warnings.push_back("declared charset '" + charset + "' is unknown: read as UTF-8");
    } else {
      utf8 = std::move(converted).value();
    }
  }
  if (utf8.empty()) utf8 = repair_utf8(bytes).text;  // valid already, or repaired
  auto text = html_to_text(utf8, path, options.max_html_depth);
  if (!text) return text.status();
  if (trim(text->body).empty() && text->title.empty()) {
    out.warnings.push_back("no text in the HTML");
    return out;
  }
  Document doc;
  doc.external_id = path;
  doc.kind = "html";
  doc.title = std::move(text->title);
  doc.body = std::move(text->body);
  out.documents.push_back(std::move(doc));
  return out;
}

}  // namespace lode::ingest
