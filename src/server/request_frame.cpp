#include "server/request_frame.h"

#include <cctype>

namespace lode::server {
namespace {

bool iequals(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i)
    if (std::tolower(static_cast<unsigned char>(a[i])) != std::tolower(static_cast<unsigned char>(b[i]))) return false;
  return true;
}

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
  return s;
}

// Length of the head including its empty line (CRLF or bare LF endings, as
// cpp-httplib accepts both), or 0 when the empty line has not arrived.
std::size_t head_length(std::string_view b) {
  for (std::size_t at = b.find('\n'); at != std::string_view::npos; at = b.find('\n', at + 1)) {
    if (at + 1 < b.size() && b[at + 1] == '\n') return at + 2;
    if (at + 2 < b.size() && b[at + 1] == '\r' && b[at + 2] == '\n') return at + 3;
  }
  return 0;
}

Frame refused(Refusal r) {
  Frame f;
  f.state = Frame::State::kRefused;
  f.refusal = r;
  return f;
}

}  // namespace

Frame frame_request(std::string_view buffer, std::size_t max_head, std::size_t max_body) {
  std::size_t head_len = head_length(buffer.substr(0, max_head));
  if (head_len == 0) return buffer.size() >= max_head ? refused(Refusal::kHeadTooLarge) : Frame{};
  Frame f;
  f.head = buffer.substr(0, head_len);
  std::size_t body = 0;
  bool continue_asked = false;
  std::string_view rest = f.head.substr(f.head.find('\n') + 1);
  while (!rest.empty()) {
    std::size_t end = rest.find('\n');
    std::string_view line = rest.substr(0, end);
    rest.remove_prefix(end == std::string_view::npos ? rest.size() : end + 1);
    std::size_t colon = line.find(':');
    if (colon == std::string_view::npos) continue;
    std::string_view name = line.substr(0, colon), value = trim(line.substr(colon + 1));
    if (iequals(name, "Transfer-Encoding")) return refused(Refusal::kLengthRequired);
    if (iequals(name, "Expect")) continue_asked = iequals(value, "100-continue");
    if (!iequals(name, "Content-Length")) continue;
    if (value.empty() || value.size() > 12) return refused(Refusal::kBadFraming);
    body = 0;
    for (char c : value) {
      if (c < '0' || c > '9') return refused(Refusal::kBadFraming);
      body = body * 10 + static_cast<std::size_t>(c - '0');
    }
  }
  if (body > max_body) return refused(Refusal::kBodyTooLarge);
  if (buffer.size() < head_len + body) {
    f.expects_continue = continue_asked;
    return f;
  }
  f.state = Frame::State::kComplete;
  f.length = head_len + body;
  return f;
}

std::string_view request_path(std::string_view head) {
  std::size_t sp = head.find(' ');
  if (sp == std::string_view::npos) return {};
  std::string_view target = head.substr(sp + 1);
  std::size_t end = target.find_first_of(" ?#\r\n");
  return end == std::string_view::npos ? std::string_view{} : target.substr(0, end);
}

bool is_read_method(std::string_view head) {
  return head.substr(0, 4) == "GET " || head.substr(0, 5) == "HEAD ";
}

}  // namespace lode::server
