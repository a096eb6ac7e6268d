// DOCX, ODT and EPUB: zip containers of XML (pugixml) and, for EPUB, XHTML
// chapters (the HTML reader). Element names are matched by local name, so
// any namespace prefix a producer chooses works.
#include <pugixml.hpp>

#include <ctime>
#include <vector>

#include "ingest/html.h"
#include "ingest/readers.h"
#include "ingest/text_util.h"
#include "ingest/zip_archive.h"

namespace lode::ingest {
namespace {

std::string_view local_name(const pugi::xml_node& n) {
  std::string_view name = n.name();
  const std::size_t colon = name.find(':');
  return colon == std::string_view::npos ? name : name.substr(colon + 1);
}

// First element anywhere below `root` with this local name.
pugi::xml_node find_local(const pugi::xml_node& root, std::string_view name) {
  std::vector<pugi::xml_node> stack{root};
  while (!stack.empty()) {
    pugi::xml_node n = stack.back();
    stack.pop_back();
    if (n.type() == pugi::node_element && local_name(n) == name && n != root) return n;
    std::vector<pugi::xml_node> kids(n.begin(), n.end());
    for (auto it = kids.rbegin(); it != kids.rend(); ++it) stack.push_back(*it);
  }
  return {};
}

std::string child_text(const pugi::xml_node& root, std::string_view name) {
  return std::string(trim(find_local(root, name).text().as_string()));
}

// "2021-03-04", "2021-03-04T10:20:30Z", "2021-03-04T10:20:30.5+02:00" -> seconds
// since the epoch (UTC; an offset is ignored: a date filter needs the day).
std::int64_t parse_iso_date(std::string_view s) {
  std::tm tm{};
  int y = 0, mo = 0, d = 0, h = 0, mi = 0, sec = 0;
  const std::string str(s.substr(0, 19));
  const int got = std::sscanf(str.c_str(), "%d-%d-%dT%d:%d:%d", &y, &mo, &d, &h, &mi, &sec);
  if (got < 3 || y < 1900 || mo < 1 || mo > 12 || d < 1 || d > 31) return 0;
  tm.tm_year = y - 1900;
  tm.tm_mon = mo - 1;
  tm.tm_mday = d;
  if (got >= 6) {
    tm.tm_hour = h;
    tm.tm_min = mi;
    tm.tm_sec = sec;
  }
  return static_cast<std::int64_t>(timegm(&tm));
}

Result<pugi::xml_document> parse_xml(ZipArchive& zip, const std::string& entry, const std::string& path) {
  auto bytes = zip.read(entry);
  if (!bytes) return bytes.status();
  pugi::xml_document doc;
  const auto r = doc.load_buffer(bytes->data(), bytes->size(), pugi::parse_default | pugi::parse_ws_pcdata_single);
  if (!r) return Status::Corruption(path + ": '" + entry + "' is not well-formed XML (" + r.description() + ")");
  return doc;
}

// Text of a word-processing body: paragraphs end lines; tabs and breaks kept.
std::string flow_text(const pugi::xml_node& body, std::string_view para, std::string_view heading) {
  std::string out;
  std::vector<std::pair<pugi::xml_node, bool>> stack{{body, false}};
  while (!stack.empty()) {
    auto [n, leaving] = stack.back();
    stack.pop_back();
    if (leaving) {
      if (!out.empty() && out.back() != '\n') out += '\n';
      continue;
    }
    if (n.type() == pugi::node_pcdata || n.type() == pugi::node_cdata) {
      const std::string_view parent = local_name(n.parent());
      if (parent == "t" || parent == "p" || parent == "h" || parent == "span" || parent == "a") out += n.value();
      continue;
    }
    if (n.type() != pugi::node_element) continue;
    const std::string_view name = local_name(n);
    if (name == "tab") out += '\t';
    if (name == "br" || name == "cr" || name == "line-break") out += '\n';
    if (name == "s") out.append(static_cast<std::size_t>(std::max(1, n.attribute("text:c").as_int(1))), ' ');
    if (name == para || name == heading) stack.emplace_back(n, true);
    std::vector<pugi::xml_node> kids(n.begin(), n.end());
    for (auto it = kids.rbegin(); it != kids.rend(); ++it) stack.emplace_back(*it, false);
  }
  return out;
}

Document make_doc(std::string kind, std::string body, const std::string& path) {
  Document doc;
  doc.external_id = path;
  doc.kind = std::move(kind);
  doc.body = std::move(body);
  return doc;
}

// Where a word-processing format keeps its text and metadata.
struct FlowFormat {
  const char* kind;
  const char* content;  // the body's XML entry
  const char* body;     // local name of the element holding the text
  const char* heading;  // paragraph-like element besides "p" ("" if none)
  const char* meta;     // the metadata entry
  const char* author;   // local name of the author element, then a fallback
  const char* author_fallback;
  const char* date;     // local name of the creation date element
};
constexpr FlowFormat kDocx{"docx", "word/document.xml", "body", "", "docProps/core.xml", "creator", "", "created"};
constexpr FlowFormat kOdt{"odt", "content.xml", "text", "h", "meta.xml", "initial-creator", "creator", "creation-date"};

Result<Document> read_flow(ZipArchive& zip, const std::string& path, const FlowFormat& f) {
  auto xml = parse_xml(zip, f.content, path);
  if (!xml) return xml.status();
  Document doc = make_doc(f.kind, flow_text(find_local(*xml, f.body), "p", f.heading), path);
  if (!zip.has(f.meta)) return doc;
  auto meta = parse_xml(zip, f.meta, path);
  if (!meta) return meta.status();
  doc.title = make_title(child_text(*meta, "title"));
  doc.author = child_text(*meta, f.author);
  if (doc.author.empty() && *f.author_fallback != '\0') doc.author = child_text(*meta, f.author_fallback);
  doc.date = parse_iso_date(child_text(*meta, f.date));
  return doc;
}

// "a/b/../c.xhtml" relative to the package document's folder.
std::string resolve(const std::string& base_dir, std::string_view href) {
  std::vector<std::string> parts;
  auto push = [&](std::string_view s) {
    for (std::size_t b = 0; b <= s.size();) {
      std::size_t e = s.find('/', b);
      if (e == std::string_view::npos) e = s.size();
      std::string_view seg = s.substr(b, e - b);
      if (seg == "..") {
        if (!parts.empty()) parts.pop_back();
      } else if (!seg.empty() && seg != ".") {
        parts.emplace_back(seg);
      }
      b = e + 1;
    }
  };
  push(base_dir);
  push(href.substr(0, href.find('#')));
  std::string out;
  for (auto& p : parts) out += (out.empty() ? "" : "/") + p;
  return out;
}

Result<Document> read_epub(ZipArchive& zip, const std::string& path, const ReadOptions& options,
                           std::vector<std::string>& warnings) {
  auto container = parse_xml(zip, "META-INF/container.xml", path);
  if (!container) return container.status();
  const std::string opf_path = find_local(*container, "rootfile").attribute("full-path").as_string();
  if (opf_path.empty()) return Status::Corruption(path + ": EPUB container names no package document");
  auto opf = parse_xml(zip, opf_path, path);
  if (!opf) return opf.status();
  const std::string dir = opf_path.find('/') == std::string::npos ? "" : opf_path.substr(0, opf_path.rfind('/'));
  Document doc = make_doc("epub", "", path);
  doc.title = make_title(child_text(*opf, "title"));
  doc.author = child_text(*opf, "creator");
  doc.date = parse_iso_date(child_text(*opf, "date"));
  const pugi::xml_node manifest = find_local(*opf, "manifest");
  for (const pugi::xml_node& ref : find_local(*opf, "spine").children()) {
    if (local_name(ref) != "itemref") continue;
    const std::string_view idref = ref.attribute("idref").as_string();
    for (const pugi::xml_node& item : manifest.children()) {
      if (idref != item.attribute("id").as_string()) continue;
      const std::string entry = resolve(dir, item.attribute("href").as_string());
      auto chapter = zip.read(entry);
      if (!chapter) {
        if (chapter.status().code() != Code::kNotFound) return chapter.status();
        warnings.push_back("EPUB spine names a missing chapter '" + entry + "'");
        break;
      }
      auto text = html_to_text(*chapter, path + ":" + entry, options.max_html_depth);
      if (!text) return text.status();
      doc.body += text->body;
      if (!doc.body.empty() && doc.body.back() != '\n') doc.body += '\n';
      break;
    }
  }
  return doc;
}

}  // namespace

Result<Parsed> read_zip_document(std::string_view bytes, const std::string& path, const ReadOptions& options) {
  auto zip = ZipArchive::open(bytes, path, options.max_unpacked_bytes);
  if (!zip) return zip.status();
  Parsed out;
  Result<Document> doc = Status::Unsupported(path + ": a zip archive that is not a DOCX, ODT or EPUB document");
  std::string mimetype;
  if ((*zip)->has("mimetype")) {
    auto m = (*zip)->read("mimetype");
    if (!m) return m.status();
    mimetype = std::string(trim(*m));
  }
  if ((*zip)->has("word/document.xml")) doc = read_flow(**zip, path, kDocx);
  else if (mimetype == "application/epub+zip" || (*zip)->has("META-INF/container.xml"))
    doc = read_epub(**zip, path, options, out.warnings);
  else if (mimetype.rfind("application/vnd.oasis.opendocument.text", 0) == 0 || (*zip)->has("content.xml"))
    doc = read_flow(**zip, path, kOdt);
  if (!doc) return doc.status();
  if (doc->title.empty()) doc->title = first_line_title(doc->body);
  if (trim(doc->body).empty() && doc->title.empty()) {
    out.warnings.push_back("no text in the document");
    return out;
  }
  out.documents.push_back(std::move(doc).value());
  return out;
}

}  // namespace lode::ingest
