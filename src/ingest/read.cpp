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

Result<std::string> read_bytes(const std::string& path, std::int64_t max_bytes) {
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
  return data;
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

enum class Format { kText, kMarkdown, kJsonl };

Format format_of(const std::string& path) {
  std::string ext = std::filesystem::path(path).extension().string();
  std::transform(ext.begin(), ext.end(), ext.begin(),
                 [](unsigned char c) { return static_cast<char>(c >= 'A' && c <= 'Z' ? c + 32 : c); });
  if (ext == ".jsonl" || ext == ".ndjson") return Format::kJsonl;
  if (ext == ".md" || ext == ".markdown") return Format::kMarkdown;
  return Format::kText;  // .txt, .text, no extension, and anything that decodes as text
}

}  // namespace

Result<ReadResult> read_file(const std::string& path, const ReadOptions& options) {
  Result<std::string> bytes = read_bytes(path, options.max_file_bytes);
  if (!bytes.ok()) return bytes.status();

  ReadResult result;
  result.content_hash = hash_hex(*bytes);
  Result<ingest::DecodedText> decoded = ingest::decode_text(*bytes, path);
  if (!decoded.ok()) return decoded.status();
  if (!decoded->warning.empty()) result.warnings.push_back(decoded->warning);

  ingest::Parsed parsed;
  switch (format_of(path)) {
    case Format::kJsonl: parsed = ingest::read_jsonl(decoded->text, path, options); break;
    case Format::kMarkdown: parsed = ingest::read_markdown(decoded->text, path); break;
    case Format::kText: parsed = ingest::read_plain_text(decoded->text, path); break;
  }
  result.documents = std::move(parsed.documents);
  result.warnings.insert(result.warnings.end(), parsed.warnings.begin(), parsed.warnings.end());
  return result;
}

}  // namespace lode
