#include "ingest/front_matter.h"
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
  // The same front matter block as Markdown's gives date and author.
  const std::vector<std::string_view> lines = split_lines(text);
  const FrontMatter fm = front_matter(lines);
  if (fm.body_start > 0) {
    text = fm.body_start < lines.size() ? text.substr(static_cast<std::size_t>(lines[fm.body_start].data() - text.data()))
                                        : std::string_view();
    doc.author = fm.author;
    doc.date = fm.date;
  }
  doc.title = fm.title.empty() ? first_line_title(text) : fm.title;
  doc.body = std::string(text);
  out.documents.push_back(std::move(doc));
  return out;
}

}  // namespace lode::ingest
