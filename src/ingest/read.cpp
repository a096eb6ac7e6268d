// read_file(): file access, content hash and dispatch to a format reader.
// POSIX open/read rather than iostreams: the errors must carry errno's text,
// and O_NONBLOCK keeps a named pipe from hanging the open.
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>
#include <xxhash.h>

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <memory>
#include <filesystem>
#include <system_error>

#include "ingest/decode.h"
#include "ingest/media.h"
#include "ingest/readers.h"
#include "ingest/text_util.h"
#include "lode/analysis.h"
#include "lode/ingest.h"

namespace lode {
namespace {

std::string errno_text(int err) { return std::generic_category().message(err); }

class FileDescriptor {
 public:
  explicit FileDescriptor(int fd) : fd_(fd) {}
  ~FileDescriptor() {
    if (fd_ >= 0) ::close(fd_);
  }
  FileDescriptor(const FileDescriptor&) = delete;
  FileDescriptor& operator=(const FileDescriptor&) = delete;
  int get() const { return fd_; }

 private:
  int fd_;
};

Status too_large(const std::string& path, std::int64_t size, std::int64_t limit) {
  return Status::Limit(path + ": file is " + std::to_string(size) + " bytes, above the limit of " +
                       std::to_string(limit) + " bytes");
}

struct FileBytes {
  std::string data;
  std::int64_t mtime_ns = 0;
};

struct OpenFile {
  explicit OpenFile(int raw_fd) : fd(raw_fd) {}
  FileDescriptor fd;
  struct stat st {};
};

// Opens a regular file for reading; errors as read_file's.
Result<std::unique_ptr<OpenFile>> open_regular(const std::string& path) {
  auto file = std::make_unique<OpenFile>(::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK));
  if (file->fd.get() < 0) {
    const int err = errno;
    if (err == ENOENT || err == ENOTDIR) return Status::NotFound(path + ": no such file");
    return Status::IOError(path + ": " + errno_text(err));
  }
  if (::fstat(file->fd.get(), &file->st) != 0) {
    const int err = errno;
    return Status::IOError(path + ": " + errno_text(err));
  }
  if (S_ISDIR(file->st.st_mode)) return Status::IOError(path + ": " + errno_text(EISDIR));
  if (!S_ISREG(file->st.st_mode)) return Status::Unsupported(path + ": not a regular file");
  return file;
}

// read() that retries on EINTR; the count read, 0 at the end, or IOError.
Result<std::size_t> read_some(int fd, char* dst, std::size_t want, const std::string& path) {
  for (;;) {
    const ssize_t got = ::read(fd, dst, want);
    if (got >= 0) return static_cast<std::size_t>(got);
    const int err = errno;
    if (err != EINTR) return Status::IOError(path + ": " + errno_text(err));
  }
}

std::int64_t mtime_of(const struct stat& st) { return std::int64_t{st.st_mtim.tv_sec} * 1000000000 + st.st_mtim.tv_nsec; }

// True when `after` shows the file changed since `before` was taken.
bool moved(const struct stat& before, const struct stat& after) {
  return after.st_size != before.st_size || after.st_mtim.tv_sec != before.st_mtim.tv_sec ||
         after.st_mtim.tv_nsec != before.st_mtim.tv_nsec;
}

Status changed_while_read(const std::string& path) {
  return Status::IOError(path + ": changed while being read (size or modification time moved)");
}

Result<FileBytes> read_bytes(const std::string& path, std::int64_t max_bytes) {
  auto opened = open_regular(path);
  if (!opened) return opened.status();
  const FileDescriptor& fd = (*opened)->fd;
  const struct stat& st = (*opened)->st;
  const auto size = static_cast<std::int64_t>(st.st_size);
  if (max_bytes > 0 && size > max_bytes) return too_large(path, size, max_bytes);

  // Read st_size bytes, then on to end of file: the file may change while we
  // read, and the limit must hold for what we actually got.
  std::string data(static_cast<std::size_t>(size), '\0');
  std::size_t have = 0;
  char extra[4096];
  for (;;) {
    const bool in_place = have < data.size();
    char* dst = in_place ? data.data() + have : extra;
    auto got = read_some(fd.get(), dst, in_place ? data.size() - have : sizeof extra, path);
    if (!got) return got.status();
    if (*got == 0) break;
    if (!in_place) data.append(extra, *got);
    have += *got;
    const auto total = static_cast<std::int64_t>(have);
    if (max_bytes > 0 && total > max_bytes) return too_large(path, total, max_bytes);
  }
  data.resize(have);  // the file shrank, if have < st_size
  // A writer busy with the file while we read it leaves a torn copy: refuse
  // it now; the next run sees the finished file.
  struct stat after {};
  if (::fstat(fd.get(), &after) == 0 && (moved(st, after) || static_cast<std::int64_t>(have) != size))
    return changed_while_read(path);
  return FileBytes{std::move(data), mtime_of(st)};
}

std::string canonical_hex(XXH128_hash_t h) {
  // The canonical (big-endian) form, as xxhsum and other tools print it.
  XXH128_canonical_t canonical;
  XXH128_canonicalFromHash(&canonical, h);
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out;
  out.reserve(32);
  for (const unsigned char b : canonical.digest) {
    out += kHex[b >> 4];
    out += kHex[b & 0x0F];
  }
  return out;
}

std::string hash_hex(std::string_view bytes) { return canonical_hex(XXH3_128bits(bytes.data(), bytes.size())); }

// XXH3-128 fed piece by piece: the same digest as hash_hex over the whole.
class StreamHash {
 public:
  StreamHash() : state_(XXH3_createState()) { XXH3_128bits_reset(state_.get()); }
  void add(std::string_view bytes) { XXH3_128bits_update(state_.get(), bytes.data(), bytes.size()); }
  std::string hex() const { return canonical_hex(XXH3_128bits_digest(state_.get())); }

