#include "ingest/zip_archive.h"

#include <zip.h>

#include <algorithm>

namespace lode::ingest {

struct ZipArchive::Impl {
  zip_t* zip = nullptr;
  std::string path;
  std::int64_t budget = 0;  // bytes still allowed; < 0 when unlimited
  std::int64_t limit = 0;
  ~Impl() {
    if (zip != nullptr) zip_discard(zip);
  }
};

ZipArchive::ZipArchive(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
ZipArchive::~ZipArchive() = default;

Result<std::unique_ptr<ZipArchive>> ZipArchive::open(std::string_view bytes, const std::string& path,
                                                     std::int64_t max_unpacked) {
  zip_error_t error;
  zip_error_init(&error);
  zip_source_t* src = zip_source_buffer_create(bytes.data(), bytes.size(), 0, &error);
  if (src == nullptr) {
    std::string why = zip_error_strerror(&error);
    zip_error_fini(&error);
    return Status::Corruption(path + ": damaged zip container (" + why + ")");
  }
  zip_t* zip = zip_open_from_source(src, ZIP_RDONLY, &error);
  if (zip == nullptr) {
    std::string why = zip_error_strerror(&error);
    zip_source_free(src);
    zip_error_fini(&error);
    return Status::Corruption(path + ": damaged zip container (" + why + ")");
  }
  zip_error_fini(&error);
  auto impl = std::make_unique<Impl>();
  impl->zip = zip;
  impl->path = path;
  impl->limit = max_unpacked;
  impl->budget = max_unpacked > 0 ? max_unpacked : -1;
  return std::unique_ptr<ZipArchive>(new ZipArchive(std::move(impl)));
}

bool ZipArchive::has(const std::string& name) const { return zip_name_locate(impl_->zip, name.c_str(), 0) >= 0; }

Result<std::string> ZipArchive::read(const std::string& name) {
  auto& m = *impl_;
  const auto budget_exceeded = [](const Impl& z) {
    return Status::Limit(z.path + ": zip container expands past " + std::to_string(z.limit) +
                         " bytes (limit on unpacked size; a zip bomb?)");
  };
  const zip_int64_t index = zip_name_locate(m.zip, name.c_str(), 0);
  if (index < 0) return Status::NotFound(m.path + ": no entry '" + name + "' in the container");
  zip_stat_t st;
  zip_stat_init(&st);
  const bool stat_ok = zip_stat_index(m.zip, static_cast<zip_uint64_t>(index), 0, &st) == 0;
  if (stat_ok && (st.valid & ZIP_STAT_ENCRYPTION_METHOD) && st.encryption_method != ZIP_EM_NONE)
    return Status::Unsupported(m.path + ": password-protected (entry '" + name + "' is encrypted)");
  // An entry that says it unpacks past what is left is refused before a
  // byte is inflated; one that lies about its size is stopped as it
  // unpacks, below.
  if (m.budget >= 0 && stat_ok && (st.valid & ZIP_STAT_SIZE) && st.size > static_cast<zip_uint64_t>(m.budget))
    return budget_exceeded(m);
  zip_file_t* f = zip_fopen_index(m.zip, static_cast<zip_uint64_t>(index), 0);
  if (f == nullptr)
    return Status::Corruption(m.path + ": cannot open entry '" + name + "' (" + zip_strerror(m.zip) + ")");
  std::string out;
  char buf[65536];
  for (;;) {
    const zip_int64_t got = zip_fread(f, buf, sizeof buf);
    if (got < 0) {
      std::string why = zip_error_strerror(zip_file_get_error(f));
      zip_fclose(f);
      return Status::Corruption(m.path + ": entry '" + name + "' does not inflate (" + why + ")");
    }
    if (got == 0) break;
    if (m.budget >= 0) {
      m.budget -= got;
      if (m.budget < 0) {
        zip_fclose(f);
        return budget_exceeded(m);
      }
      // Grown by doubling up to the budget and no further: left to double
      // by itself, the string could hold twice the limit.
      if (out.size() + static_cast<std::size_t>(got) > out.capacity())
        out.reserve(std::max(out.size() + static_cast<std::size_t>(got),
                             std::min(std::max<std::size_t>(out.capacity() * 2, sizeof buf),
                                      out.size() + static_cast<std::size_t>(m.budget) + sizeof buf)));
    }
    out.append(buf, static_cast<std::size_t>(got));
  }
  zip_fclose(f);
  return out;
}

}  // namespace lode::ingest
