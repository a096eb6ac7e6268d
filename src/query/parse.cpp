#include <algorithm>
#include <cctype>

#include "lode/query.h"
#include "query/filter.h"

namespace lode {
namespace {

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v'; }

// One item of the query as typed, before analysis.
struct RawItem {
  Occur occur = Occur::kShould;
  std::optional<Field> field;
  bool quoted = false;
  std::string_view text;
  std::string_view typed;
  bool unclosed = false;               // a quote that runs to the end of the query
  std::string_view unknown_field;      // "author" in "author:tulloch": not a field, searched as words
};

std::vector<RawItem> split_items(std::string_view q) {
  std::vector<RawItem> items;
  std::size_t i = 0;
  while (i < q.size()) {
    while (i < q.size() && is_space(q[i])) ++i;
    if (i >= q.size()) break;
    std::size_t start = i;
    RawItem item;
    if (q[i] == '+' || q[i] == '-') {
      item.occur = q[i] == '+' ? Occur::kMust : Occur::kMustNot;
      ++i;
    }
    // field:  — only a known field name directly followed by ':'
    std::size_t j = i;
    while (j < q.size() && std::isalpha(static_cast<unsigned char>(q[j]))) ++j;
    if (j < q.size() && q[j] == ':' && j > i) {
      if (auto f = parse_field(q.substr(i, j - i))) {
        item.field = f;
        i = j + 1;
      } else if (j + 1 < q.size() && !is_space(q[j + 1])) {
        item.unknown_field = q.substr(i, j - i);
      }
    }
    if (i < q.size() && q[i] == '"') {
      item.quoted = true;
      const std::size_t close = q.find('"', i + 1);
      std::size_t end = close == std::string_view::npos ? q.size() : close;
      item.text = q.substr(i + 1, end - i - 1);
      i = close == std::string_view::npos ? q.size() : close + 1;
      item.unclosed = close == std::string_view::npos;
    } else {
      std::size_t end = i;
      while (end < q.size() && !is_space(q[end])) ++end;
      item.text = q.substr(i, end - i);
      i = end;
    }
    item.typed = q.substr(start, i - start);
    items.push_back(item);
  }
  return items;
}

// Plain reading: the whole text is one bare item, so the analyzer alone
// decides what is a word and every word is ranked.
std::vector<RawItem> plain_item(std::string_view q) {
  RawItem item;
  item.text = q;
  item.typed = q;
  return {item};
}

}  // namespace

std::string_view query_reading_name(QueryReading r) { return r == QueryReading::kPlain ? "plain" : "syntax"; }

Result<Query> parse_query(std::string_view text, Analyzer& analyzer, const QueryLimits& limits,
                          QueryReading reading) {
  const bool plain = reading == QueryReading::kPlain;
  if (text.size() > limits.max_bytes)
    return Status::Limit("query is " + std::to_string(text.size()) + " bytes; the limit is " +
                         std::to_string(limits.max_bytes));
  if (!is_valid_utf8(text)) return Status::InvalidArgument("query is not valid UTF-8");
  Query query;
  std::size_t total_words = 0;
  std::string left_out;  // items without searchable words, reported in one note
  for (const RawItem& item : plain ? plain_item(text) : split_items(text)) {
    if (item.unclosed)
      query.warnings.push_back("unbalanced quote: the phrase " + std::string(item.typed) +
                               " runs to the end of the query");
    if (!item.unknown_field.empty())
      query.warnings.push_back("'" + std::string(item.unknown_field) +
                               ":' is not a field (fields: title: body:; filters: " + query::kFilterNames +
                               "); '" + std::string(item.typed) + "' was searched as words");
    if (!plain && !item.quoted && item.occur == Occur::kShould && !item.field) {
      auto is_filter = query::apply_filter_item(item.text, query.filter, query.warnings);
      if (!is_filter) return is_filter.status();
      if (*is_filter) continue;
    }
    auto analyzed = analyzer.analyze(item.text);
    total_words += analyzed.tokens.size();
    if (total_words > limits.max_terms)
      return Status::Limit("query has more than " + std::to_string(limits.max_terms) +
                           " words; the limit is " + std::to_string(limits.max_terms));
    if (analyzed.tokens.empty()) {
      if (!item.text.empty()) left_out += (left_out.empty() ? "" : ", ") + std::string(item.typed);
      continue;
    }
    bool as_phrase = item.quoted || (item.occur != Occur::kShould && analyzed.tokens.size() > 1);
    if (as_phrase && analyzed.tokens.size() > 1) {
      Clause c{item.occur, true, item.field, {}, std::string(item.typed)};
      std::uint32_t base = analyzed.tokens.front().position;
      for (auto& t : analyzed.tokens) c.words.push_back({t.term, t.position - base});
      query.clauses.push_back(std::move(c));
    } else {
      for (auto& t : analyzed.tokens)
        query.clauses.push_back(Clause{item.occur, false, item.field, {{t.term, 0}}, std::string(item.typed)});
    }
  }
  if (!left_out.empty())
    query.warnings.push_back("left out (stopwords or punctuation only): " + left_out);
  const bool any_excluded = std::any_of(query.clauses.begin(), query.clauses.end(),
                                        [](const Clause& c) { return c.occur == Occur::kMustNot; });
  const bool any_positive = std::any_of(query.clauses.begin(), query.clauses.end(),
                                        [](const Clause& c) { return c.occur != Occur::kMustNot; });
  if (any_excluded && !any_positive)
    query.warnings.push_back("only excluded words: add a word to search for (a -word only removes matches)");
  return query;
}

}  // namespace lode
