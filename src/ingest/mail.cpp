// E-mail through GMime: one .eml message, or every message of an mbox file.
// GMime decodes transfer encodings (base64, quoted-printable), RFC 2047
// headers and part charsets to UTF-8.
#include <gmime/gmime.h>

#include <memory>
#include <mutex>

#include "ingest/html.h"
#include "ingest/readers.h"
#include "ingest/text_util.h"
#include "lode/analysis.h"

namespace lode::ingest {
namespace {

void init_gmime() {
  static std::once_flag once;
  std::call_once(once, [] { g_mime_init(); });
}

struct Unref {
  void operator()(gpointer p) const { g_object_unref(p); }
};
template <class T>
using GPtr = std::unique_ptr<T, Unref>;

struct GFree {
  void operator()(gpointer p) const { g_free(p); }
};
using GString_ = std::unique_ptr<char, GFree>;

std::string addresses(InternetAddressList* list) {
  if (list == nullptr || internet_address_list_length(list) == 0) return {};
  GString_ s(internet_address_list_to_string(list, nullptr, FALSE));
  return s ? std::string(s.get()) : std::string();
}

std::string valid(std::string s) { return is_valid_utf8(s) ? s : repair_utf8(s).text; }

struct MessageText {
  std::string text;
  std::vector<std::string> attachments;
};

Status collect_parts(GMimeMessage* msg, const std::string& where, std::uint32_t max_html_depth, MessageText& out) {
  GMimePartIter* raw_iter = g_mime_part_iter_new(GMIME_OBJECT(msg));
  std::unique_ptr<GMimePartIter, void (*)(GMimePartIter*)> iter(raw_iter, g_mime_part_iter_free);
  if (!g_mime_part_iter_is_valid(iter.get())) {
    // A message whose body is one part: the iterator starts past it.
    GMimeObject* body = g_mime_message_get_mime_part(msg);
    if (body == nullptr) return Status();
    if (GMIME_IS_TEXT_PART(body)) {
      GString_ t(g_mime_text_part_get_text(GMIME_TEXT_PART(body)));
      if (t) out.text += valid(t.get());
    }
    return Status();
  }
  do {
    GMimeObject* obj = g_mime_part_iter_get_current(iter.get());
    if (!GMIME_IS_PART(obj)) continue;
    GMimePart* part = GMIME_PART(obj);
    const char* filename = g_mime_part_get_filename(part);
    if (g_mime_part_is_attachment(part) || filename != nullptr) {
      out.attachments.push_back(filename != nullptr ? valid(filename) : "(unnamed attachment)");
      continue;
    }
    if (!GMIME_IS_TEXT_PART(obj)) continue;
    GMimeContentType* type = g_mime_object_get_content_type(obj);
    GString_ text(g_mime_text_part_get_text(GMIME_TEXT_PART(obj)));
    if (!text) continue;
    std::string utf8 = valid(text.get());
    if (g_mime_content_type_is_type(type, "text", "html")) {
      auto html = html_to_text(utf8, where, max_html_depth);
      if (!html) return html.status();
      utf8 = std::move(html->body);
    }
    if (!out.text.empty() && out.text.back() != '\n') out.text += '\n';
    out.text += utf8;
  } while (g_mime_part_iter_next(iter.get()));
  return Status();
}

Result<Document> message_document(GMimeMessage* msg, const std::string& id, const ReadOptions& options) {
  Document doc;
  doc.external_id = id;
  doc.kind = "email";
  const char* subject = g_mime_message_get_subject(msg);
  doc.title = make_title(subject != nullptr ? valid(subject) : "");
  const std::string from = addresses(g_mime_message_get_from(msg));
  const std::string to = addresses(g_mime_message_get_addresses(msg, GMIME_ADDRESS_TYPE_TO));
  doc.author = from;
  std::string date_text;
  if (GDateTime* date = g_mime_message_get_date(msg)) {
    doc.date = static_cast<std::int64_t>(g_date_time_to_unix(date));
    GString_ iso(g_date_time_format_iso8601(date));
    if (iso) date_text = iso.get();
  }
  MessageText parts;
  LODE_RETURN_IF_ERROR(collect_parts(msg, id, options.max_html_depth, parts));
  if (!from.empty()) doc.body += "From: " + from + "\n";
  if (!to.empty()) doc.body += "To: " + to + "\n";
  if (!date_text.empty()) doc.body += "Date: " + date_text + "\n";
  if (!doc.title.empty()) doc.body += "Subject: " + doc.title + "\n";
  doc.body += "\n" + parts.text;
  if (!parts.attachments.empty()) {
    if (doc.body.back() != '\n') doc.body += '\n';
    doc.body += "Attachments:";
    for (auto& a : parts.attachments) doc.body += " " + a;
    doc.body += '\n';
  }
  return doc;
}

bool has_headers(GMimeMessage* msg) {
  return g_mime_message_get_subject(msg) != nullptr || g_mime_message_get_date(msg) != nullptr ||
         internet_address_list_length(g_mime_message_get_from(msg)) > 0;
}

}  // namespace

Result<Parsed> read_mail(std::string_view bytes, const std::string& path, const ReadOptions& options, bool mbox) {
  init_gmime();
  GPtr<GMimeStream> stream(g_mime_stream_mem_new_with_buffer(bytes.data(), bytes.size()));
  GPtr<GMimeParser> parser(g_mime_parser_new_with_stream(stream.get()));
  g_mime_parser_set_format(parser.get(), mbox ? GMIME_FORMAT_MBOX : GMIME_FORMAT_MESSAGE);
  Parsed out;
  std::uint32_t n = 0;
  while (!g_mime_parser_eos(parser.get())) {
    GPtr<GMimeMessage> msg(g_mime_parser_construct_message(parser.get(), nullptr));
    if (!msg) break;
    ++n;
    if (!mbox && !has_headers(msg.get()))
      return Status::Corruption(path + ": not an e-mail message (no From, Subject or Date header)");
    if (options.max_mbox_messages > 0 && n > options.max_mbox_messages) {
      out.warnings.push_back("more than " + std::to_string(options.max_mbox_messages) +
                             " messages: the rest were not read");
      break;
    }
    auto doc = message_document(msg.get(), mbox ? path + "#" + std::to_string(n) : path, options);
    if (!doc) return doc.status();
    out.documents.push_back(std::move(doc).value());
    if (!mbox) break;
  }
  if (n == 0)
    return Status::Corruption(path + (mbox ? ": no messages found (not an mbox file?)" : ": not an e-mail message"));
  return out;
}

}  // namespace lode::ingest
