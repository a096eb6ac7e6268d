// Builders for the small test documents of the formats suite. Every file is
// made here, from our own invented text: a PDF assembled by hand with a
// correct cross-reference table (ISO 32000-1, 7.5), zip containers through
// libzip, gzip through zlib.
#pragma once

#include <zip.h>
#include <zlib.h>

#include <cstdio>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

namespace lode::testing {

// A PDF with one page per entry of `pages` (ASCII text, one line per '\n'),
// in the standard Helvetica font, with an information dictionary when
// `title` or `author` is given.
inline std::string make_pdf(const std::vector<std::string>& pages, const std::string& title = "",
                            const std::string& author = "", const std::string& date = "") {
  std::vector<std::string> objects;  // object i+1
  const std::size_t n = pages.size();
  std::string kids;
  for (std::size_t i = 0; i < n; ++i) kids += std::to_string(4 + 2 * i) + " 0 R ";
  objects.push_back("<< /Type /Catalog /Pages 2 0 R >>");
  objects.push_back("<< /Type /Pages /Kids [" + kids + "] /Count " + std::to_string(n) + " >>");
  objects.push_back("<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>");
  for (std::size_t i = 0; i < n; ++i) {
    objects.push_back("<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Resources << /Font << /F1 3 0 R >> >> "
                      "/Contents " + std::to_string(5 + 2 * i) + " 0 R >>");
    std::string content = "BT /F1 12 Tf 14 TL 72 720 Td";
    std::size_t b = 0;
    while (b <= pages[i].size()) {
      std::size_t e = pages[i].find('\n', b);
      if (e == std::string::npos) e = pages[i].size();
      content += " (" + pages[i].substr(b, e - b) + ") Tj T*";
      b = e + 1;
    }
    content += " ET";
    objects.push_back("<< /Length " + std::to_string(content.size()) + " >>\nstream\n" + content + "\nendstream");
  }
  const bool info = !title.empty() || !author.empty() || !date.empty();
  if (info) {
    std::string dict = "<<";
    if (!title.empty()) dict += " /Title (" + title + ")";
    if (!author.empty()) dict += " /Author (" + author + ")";
    if (!date.empty()) dict += " /CreationDate (" + date + ")";
    objects.push_back(dict + " >>");
  }
  std::string pdf = "%PDF-1.4\n";
  std::vector<std::size_t> offsets;
  for (std::size_t i = 0; i < objects.size(); ++i) {
    offsets.push_back(pdf.size());
    pdf += std::to_string(i + 1) + " 0 obj\n" + objects[i] + "\nendobj\n";
  }
  const std::size_t xref = pdf.size();
  pdf += "xref\n0 " + std::to_string(objects.size() + 1) + "\n0000000000 65535 f \n";
  char line[32];
  for (std::size_t off : offsets) {
    std::snprintf(line, sizeof line, "%010zu 00000 n \n", off);
    pdf += line;
  }
  pdf += "trailer\n<< /Size " + std::to_string(objects.size() + 1) + " /Root 1 0 R";
  if (info) pdf += " /Info " + std::to_string(objects.size()) + " 0 R";
  pdf += " >>\nstartxref\n" + std::to_string(xref) + "\n%%EOF\n";
  return pdf;
}

// A zip archive of (name, content) entries, deflated (stored when `store`).
inline std::string make_zip(const std::vector<std::pair<std::string, std::string>>& entries) {
  zip_error_t err;
  zip_error_init(&err);
  zip_source_t* src = zip_source_buffer_create(nullptr, 0, 0, &err);
  zip_t* z = zip_open_from_source(src, ZIP_TRUNCATE, &err);
  if (z == nullptr) throw std::runtime_error("zip_open_from_source failed");
  zip_source_keep(src);
  for (auto& [name, content] : entries) {
    zip_source_t* s = zip_source_buffer(z, content.data(), content.size(), 0);
    const zip_int64_t at = zip_file_add(z, name.c_str(), s, ZIP_FL_ENC_UTF_8);
    if (at < 0) throw std::runtime_error("zip_file_add failed");
    if (name == "mimetype") zip_set_file_compression(z, static_cast<zip_uint64_t>(at), ZIP_CM_STORE, 0);
  }
  if (zip_close(z) != 0) throw std::runtime_error("zip_close failed");
  zip_source_open(src);
  zip_source_seek(src, 0, SEEK_END);
  const zip_int64_t size = zip_source_tell(src);
  zip_source_seek(src, 0, SEEK_SET);
  std::string out(static_cast<std::size_t>(size), '\0');
  zip_source_read(src, out.data(), static_cast<zip_uint64_t>(size));
  zip_source_close(src);
  zip_source_free(src);
  zip_error_fini(&err);
  return out;
}

inline std::string make_docx(const std::string& body_xml, const std::string& title, const std::string& author) {
  const std::string doc =
      R"(<?xml version="1.0" encoding="UTF-8"?><w:document xmlns:w="http://schemas.openxmlformats.org/wordprocessingml/2006/main"><w:body>)" +
      body_xml + "</w:body></w:document>";
  const std::string core =
      R"(<?xml version="1.0" encoding="UTF-8"?><cp:coreProperties xmlns:cp="http://schemas.openxmlformats.org/package/2006/metadata/core-properties" xmlns:dc="http://purl.org/dc/elements/1.1/" xmlns:dcterms="http://purl.org/dc/terms/"><dc:title>)" +
      title + "</dc:title><dc:creator>" + author +
      "</dc:creator><dcterms:created>2019-05-06T07:08:09Z</dcterms:created></cp:coreProperties>";
  return make_zip({{"[Content_Types].xml", "<Types/>"}, {"word/document.xml", doc}, {"docProps/core.xml", core}});
}

inline std::string docx_paragraph(const std::string& text) { return "<w:p><w:r><w:t>" + text + "</w:t></w:r></w:p>"; }

inline std::string make_odt(const std::string& paragraphs_xml, const std::string& title, const std::string& author) {
  const std::string content =
      R"(<?xml version="1.0" encoding="UTF-8"?><office:document-content xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0"><office:body><office:text>)" +
      paragraphs_xml + "</office:text></office:body></office:document-content>";
  const std::string meta =
      R"(<?xml version="1.0" encoding="UTF-8"?><office:document-meta xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" xmlns:dc="http://purl.org/dc/elements/1.1/" xmlns:meta="urn:oasis:names:tc:opendocument:xmlns:meta:1.0"><office:meta><dc:title>)" +
      title + "</dc:title><meta:initial-creator>" + author +
      "</meta:initial-creator><meta:creation-date>2020-02-03T04:05:06</meta:creation-date></office:meta></office:document-meta>";
  return make_zip({{"mimetype", "application/vnd.oasis.opendocument.text"}, {"content.xml", content}, {"meta.xml", meta}});
}