 private:
  struct Free {
    void operator()(XXH3_state_t* s) const { XXH3_freeState(s); }
  };
  std::unique_ptr<XXH3_state_t, Free> state_;
};

enum class Format { kText, kMarkdown, kJsonl, kHtml, kPdf, kZip, kEml, kMbox, kGzip };

std::string lower_extension(std::string_view name) {
  std::string ext = std::filesystem::path(std::string(name)).extension().string();
  std::transform(ext.begin(), ext.end(), ext.begin(),
                 [](unsigned char c) { return static_cast<char>(c >= 'A' && c <= 'Z' ? c + 32 : c); });
  return ext;
}

// Content decides for the formats with a signature (a PDF named .txt is
// still a PDF); the extension decides the rest.
Format format_of(std::string_view name, std::string_view bytes) {
  if (bytes.substr(0, 2) == "\x1f\x8b") return Format::kGzip;
  if (bytes.substr(0, 5) == "%PDF-") return Format::kPdf;
  if (bytes.substr(0, 4) == "PK\x03\x04") return Format::kZip;
  const std::string ext = lower_extension(name);
  if (ext == ".jsonl" || ext == ".ndjson") return Format::kJsonl;
  if (ext == ".md" || ext == ".markdown") return Format::kMarkdown;
  if (ext == ".html" || ext == ".htm" || ext == ".xhtml") return Format::kHtml;
  if (ext == ".pdf") return Format::kPdf;
  if (ext == ".docx" || ext == ".odt" || ext == ".epub") return Format::kZip;
  if (ext == ".eml") return Format::kEml;
  if (ext == ".mbox" || ext == ".mbx") return Format::kMbox;
  return Format::kText;  // .txt, .text, no extension, and anything that decodes as text
}

// The warning for text cut at the limit, whether the cut came while
// unpacking or after reading (cap_text says it once).
std::string text_cut_warning(std::int64_t max_bytes) {
  return "extracted text cut at the limit of " + std::to_string(max_bytes) + " bytes (raise it with --max-text-mb)";
}

// Formats whose text comes from a prefix of their bytes: a prefix of the
// file gives a prefix of the text.
bool is_text_format(Format f) {
  return f == Format::kText || f == Format::kMarkdown || f == Format::kJsonl || f == Format::kHtml ||
         f == Format::kMbox;
}

// Reads `bytes` as the format `name` implies; `path` names the file in
// messages. A gzip file is unpacked once and read by its inner name.
Result<ingest::Parsed> parse(std::string_view bytes, std::string_view name, const std::string& path,
                             const ReadOptions& options, bool inside_gzip) {
  const Format format = format_of(name, bytes);
  switch (format) {
    case Format::kGzip: {
      if (inside_gzip) return Status::Unsupported(path + ": gzip inside gzip is not read");
      const std::string ext = lower_extension(name);
      const std::string_view inner_name = ext == ".gz" ? name.substr(0, name.size() - 3) : name;
      // Text formats keep at most the text limit: unpacked as a stream and
      // stopped there (the rest would be cut anyway). A format read whole
      // (PDF, zip container) is unpacked whole, within max_unpacked_bytes.
      bool cut = false;
      auto inner = ingest::gunzip(bytes, path, options.max_unpacked_bytes, options.max_text_bytes, &cut);
      if (!inner) return inner.status();
      if (cut && !is_text_format(format_of(inner_name, *inner))) {
        inner = ingest::gunzip(bytes, path, options.max_unpacked_bytes);
        if (!inner) return inner.status();
        cut = false;
      }
      if (cut) {  // end on a line, as the text before the limit would
        if (const std::size_t nl = inner->rfind('\n'); nl != std::string::npos) inner->resize(nl + 1);
      }
      auto parsed = parse(*inner, inner_name, path, options, true);
      if (parsed && cut) parsed->warnings.push_back(text_cut_warning(options.max_text_bytes));
      return parsed;
    }
    case Format::kPdf: return ingest::read_pdf(bytes, path, options);
    case Format::kZip: return ingest::read_zip_document(bytes, path, options);
    case Format::kHtml: return ingest::read_html(bytes, path, options);
    case Format::kEml: return ingest::read_mail(bytes, path, options, false);
    case Format::kMbox: return ingest::read_mail(bytes, path, options, true);
    default: break;
  }
  Result<ingest::DecodedText> decoded = ingest::decode_text(bytes, path);
  if (!decoded.ok()) return decoded.status();
  ingest::Parsed parsed;
  switch (format) {
    case Format::kJsonl: parsed = ingest::read_jsonl(decoded->text, path, options); break;
    case Format::kMarkdown: parsed = ingest::read_markdown(decoded->text, path); break;
    default: parsed = ingest::read_plain_text(decoded->text, path); break;
  }
  if (!decoded->warning.empty()) parsed.warnings.insert(parsed.warnings.begin(), decoded->warning);
  return parsed;
}

// Holds the documents' text to `max_bytes` in all, cutting at a character
// boundary and dropping documents past the cut.
void cap_text(std::vector<Document>& docs, std::int64_t max_bytes, std::vector<std::string>& warnings) {
  if (max_bytes <= 0) return;
  auto left = static_cast<std::size_t>(max_bytes);
  for (std::size_t i = 0; i < docs.size(); ++i) {
    Document& d = docs[i];
    if (d.body.size() + d.title.size() <= left) {
      left -= d.body.size() + d.title.size();
      continue;
    }
    d.body.resize(ingest::cut_utf8(d.body, left > d.title.size() ? left - d.title.size() : 0).size());
    while (!d.page_starts.empty() && d.page_starts.back() > d.body.size()) d.page_starts.pop_back();
    std::string warning = text_cut_warning(max_bytes);
    if (const std::size_t dropped = docs.size() - i - 1; dropped > 0)
      warning += "; " + std::to_string(dropped) + (dropped == 1 ? " document" : " documents") + " dropped";
    // Cut already while unpacking: one warning, the fuller one.
    std::erase(warnings, text_cut_warning(max_bytes));
    warnings.push_back(std::move(warning));
    docs.resize(i + 1);
    return;
  }
}

}  // namespace

