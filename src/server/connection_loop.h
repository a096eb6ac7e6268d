// The connection thread in front of the worker pool. One thread owns every
// socket (epoll, level-triggered): it accepts, reads each request whole into
// its connection's buffer, hands whole requests to a bounded queue served by
// `workers` threads, and writes their responses out without blocking. So a
// slow, idle or keep-alive client costs a buffer and a socket, never a worker.
//
// Bounds: open connections (`max_connections`; beyond, 503 and close), a
// request's head and body (`max_head_bytes`, `max_body_bytes`), the time a
// request may take to arrive (`head_deadline`, then 408), an idle keep-alive
// connection (`idle_timeout`, then a silent close), the time a response may
// take to leave (`write_timeout`), and requests waiting for a worker
// (`max_queued` beyond those the workers hold; then 503 with Retry-After at
// once). A connection holds at
// most one request's bytes and one response at a time.
//
// The loop knows bytes, not HTTP routes: `handle` turns one buffered request
// into response bytes, `answer_inline` picks requests cheap enough to answer
// on the connection thread itself (health), and `refusal` writes the
// responses the loop gives on its own.
//
// Thread safety: create() and run() from one thread; run() blocks; stop() and
// load() from any thread. Destroy after run() returns (or without running).
#pragma once

#include <atomic>
#include <chrono>
#include <condition_variable>
#include <cstddef>
#include <cstdint>
#include <deque>
#include <functional>
#include <memory>
#include <mutex>
#include <string>
#include <string_view>
#include <thread>
#include <unordered_map>
#include <vector>

#include "lode/status.h"
#include "server/request_frame.h"

namespace lode::server {

// One whole request and the response to it.
struct Exchange {
  std::string_view request;     // starts with one whole request (more may follow: pipelining)
  std::string remote_address;   // the client's address and port
  int remote_port = 0;
  bool last = false;            // the connection closes after this response (stopping, request cap)
  // Set by the handler:
  std::string response;         // the whole HTTP response
  std::size_t consumed = 0;     // bytes of `request` used (0 = all of the framed request)
  bool close = false;           // close after the response (the client asked, or the request was unreadable)
};

struct LoopLimits {
  std::size_t workers = 8;
  std::size_t max_connections = 512;
  std::size_t max_queued = 64;
  std::size_t max_head_bytes = 16 * 1024;
  std::size_t max_body_bytes = 16 * 1024;
  std::size_t max_requests_per_connection = 1000;
  std::chrono::milliseconds head_deadline{10000};
  std::chrono::milliseconds idle_timeout{5000};
  std::chrono::milliseconds write_timeout{10000};
};

struct LoopHooks {
  std::function<void(Exchange&)> handle;                  // on a worker, or the loop when answered inline
  std::function<bool(std::string_view head)> answer_inline;  // true: handle on the connection thread
  // The whole response for a refusal (the loop closes the connection after it).
  std::function<std::string(Refusal, const std::string& remote_address)> refusal;
};

// A snapshot of the loop's state, for /api/v1/health.
struct LoopLoad {
  std::size_t open_connections = 0;
  std::size_t queued = 0;          // whole requests waiting for a worker
  std::size_t busy_workers = 0;
  std::uint64_t refused_busy = 0;          // 503: queue full
  std::uint64_t refused_connections = 0;   // 503: connection cap
  std::uint64_t timed_out = 0;             // 408: request too slow to arrive
};

class ConnectionLoop {
 public:
  // Takes `listen_fd` (bound and listening; closed by the loop). Errors:
  // IOError when epoll or the wake-up descriptor cannot be made.
  static Result<std::unique_ptr<ConnectionLoop>> create(int listen_fd, LoopLimits limits, LoopHooks hooks);
  ~ConnectionLoop();
  ConnectionLoop(const ConnectionLoop&) = delete;
  ConnectionLoop& operator=(const ConnectionLoop&) = delete;

  // Serves until stop(): then stops accepting, closes connections that wait
  // for a request, lets dispatched requests finish and their responses go
  // out (up to a second for clients that do not read), and returns.
  Status run();
  void stop();
  LoopLoad load() const;

 private:
  struct Conn;
  ConnectionLoop(int listen_fd, int epoll_fd, int wake_fd, LoopLimits limits, LoopHooks hooks);

  void accept_all();
  void on_event(int fd, std::uint32_t events);
  void advance(Conn& c);               // reads framed requests and writes responses until it must wait
  bool start_next(Conn& c);            // true: a response is ready to write
  bool flush(Conn& c);                 // true: the response is out and the connection still open
  void respond(Conn& c, std::string bytes, std::size_t consumed, bool close);
  bool read_some(Conn& c);             // false: the peer closed or failed
  void interest(Conn& c, std::uint32_t events);
  void close_conn(Conn& c);
  void sweep();                        // deadlines
  void collect_done();
  void begin_stop();
  void worker();

  int listen_fd_, epoll_fd_, wake_fd_;
  LoopLimits limits_;
  LoopHooks hooks_;
  std::unordered_map<int, std::unique_ptr<Conn>> conns_;  // loop thread only
  bool stopping_ = false;                                 // loop thread only
  std::chrono::steady_clock::time_point stop_started_;
  std::atomic<bool> stop_requested_{false};

  std::mutex mu_;
  std::condition_variable work_ready_;
  std::deque<Conn*> queue_;   // guarded by mu_
  std::vector<Conn*> done_;   // guarded by mu_
  std::size_t outstanding_ = 0;  // dispatched, not yet done; guarded by mu_
  bool workers_quit_ = false; // guarded by mu_
  std::vector<std::thread> workers_;

  std::atomic<std::size_t> open_{0}, queued_{0}, busy_{0};
  std::atomic<std::uint64_t> refused_busy_{0}, refused_connections_{0}, timed_out_{0};
};

}  // namespace lode::server
