// read_file(): file access, content hash and dispatch to a format reader.
// POSIX open/read rather than iostreams: the errors must carry errno's text,
// and O_NONBLOCK keeps a named pipe from hanging the open.
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>
#include <xxhash.h>

#include <algorithm>
#include <cerrno>
#include <filesystem>
#include <system_error>

#include "ingest/decode.h"
#include "ingest/readers.h"
#include "ingest/text_util.h"
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

Result<FileBytes> read_bytes(const std::string& path, std::int64_t max_bytes) {
  FileDescriptor fd(::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK));
  if (fd.get() < 0) {
    const int err = errno;
    if (err == ENOENT || err == ENOTDIR) return Status::NotFound(path + ": no such file");
    return Status::IOError(path + ": " + errno_text(err));
  }
  struct stat st {};
  if (::fstat(fd.get(), &st) != 0) {
    const int err = errno;
    return Status::IOError(path + ": " + errno_text(err));
  }
  if (S_ISDIR(st.st_mode)) return Status::IOError(path + ": " + errno_text(EISDIR));
  if (!S_ISREG(st.st_mode)) return Status::Unsupported(path + ": not a regular file");
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
    const std::size_t want = in_place ? data.size() - have : sizeof extra;
    const ssize_t got = ::read(fd.get(), dst, want);
    if (got < 0) {
      const int err = errno;
      if (err == EINTR) continue;
      return Status::IOError(path + ": " + errno_text(err));
    }
    if (got == 0) break;
    if (!in_place) data.append(extra, static_cast<std::size_t>(got));
    have += static_cast<std::size_t>(got);
    const auto total = static_cast<std::int64_t>(have);
    if (max_bytes > 0 && total > max_bytes) return too_large(path, total, max_bytes);
  }
  data.resize(have);  // the file shrank, if have < st_size
  // A writer busy with the file while we read it leaves a torn copy: refuse
  // it now; the next run sees the finished file.
  struct stat after {};
  if (::fstat(fd.get(), &after) == 0 &&
      (after.st_size != st.st_size || after.st_mtim.tv_sec != st.st_mtim.tv_sec ||
       after.st_mtim.tv_nsec != st.st_mtim.tv_nsec || static_cast<std::int64_t>(have) != size))
    return Status::IOError(path + ": changed while being read (size or modification time moved)");
  return FileBytes{std::move(data), std::int64_t{st.st_mtim.tv_sec} * 1000000000 + st.st_mtim.tv_nsec};
}

std::string hash_hex(std::string_view bytes) {
  const XXH128_hash_t h = XXH3_128bits(bytes.data(), bytes.size());
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

// Reads `bytes` as the format `name` implies; `path` names the file in
// messages. A gzip file is unpacked once and read by its inner name.
Result<ingest::Parsed> parse(std::string_view bytes, std::string_view name, const std::string& path,
                             const ReadOptions& options, bool inside_gzip) {
  const Format format = format_of(name, bytes);
  switch (format) {
    case Format::kGzip: {
      if (inside_gzip) return Status::Unsupported(path + ": gzip inside gzip is not read");
      auto inner = ingest::gunzip(bytes, path, options.max_unpacked_bytes);
      if (!inner) return inner.status();
      const std::string ext = lower_extension(name);
      const std::string_view inner_name = ext == ".gz" ? name.substr(0, name.size() - 3) : name;
      return parse(*inner, inner_name, path, options, true);
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
    std::string warning = "extracted text cut at the limit of " + std::to_string(max_bytes) +
                          " bytes (raise it with --max-text-mb)";
    if (const std::size_t dropped = docs.size() - i - 1; dropped > 0)
      warning += "; " + std::to_string(dropped) + (dropped == 1 ? " document" : " documents") + " dropped";
    warnings.push_back(std::move(warning));
    docs.resize(i + 1);
    return;
  }
}

}  // namespace

Result<ReadResult> read_file(const std::string& path, const ReadOptions& options) {
  Result<FileBytes> file = read_bytes(path, options.max_file_bytes);
  if (!file.ok()) return file.status();
  const std::string& bytes = file->data;

  ReadResult result;
  result.content_hash = hash_hex(bytes);
  result.size = static_cast<std::int64_t>(bytes.size());
  result.mtime_ns = file->mtime_ns;
  auto parsed = parse(bytes, std::filesystem::path(path).filename().string(), path, options, false);
  if (!parsed) return parsed.status();
  result.documents = std::move(parsed->documents);
  result.warnings = std::move(parsed->warnings);
  cap_text(result.documents, options.max_text_bytes, result.warnings);
  return result;
}

Result<std::string> hash_file(const std::string& path, const ReadOptions& options) {
  Result<FileBytes> file = read_bytes(path, options.max_file_bytes);
  if (!file.ok()) return file.status();
  return hash_hex(file->data);
}

}  // namespace lode
