// The Host header check against DNS rebinding. A page on a name the attacker
// controls can have that name resolve to 127.0.0.1 and then read our API as
// "same origin", but its requests still carry the attacker's name in Host.
// So, without a token, the server answers only Host values that name it:
// address literals (an address is its own origin: no rebinding through one),
// "localhost", the address it listens on, and the names the operator lists
// (ServeOptions::reached_as). The port is not compared: a reverse proxy may
// change it, and the name alone decides what a browser treats as the origin.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace lode::server {

class HostCheck {
 public:
  HostCheck(const std::string& listen_address, const std::vector<std::string>& reached_as);
  // True when `host` (a Host header value, "" if absent) names this server.
  bool allowed(std::string_view host) const;

 private:
  std::vector<std::string> names_;  // lower case, without a trailing dot
};

// The name part of a Host value: "[::1]:80" -> "::1", "Name.:80" -> "name".
std::string host_name(std::string_view host);

}  // namespace lode::server
