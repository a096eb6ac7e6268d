#include "ingest/readers.h"
#include "ingest/text_util.h"

namespace lode::ingest {

Parsed read_plain_text(std::string_view text, const std::string& path) {
  Parsed out;
  if (trim(text).empty()) {
    out.warnings.push_back("empty file");
    return out;
  }
  Document doc;
  doc.external_id = path;
  doc.kind = "text";
  doc.title = first_line_title(text);
  doc.body = std::string(text);
  out.documents.push_back(std::move(doc));
  return out;
}

}  // namespace lode::ingest