Result<ReadResult> read_file(const std::string& path, const ReadOptions& options) {
  const std::string name = std::filesystem::path(path).filename().string();
  if (auto media = ingest::media_by_extension(name)) {  // never read, whatever its size
    auto opened = open_regular(path);
    if (!opened) return opened.status();
    ReadResult skipped;
    skipped.size = static_cast<std::int64_t>((*opened)->st.st_size);
    skipped.mtime_ns = mtime_of((*opened)->st);
    skipped.skipped = std::move(*media);
    return skipped;
  }
  Result<FileBytes> file = read_bytes(path, options.max_file_bytes);
  if (!file.ok()) return file.status();
  const std::string& bytes = file->data;

  ReadResult result;
  result.content_hash = hash_hex(bytes);
  result.size = static_cast<std::int64_t>(bytes.size());
  result.mtime_ns = file->mtime_ns;
  if (auto media = ingest::media_by_signature(bytes)) {
    result.skipped = std::move(*media);
    return result;
  }
  auto parsed = parse(bytes, name, path, options, false);
  if (!parsed && ingest::is_binary_refusal(parsed.status())) {
    const std::string m = parsed.status().message();
    result.skipped = "binary" + m.substr(m.find(": binary file (") + std::string_view(": binary file").size());
    return result;
  }
  if (!parsed) return parsed.status();
  result.documents = std::move(parsed->documents);
  result.warnings = std::move(parsed->warnings);
  cap_text(result.documents, options.max_text_bytes, result.warnings);
  return result;
}

