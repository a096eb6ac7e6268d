// PDF through poppler-cpp: text page by page in poppler's reading order,
// title/author/date from the document information dictionary.
#include <poppler/cpp/poppler-document.h>
#include <poppler/cpp/poppler-global.h>
#include <poppler/cpp/poppler-page.h>

#include <climits>
#include <memory>
#include <mutex>

#include "ingest/readers.h"
#include "ingest/text_util.h"
#include "lode/analysis.h"

namespace lode::ingest {
namespace {

std::string utf8_of(const poppler::ustring& s) {
  const poppler::byte_array bytes = s.to_utf8();
  std::string out(bytes.begin(), bytes.end());
  // Poppler passes through whatever the font maps to: drop control
  // characters other than line breaks and tabs, and repair bad UTF-8.
  std::string clean;
  clean.reserve(out.size());
  for (char c : out) {
    const auto u = static_cast<unsigned char>(c);
    if (u >= 0x20 || c == '\n' || c == '\t') clean += c;
    else if (c == '\r') clean += '\n';
  }
  return is_valid_utf8(clean) ? clean : repair_utf8(clean).text;
}

// Poppler reports damage on stderr by default; the reader returns it as a
// status instead, so the messages are dropped.
void quiet_poppler() {
  static std::once_flag once;
  std::call_once(once, [] { poppler::set_debug_error_function([](const std::string&, void*) {}, nullptr); });
}

// A complete PDF ends with "%%EOF" (ISO 32000-1, 7.5.5), perhaps followed by
// line ends or a little junk; its absence near the end means a cut file.
bool has_eof_marker(std::string_view bytes) {
  const std::size_t tail = std::min<std::size_t>(bytes.size(), 1024);
  return bytes.substr(bytes.size() - tail).find("%%EOF") != std::string_view::npos;
}

}  // namespace

Result<Parsed> read_pdf(std::string_view bytes, const std::string& path, const ReadOptions&) {
  quiet_poppler();
  if (bytes.size() > static_cast<std::size_t>(INT_MAX))
    return Status::Limit(path + ": PDF larger than 2 GiB (the PDF library's limit)");
  if (!has_eof_marker(bytes)) return Status::Corruption(path + ": truncated PDF (no %%EOF marker at the end)");
  std::unique_ptr<poppler::document> pdf(
      poppler::document::load_from_raw_data(bytes.data(), static_cast<int>(bytes.size())));
  if (!pdf) return Status::Corruption(path + ": damaged PDF (the PDF library could not open it)");
  if (pdf->is_locked()) return Status::Unsupported(path + ": encrypted PDF (needs a password)");
  Parsed out;
  Document doc;
  doc.external_id = path;
  doc.kind = "pdf";
  const int pages = pdf->pages();
  doc.pages = static_cast<std::uint32_t>(std::max(0, pages));
  for (int i = 0; i < pages; ++i) {
    if (i > 0) doc.body += '\f';
    doc.page_starts.push_back(static_cast<std::uint32_t>(doc.body.size()));
    std::unique_ptr<poppler::page> page(pdf->create_page(i));
    if (!page) {
      out.warnings.push_back("page " + std::to_string(i + 1) + " could not be read");
      continue;
    }
    doc.body += utf8_of(page->text());
  }
  doc.title = make_title(utf8_of(pdf->get_title()));
  if (doc.title.empty()) doc.title = first_line_title(doc.body);
  doc.author = std::string(trim(utf8_of(pdf->get_author())));
  doc.date = static_cast<std::int64_t>(pdf->get_creation_date_t());
  if (doc.date < 0) doc.date = 0;
  if (trim(doc.body).empty()) out.warnings.push_back("no text in the PDF (scanned pages need OCR, which lode does not do)");
  out.documents.push_back(std::move(doc));
  return out;
}

}  // namespace lode::ingest
