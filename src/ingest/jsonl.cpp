// JSON Lines reader: one document per non-blank line. Parsing goes through
// nlohmann_json's SAX interface with the DOM builder, which reports errors by
// callback instead of by exception; the callback keeps the parser's message so
// the warning can say what is wrong and where.
#include <nlohmann/json.hpp>
#include <xxhash.h>

#include <algorithm>

#include <string>
#include <utility>

#include "ingest/readers.h"
#include "ingest/text_util.h"

namespace lode::ingest {
namespace {

using nlohmann::json;

// Longest parser message kept in a warning; a message can quote a long token.
constexpr std::size_t kMaxReasonBytes = 160;

// The DOM builder with parse errors captured instead of thrown. sax_parse()
// is a template over the SAX type, so this parse_error hides the base one.
// json_sax_dom_parser sits in nlohmann::detail but has kept this shape
// through the 3.x series (Debian 12 ships 3.11.2).
class CapturingParser : public nlohmann::detail::json_sax_dom_parser<json> {
 public:
  explicit CapturingParser(json& result) : json_sax_dom_parser(result, /*allow_exceptions_=*/false) {}

  template <class Exception>
  bool parse_error(std::size_t /*position*/, const std::string& /*token*/, const Exception& ex) {
    error_ = ex.what();
    return false;
  }
  const std::string& error() const { return error_; }

