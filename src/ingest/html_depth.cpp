// Guards in front of the HTML parser: a rough depth count and the charset
// prescan. Both only look at tags; neither builds a tree.
#include <algorithm>
#include <array>
#include <vector>

#include "ingest/html.h"

namespace lode::ingest {
namespace {

char lower(char c) { return c >= 'A' && c <= 'Z' ? static_cast<char>(c + 32) : c; }
bool is_alpha(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'); }

// Elements that never hold children, or whose end tag may be omitted
// (WHATWG HTML, "Void elements" and "Optional tags"): they do not nest.
bool never_nests(std::string_view name) {
  static constexpr std::array<std::string_view, 32> kFlat{
      "area", "base", "br", "col", "embed", "hr", "img", "input", "link", "meta", "source", "track",
      "wbr", "param", "keygen", "p", "li", "dt", "dd", "tr", "td", "th", "option", "optgroup",
      "tbody", "thead", "tfoot", "colgroup", "rb", "rt", "rp", "caption"};
  return std::find(kFlat.begin(), kFlat.end(), name) != kFlat.end();
}

}  // namespace

std::uint32_t rough_html_depth(std::string_view html) {
  std::int64_t depth = 0, deepest = 0;
  std::string name;
  for (std::size_t i = 0; i + 1 < html.size(); ++i) {
    if (html[i] != '<') continue;
    const bool closing = html[i + 1] == '/';
    std::size_t j = i + (closing ? 2 : 1);
    if (j >= html.size() || !is_alpha(html[j])) continue;
    name.clear();
    while (j < html.size() && (is_alpha(html[j]) || (html[j] >= '0' && html[j] <= '9')) && name.size() < 16)
      name += lower(html[j++]);
    if (never_nests(name)) continue;
    const std::size_t close = html.find('>', j);
    const bool self_closing = close != std::string_view::npos && close > 0 && html[close - 1] == '/';
    if (closing) depth = std::max<std::int64_t>(0, depth - 1);
    else if (!self_closing) deepest = std::max(deepest, ++depth);
  }
  return static_cast<std::uint32_t>(std::min<std::int64_t>(deepest, UINT32_MAX));
}

std::string declared_html_charset(std::string_view bytes) {
  if (bytes.substr(0, 3) == "\xEF\xBB\xBF") return "UTF-8";
  if (bytes.substr(0, 2) == "\xFE\xFF") return "UTF-16BE";
  if (bytes.substr(0, 2) == "\xFF\xFE") return "UTF-16LE";
  std::string head(bytes.substr(0, 1024));
  std::transform(head.begin(), head.end(), head.begin(), lower);
  for (std::size_t at = head.find("<meta"); at != std::string::npos; at = head.find("<meta", at + 5)) {
    const std::size_t end = std::min(head.find('>', at), head.size());
    const std::string_view tag(head.data() + at, end - at);
    const std::size_t cs = tag.find("charset");
    if (cs == std::string_view::npos) continue;
    std::size_t v = cs + 7;
    while (v < tag.size() && (tag[v] == ' ' || tag[v] == '=' || tag[v] == '"' || tag[v] == '\'')) ++v;
    std::size_t e = v;
    while (e < tag.size() && (is_alpha(tag[e]) || (tag[e] >= '0' && tag[e] <= '9') || tag[e] == '-' ||
                              tag[e] == '_' || tag[e] == ':' || tag[e] == '.'))
      ++e;
    if (e > v) return std::string(tag.substr(v, e - v));
  }
  return {};
}

}  // namespace lode::ingest
