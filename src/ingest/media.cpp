#include "ingest/media.h"

#include <array>
#include <filesystem>

namespace lode::ingest {
namespace {

struct ByExtension {
  std::string_view ext;   // with the dot, lower case
  std::string_view what;
};

// Kinds a user keeps beside documents and no reader extracts text from.
// .zip is here: a bare archive is not a document (DOCX/ODT/EPUB are read by
// their own extensions and signature).
constexpr std::array<ByExtension, 62> kExtensions{{
    {".png", "image"},     {".jpg", "image"},     {".jpeg", "image"},   {".gif", "image"},
    {".bmp", "image"},     {".tif", "image"},     {".tiff", "image"},   {".webp", "image"},
    {".heic", "image"},    {".heif", "image"},    {".avif", "image"},   {".ico", "image"},
    {".psd", "image"},     {".raw", "image"},     {".cr2", "image"},    {".nef", "image"},
    {".dng", "image"},     {".xcf", "image"},     {".mp3", "audio"},    {".wav", "audio"},
    {".flac", "audio"},    {".ogg", "audio"},     {".oga", "audio"},    {".opus", "audio"},
    {".m4a", "audio"},     {".aac", "audio"},     {".aiff", "audio"},   {".wma", "audio"},
    {".mid", "audio"},     {".mp4", "video"},     {".m4v", "video"},    {".mov", "video"},
    {".mkv", "video"},     {".webm", "video"},    {".avi", "video"},    {".wmv", "video"},
    {".flv", "video"},     {".mpg", "video"},     {".mpeg", "video"},   {".zip", "archive"},
    {".tar", "archive"},   {".tgz", "archive"},   {".bz2", "archive"},  {".xz", "archive"},
    {".zst", "archive"},   {".7z", "archive"},    {".rar", "archive"},  {".iso", "disk image"},
    {".dmg", "disk image"}, {".img", "disk image"}, {".ttf", "font"},   {".otf", "font"},
    {".woff", "font"},     {".woff2", "font"},    {".exe", "program"},  {".dll", "program"},
    {".so", "program"},    {".o", "program"},     {".a", "program"},    {".class", "program"},
    {".pyc", "program"},   {".sqlite", "database"},
}};

struct BySignature {
  std::size_t at;          // byte offset of the signature
  std::string_view magic;
  std::string_view what;
};

constexpr std::array<BySignature, 17> kSignatures{{
    {0, std::string_view("\x89PNG\r\n\x1a\n", 8), "image (PNG signature)"},
    {0, std::string_view("\xff\xd8\xff", 3), "image (JPEG signature)"},
    {0, "GIF87a", "image (GIF signature)"},
    {0, "GIF89a", "image (GIF signature)"},
    {0, std::string_view("II*\0", 4), "image (TIFF signature)"},
    {0, std::string_view("MM\0*", 4), "image (TIFF signature)"},
    {0, "8BPS", "image (Photoshop signature)"},
    {0, "ID3", "audio (MP3 signature)"},
    {0, "OggS", "audio (Ogg signature)"},
    {0, "fLaC", "audio (FLAC signature)"},
    {0, "RIFF", "media (RIFF signature: WAV, AVI or WebP)"},
    {4, "ftyp", "media (ISO base media signature: MP4, MOV, HEIC)"},
    {0, std::string_view("\x1a\x45\xdf\xa3", 4), "video (Matroska signature)"},
    {0, std::string_view("\x7f" "ELF", 4), "program (ELF signature)"},
    {0, std::string_view("7z\xbc\xaf\x27\x1c", 6), "archive (7-Zip signature)"},
    {0, "Rar!", "archive (RAR signature)"},
    {0, std::string_view("SQLite format 3\0", 16), "database (SQLite signature)"},
}};

}  // namespace

std::optional<std::string> media_by_extension(std::string_view name) {
  std::string ext = std::filesystem::path(std::string(name)).extension().string();
  for (char& c : ext) c = c >= 'A' && c <= 'Z' ? static_cast<char>(c + 32) : c;
  for (const ByExtension& e : kExtensions)
    if (e.ext == ext) return std::string(e.what) + " (" + ext + ")";
  return std::nullopt;
}

std::optional<std::string> media_by_signature(std::string_view head) {
  for (const BySignature& s : kSignatures)
    if (head.size() >= s.at + s.magic.size() && head.substr(s.at, s.magic.size()) == s.magic)
      return std::string(s.what);
  return std::nullopt;
}

}  // namespace lode::ingest