 private:
  std::string error_;
};

// "[json.exception.parse_error.101] parse error at line 1, column 7: ..."
// -> "column 7: ...", and "[json.exception.out_of_range.406] number overflow
// parsing '1e999'" -> "number overflow parsing '1e999'": the library's tag
// and the line number (always 1 for one line) say nothing to the reader.
std::string tidy_parse_message(std::string_view m) {
  if (!m.empty() && m[0] == '[') {
    if (const auto tag_end = m.find("] "); tag_end != std::string_view::npos) m = m.substr(tag_end + 2);
  }
  constexpr std::string_view kLinePrefix = "parse error at line 1, ";
  if (m.substr(0, kLinePrefix.size()) == kLinePrefix) m = m.substr(kLinePrefix.size());
  const std::string_view cut = cut_utf8(m, kMaxReasonBytes);
  return cut.size() < m.size() ? std::string(cut) + "..." : std::string(cut);
}

std::string quoted(const std::string& field) { return "field \"" + field + "\""; }

struct Record {
  Document doc;
  std::string skip_reason;  // non-empty: the line is skipped, this says why
};

Record skip(std::string reason) { return Record{{}, std::move(reason)}; }

Record read_record(std::string_view line, const ReadOptions& options) {
  Record rec;
  Document& doc = rec.doc;
  json value;
  CapturingParser parser(value);
  if (!json::sax_parse(line.begin(), line.end(), &parser)) {
    return skip("invalid JSON: " + tidy_parse_message(parser.error()));
  }
  if (!value.is_object()) return skip("not a JSON object");

  const auto text = value.find(options.text_field);
  if (text == value.end() || text->is_null()) return skip("missing " + quoted(options.text_field));
  if (text->is_string()) {
    doc.body = text->get_ref<const std::string&>();
  } else if (text->is_array()) {
    // An array of strings (paragraphs, say) is joined with newlines.
    for (const json& part : *text) {
      if (!part.is_string()) return skip(quoted(options.text_field) + " array holds a non-string");
      if (!doc.body.empty()) doc.body += '\n';
      doc.body += part.get_ref<const std::string&>();
    }
  } else {
    return skip(quoted(options.text_field) + " must be a string or an array of strings");
  }

  if (const auto id = value.find(options.id_field); id != value.end() && !id->is_null()) {
    if (id->is_string()) {
      doc.external_id = id->get_ref<const std::string&>();
    } else if (id->is_number_unsigned()) {
      doc.external_id = std::to_string(id->get<std::uint64_t>());
    } else if (id->is_number_integer()) {
      doc.external_id = std::to_string(id->get<std::int64_t>());
    } else if (id->is_number_float()) {  // finite: the parser refuses overflow
      doc.external_id = id->dump();  // shortest text that reads back the same double
    } else {
      return skip(quoted(options.id_field) + " must be a string or a number");
    }
  }

  if (const auto title = value.find(options.title_field); title != value.end() && !title->is_null()) {
    if (!title->is_string()) return skip(quoted(options.title_field) + " must be a string");
    doc.title = title->get_ref<const std::string&>();
  }
  doc.kind = "jsonl";
  return rec;
}

}  // namespace

JsonlRecords::JsonlRecords(const std::string& path, const ReadOptions& options, std::size_t max_checked_ids)
    : path_(path), options_(options), max_checked_ids_(max_checked_ids) {}

void JsonlRecords::bad_line(const std::string& reason) {
  if (++bad_lines_ <= kMaxLineWarnings) warnings_.push_back("line " + std::to_string(line_no_) + ": " + reason);
}

void JsonlRecords::skip_line(const std::string& reason) {
  ++line_no_;
  any_record_line_ = true;
  bad_line(reason);
}

// Ids are kept as 64-bit hashes with their first line, whatever the id's
// length; a false repeat needs a hash collision, about 3 in 10^8 for a file
// of a million records. Past max_checked_ids_ the check stops, so memory stays
// bounded (56 MiB).
void JsonlRecords::check_id(const std::string& id) {
  if (id_hashes_.size() >= max_checked_ids_) {
    unchecked_ = true;
    return;
  }
  const std::uint64_t h = XXH3_64bits(id.data(), id.size());
  const std::uint32_t slot = ids_.find(h, [&](std::uint32_t s) { return id_hashes_[s] == h; });
  if (slot == SlotTable::kNone) {
    ids_.insert(h, static_cast<std::uint32_t>(id_hashes_.size()));
    id_hashes_.push_back(h);
    id_lines_.push_back(static_cast<std::uint32_t>(std::min<std::size_t>(line_no_, UINT32_MAX)));
  } else if (duplicates_++ == 0) {
    first_duplicate_ = "id \"" + std::string(cut_utf8(id, kMaxReasonBytes)) + "\" on line " +
                       std::to_string(line_no_) + " (first seen on line " + std::to_string(id_lines_[slot]) + ")";
  }
}

void JsonlRecords::add(std::string_view text, std::vector<Document>& out) {
  for (const std::string_view line : split_lines(text)) {
    ++line_no_;
    if (trim(line).empty()) continue;
    any_record_line_ = true;
    Record rec = read_record(line, options_);
    if (!rec.skip_reason.empty()) {
      bad_line(rec.skip_reason);
      continue;
    }
    Document& doc = rec.doc;
    // A missing (or empty) id falls back to the line's address in the file.
    if (doc.external_id.empty()) doc.external_id = path_ + "#" + std::to_string(line_no_);
    check_id(doc.external_id);
    out.push_back(std::move(doc));
  }
}

std::vector<std::string> JsonlRecords::warnings() const {
  std::vector<std::string> out = warnings_;
  if (bad_lines_ > kMaxLineWarnings) {
    out.push_back(std::to_string(bad_lines_ - kMaxLineWarnings) + " more bad lines skipped (" +
                  std::to_string(bad_lines_) + " in all)");
  }
  if (duplicates_ > 0) {
    out.push_back(std::to_string(duplicates_) + " duplicate id(s), first " + first_duplicate_ +
                  "; every record is kept");
  }
  if (unchecked_)
    out.push_back("repeated ids were looked for among the first " + std::to_string(max_checked_ids_) +
                  " distinct ids only");
  if (!any_record_line_) out.push_back("empty file");
  return out;
}

Parsed read_jsonl(std::string_view text, const std::string& path, const ReadOptions& options) {
  JsonlRecords records(path, options);
  Parsed out;
  records.add(text, out.documents);
  out.warnings = records.warnings();
  return out;
}

}  // namespace lode::ingest
