// An httplib::Stream over memory: the request comes from the connection's
// buffer (already whole, see connection_loop.h) and the response goes to a
// string, so a worker running cpp-httplib's parser and router never touches
// a socket and never waits for a client.
#pragma once

#include <httplib.h>

#include <algorithm>
#include <cstring>
#include <string>
#include <string_view>

namespace lode::server {

class BufferStream : public httplib::Stream {
 public:
  BufferStream(std::string_view in, std::string& out, std::string remote, int remote_port)
      : in_(in), out_(out), remote_(std::move(remote)), remote_port_(remote_port) {}

  std::size_t consumed() const { return at_; }

  bool is_readable() const override { return at_ < in_.size(); }
  bool is_writable() const override { return true; }
  ssize_t read(char* ptr, size_t size) override {
    std::size_t n = std::min(size, in_.size() - at_);
    std::memcpy(ptr, in_.data() + at_, n);
    at_ += n;
    return static_cast<ssize_t>(n);
  }
  ssize_t write(const char* ptr, size_t size) override {
    out_.append(ptr, size);
    return static_cast<ssize_t>(size);
  }
  void get_remote_ip_and_port(std::string& ip, int& port) const override {
    ip = remote_;
    port = remote_port_;
  }
  void get_local_ip_and_port(std::string& ip, int& port) const override {
    ip.clear();
    port = 0;
  }
  socket_t socket() const override { return INVALID_SOCKET; }

 private:
  std::string_view in_;
  std::size_t at_ = 0;
  std::string& out_;
  std::string remote_;
  int remote_port_;
};

}  // namespace lode::server