Result<std::string> hash_file(const std::string& path, const ReadOptions& options) {
  // In pieces: a streamed JSON Lines file is never held whole.
  auto opened = open_regular(path);
  if (!opened) return opened.status();
  const struct stat& st = (*opened)->st;
  const std::int64_t max_bytes = streams_as_jsonl(path, st.st_size, options) ? 0 : options.max_file_bytes;
  if (max_bytes > 0 && st.st_size > max_bytes) return too_large(path, st.st_size, max_bytes);
  StreamHash hash;
  std::string buf(std::size_t{1} << 20, '\0');
  std::int64_t total = 0;
  for (;;) {
    auto got = read_some((*opened)->fd.get(), buf.data(), buf.size(), path);
    if (!got) return got.status();
    if (*got == 0) break;
    hash.add(std::string_view(buf).substr(0, *got));
    total += static_cast<std::int64_t>(*got);
    if (max_bytes > 0 && total > max_bytes) return too_large(path, total, max_bytes);
  }
  return hash.hex();
}

bool streams_as_jsonl(const std::string& path, std::int64_t size, const ReadOptions& options) {
  if (options.stream_jsonl_bytes <= 0) return false;
  const std::string name = std::filesystem::path(path).filename().string();
  const std::string_view inner =
      lower_extension(name) == ".gz" ? std::string_view(name).substr(0, name.size() - 3) : std::string_view(name);
  if (format_of(inner, "") != Format::kJsonl) return false;
  auto opened = open_regular(path);
  if (!opened) return false;
  char head[8];
  auto got = read_some((*opened)->fd.get(), head, sizeof head, path);
  if (!got) return false;
  switch (format_of(name, std::string_view(head, *got))) {
    case Format::kJsonl: return size > options.stream_jsonl_bytes;
    // Rule of thumb (common practice): gzip packs JSON text 5 to 10 times.
    case Format::kGzip: return size > options.stream_jsonl_bytes / 8;
    default: return false;
  }
}

// --- JsonlStream ---------------------------------------------------------------

struct JsonlStream::Impl {
  std::string path;
  ReadOptions options;
  std::unique_ptr<OpenFile> file;
  StreamHash hash;               // of the file's bytes, as read_file's
  std::unique_ptr<ingest::GzipInflater> gzip;  // set for gzip-compressed JSON Lines
  std::string packed;            // compressed bytes for `gzip`
  ingest::JsonlRecords records;
  std::string carry;             // the start of a line the last read cut
  std::int64_t file_bytes = 0;   // file bytes read (compressed, for gzip)
  std::int64_t offset = 0;       // text bytes read (unpacked): what warnings count in
  std::int64_t carry_at = 0;     // text offset of carry[0]
  bool at_end = false;
  bool skipping = false;         // inside a line too long to read, up to its '\n'
  std::size_t replaced = 0;      // invalid UTF-8 sequences replaced so far
  std::int64_t first_bad = -1;   // text offset of the first

  Impl(std::string p, ReadOptions o, std::unique_ptr<OpenFile> f)
      : path(std::move(p)), options(std::move(o)), file(std::move(f)), records(path, options) {}
  std::size_t max_line() const {
    return options.max_text_bytes > 0 ? static_cast<std::size_t>(options.max_text_bytes) : SIZE_MAX;
  }
  // Reads the whole lines of `text` (text offset `at`): UTF-8 repaired, then records.
  void take_lines(std::string_view text, std::int64_t at, std::vector<Document>& out);
  // Up to `want` bytes of the file, hashed as they pass; 0 at its end.
  Result<std::size_t> read_file_bytes(char* dst, std::size_t want) {
    auto got = read_some(file->fd.get(), dst, want, path);
    if (got.ok()) {
      hash.add(std::string_view(dst, *got));
      file_bytes += static_cast<std::int64_t>(*got);
    }
    return got;
  }
  // Up to `want` bytes of text: the file's, or what its gzip data unpacks to.
  Result<std::size_t> read_text(char* dst, std::size_t want) {
    return gzip ? gzip->read(dst, want) : read_file_bytes(dst, want);
  }
};

void JsonlStream::Impl::take_lines(std::string_view text, std::int64_t at, std::vector<Document>& out) {
  if (is_valid_utf8(text)) {
    records.add(text, out);
    return;
  }
  Utf8Repair fixed = repair_utf8(text);
  if (first_bad < 0) first_bad = at + static_cast<std::int64_t>(fixed.first_bad_offset);
  replaced += fixed.replaced;
  records.add(fixed.text, out);
}

