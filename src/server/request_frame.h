// Where one HTTP/1.1 request ends in a connection's buffer, read from its
// head alone, so the connection thread can hold a request until it is whole
// and refuse an oversized one before reading it. Only what framing needs is
// parsed here (the empty line, Content-Length, Transfer-Encoding, Expect);
// cpp-httplib parses the request itself on the worker.
#pragma once

#include <cstddef>
#include <string_view>

namespace lode::server {

// Why the connection thread answers a request itself (status in brackets).
enum class Refusal {
  kHeadTooLarge,        // request line and headers over the cap (431)
  kBodyTooLarge,        // Content-Length over the cap (413)
  kLengthRequired,      // a body without Content-Length, e.g. chunked (411)
  kBadFraming,          // an unreadable Content-Length (400)
  kTooSlow,             // the request did not arrive within the head deadline (408)
  kBusy,                // every worker busy and the queue full (503, Retry-After)
  kTooManyConnections,  // the connection cap is reached (503, Retry-After)
};

struct Frame {
  enum class State { kIncomplete, kComplete, kRefused };
  State state = State::kIncomplete;
  std::size_t length = 0;        // kComplete: bytes of head and body
  Refusal refusal = Refusal::kBadFraming;  // kRefused
  bool expects_continue = false;  // head whole, body not yet, client sent "Expect: 100-continue"
  std::string_view head;          // the head when whole (request line first)
};

// Frames the request at the start of `buffer`. A head without its empty line
// within `max_head` bytes, or a Content-Length over `max_body`, is refused
// at once, whatever has arrived.
Frame frame_request(std::string_view buffer, std::size_t max_head, std::size_t max_body);

// The path of the request line of `head` without its query ("" if unreadable),
// and whether the method is GET or HEAD.
std::string_view request_path(std::string_view head);
bool is_read_method(std::string_view head);

}  // namespace lode::server