inline std::string make_epub(const std::vector<std::string>& chapters_html, const std::string& title,
                             const std::string& author) {
  std::vector<std::pair<std::string, std::string>> entries = {
      {"mimetype", "application/epub+zip"},
      {"META-INF/container.xml",
       R"(<?xml version="1.0"?><container version="1.0" xmlns="urn:oasis:names:tc:opendocument:xmlns:container"><rootfiles><rootfile full-path="OEBPS/book.opf" media-type="application/oebps-package+xml"/></rootfiles></container>)"}};
  std::string manifest, spine;
  for (std::size_t i = 0; i < chapters_html.size(); ++i) {
    const std::string id = "c" + std::to_string(i + 1);
    manifest += "<item id=\"" + id + "\" href=\"text/" + id + ".xhtml\" media-type=\"application/xhtml+xml\"/>";
    spine += "<itemref idref=\"" + id + "\"/>";
    entries.emplace_back("OEBPS/text/" + id + ".xhtml", chapters_html[i]);
  }
  entries.emplace_back(
      "OEBPS/book.opf",
      R"(<?xml version="1.0"?><package xmlns="http://www.idpf.org/2007/opf" version="3.0"><metadata xmlns:dc="http://purl.org/dc/elements/1.1/"><dc:title>)" +
          title + "</dc:title><dc:creator>" + author + "</dc:creator></metadata><manifest>" + manifest +
          "</manifest><spine>" + spine + "</spine></package>");
  return make_zip(entries);
}

inline std::string gzip_bytes(const std::string& data) {
  z_stream z{};
  if (deflateInit2(&z, 6, Z_DEFLATED, 15 + 16, 8, Z_DEFAULT_STRATEGY) != Z_OK) throw std::runtime_error("deflateInit2");
  std::string out(deflateBound(&z, static_cast<uLong>(data.size())) + 64, '\0');
  z.next_in = reinterpret_cast<Bytef*>(const_cast<char*>(data.data()));
  z.avail_in = static_cast<uInt>(data.size());
  z.next_out = reinterpret_cast<Bytef*>(out.data());
  z.avail_out = static_cast<uInt>(out.size());
  if (deflate(&z, Z_FINISH) != Z_STREAM_END) throw std::runtime_error("deflate");
  out.resize(z.total_out);
  deflateEnd(&z);
  return out;
}

}  // namespace lode::testing