JsonlStream::JsonlStream(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
JsonlStream::~JsonlStream() = default;

Result<std::unique_ptr<JsonlStream>> JsonlStream::open(const std::string& path, const ReadOptions& options) {
  auto opened = open_regular(path);
  if (!opened) return opened.status();
  char magic[2] = {0, 0};
  const bool gzip = ::pread((*opened)->fd.get(), magic, 2, 0) == 2 && magic[0] == '\x1f' && magic[1] == '\x8b';
  auto impl = std::make_unique<Impl>(path, options, std::move(*opened));
  if (gzip) {
    Impl* m = impl.get();
    m->packed.resize(std::size_t{1} << 20);
    m->gzip = std::make_unique<ingest::GzipInflater>(path, [m]() -> Result<std::string_view> {
      auto got = m->read_file_bytes(m->packed.data(), m->packed.size());
      if (!got) return got.status();
      return std::string_view(m->packed.data(), *got);
    });
  }
  return std::unique_ptr<JsonlStream>(new JsonlStream(std::move(impl)));
}

std::int64_t JsonlStream::bytes_read() const { return impl_->file_bytes; }

Result<std::vector<Document>> JsonlStream::next(std::size_t slice_bytes) {
  Impl& m = *impl_;
  std::vector<Document> out;
  std::string buf;
  while (out.empty() && !m.at_end) {
    buf.resize(std::max<std::size_t>(slice_bytes, 1));
    auto got = m.read_text(buf.data(), buf.size());
    if (!got) return got.status();
    buf.resize(*got);
    std::string_view fresh(buf);
    std::int64_t fresh_at = m.offset;
    m.offset += static_cast<std::int64_t>(*got);
    if (*got == 0) {
      m.at_end = true;
      struct stat after {};
      if (::fstat(m.file->fd.get(), &after) == 0 && (moved(m.file->st, after) || m.file_bytes != m.file->st.st_size))
        return changed_while_read(m.path);
    }
    // The checks read_file makes at the start of a file.
    LODE_RETURN_IF_ERROR(ingest::refuse_binary(fresh, fresh_at, m.path));
    if (fresh_at == 0 && fresh.substr(0, 3) == "\xEF\xBB\xBF") {
      fresh.remove_prefix(3);
      fresh_at = 3;
    }
    if (m.at_end) {  // a last line with no '\n'
      if (!m.carry.empty() && !m.skipping) m.take_lines(m.carry, m.carry_at, out);
      m.carry.clear();
      break;
    }
    // Whole lines are read now; a line the read cut waits in `carry`. A line
    // longer than max_line() is dropped as it streams past, never held.
    while (!fresh.empty()) {
      const std::size_t nl = fresh.find('\n');
      const std::size_t part = nl == std::string_view::npos ? fresh.size() : nl + 1;  // with its '\n'
      if (!m.skipping && m.carry.size() + part > m.max_line() + 1) {
        m.records.skip_line("longer than " + std::to_string(m.max_line()) + " bytes (raise it with --max-text-mb)");
        m.carry.clear();
        m.skipping = true;
      }
      if (nl == std::string_view::npos) {  // the line goes on in the next read
        if (!m.skipping) {
          if (m.carry.empty()) m.carry_at = fresh_at;
          m.carry.append(fresh);
        }
        break;
      }
      if (m.skipping) {
        m.skipping = false;
      } else if (m.carry.empty()) {
        // Usually: every whole line of the read in one go, when they are
        // too few bytes together for any one of them to be too long.
        const std::size_t end = fresh.rfind('\n') + 1;
        if (end <= m.max_line() + 1) {
          m.take_lines(fresh.substr(0, end), fresh_at, out);
          fresh.remove_prefix(end);
          fresh_at += static_cast<std::int64_t>(end);
          continue;
        }
        m.take_lines(fresh.substr(0, part), fresh_at, out);
      } else {
        m.carry.append(fresh.substr(0, part));
        m.take_lines(m.carry, m.carry_at, out);
        m.carry.clear();
      }
      fresh.remove_prefix(part);
      fresh_at += static_cast<std::int64_t>(part);
    }
  }
  return out;
}

ReadResult JsonlStream::finish() {
  Impl& m = *impl_;
  ReadResult r;
  r.content_hash = m.hash.hex();
  r.size = m.file_bytes;
  r.mtime_ns = mtime_of(m.file->st);
  r.warnings = m.records.warnings();
  if (m.replaced > 0) r.warnings.insert(r.warnings.begin(), ingest::invalid_utf8_warning(m.first_bad, m.replaced));
  return r;
}

}  // namespace lode
