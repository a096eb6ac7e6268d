#include "server/host_check.h"

#include <arpa/inet.h>

#include <cctype>

namespace lode::server {
namespace {

bool is_address_literal(const std::string& name) {
  unsigned char buf[sizeof(in6_addr)];
  return inet_pton(AF_INET, name.c_str(), buf) == 1 || inet_pton(AF_INET6, name.c_str(), buf) == 1;
}

}  // namespace

std::string host_name(std::string_view host) {
  std::string_view name = host;
  if (!name.empty() && name.front() == '[') {
    std::size_t close = name.find(']');
    name = close == std::string_view::npos ? std::string_view{} : name.substr(1, close - 1);
  } else if (std::size_t colon = name.rfind(':'); colon != std::string_view::npos) {
    name = name.substr(0, colon);
  }
  if (!name.empty() && name.back() == '.') name.remove_suffix(1);
  std::string out(name);
  for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

HostCheck::HostCheck(const std::string& listen_address, const std::vector<std::string>& reached_as) {
  names_.push_back("localhost");
  names_.push_back(host_name(listen_address.find(':') != std::string::npos && listen_address.front() != '['
                                 ? "[" + listen_address + "]"
                                 : listen_address));
  for (const std::string& n : reached_as) names_.push_back(host_name(n));
}

bool HostCheck::allowed(std::string_view host) const {
  std::string name = host_name(host);
  if (name.empty()) return false;
  if (is_address_literal(name)) return true;
  for (const std::string& n : names_)
    if (n == name) return true;
  return false;
}

}  // namespace lode::server
