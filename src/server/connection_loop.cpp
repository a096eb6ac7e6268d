#include "server/connection_loop.h"

#include <arpa/inet.h>
#include <fcntl.h>
#include <netinet/in.h>
#include <netinet/tcp.h>
#include <sys/epoll.h>
#include <sys/eventfd.h>
#include <sys/socket.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace lode::server {

using Clock = std::chrono::steady_clock;

namespace {

// How often deadlines are checked: their resolution, not a limit.
constexpr std::chrono::milliseconds kTick{100};
// Clients that do not read their last response get this long once stopping.
constexpr std::chrono::milliseconds kStopGrace{1000};
// A buffer grown beyond this for one large response is given back after it.
constexpr std::size_t kKeepCapacity = 64 * 1024;

std::string peer_address(const sockaddr_storage& a, int* port) {
  char text[INET6_ADDRSTRLEN] = "?";
  if (a.ss_family == AF_INET) {
    auto* v4 = reinterpret_cast<const sockaddr_in*>(&a);
    inet_ntop(AF_INET, &v4->sin_addr, text, sizeof text);
    *port = ntohs(v4->sin_port);
  } else if (a.ss_family == AF_INET6) {
    auto* v6 = reinterpret_cast<const sockaddr_in6*>(&a);
    inet_ntop(AF_INET6, &v6->sin6_addr, text, sizeof text);
    *port = ntohs(v6->sin6_port);
  }
  return text;
}

}  // namespace

struct ConnectionLoop::Conn {
  enum class Phase { kReading, kWorking, kWriting };
  int fd = -1;
  Phase phase = Phase::kReading;
  std::string in;               // received, not yet consumed
  std::string out;              // the response being written
  std::size_t out_at = 0;
  std::size_t served = 0;       // responses so far
  std::size_t consumed = 0;     // set by a worker: bytes of `in` its request used
  bool close_after = false;     // close once `out` is written
  bool peer_closed = false;     // the client sent EOF
  bool sent_continue = false;   // "100 Continue" sent for the request being read
  std::uint32_t events = 0;     // epoll interest now (0 = not registered)
  Clock::time_point deadline;
  std::string remote;
  int remote_port = 0;
};

Result<std::unique_ptr<ConnectionLoop>> ConnectionLoop::create(int listen_fd, LoopLimits limits, LoopHooks hooks) {
  int ep = epoll_create1(EPOLL_CLOEXEC);
  if (ep < 0) return Status::IOError(std::string("cannot create epoll: ") + std::strerror(errno));
  int wake = eventfd(0, EFD_NONBLOCK | EFD_CLOEXEC);
  if (wake < 0) {
    close(ep);
    return Status::IOError(std::string("cannot create eventfd: ") + std::strerror(errno));
  }
  fcntl(listen_fd, F_SETFL, fcntl(listen_fd, F_GETFL) | O_NONBLOCK);
  return std::unique_ptr<ConnectionLoop>(
      new ConnectionLoop(listen_fd, ep, wake, limits, std::move(hooks)));
}

ConnectionLoop::ConnectionLoop(int listen_fd, int epoll_fd, int wake_fd, LoopLimits limits, LoopHooks hooks)
    : listen_fd_(listen_fd), epoll_fd_(epoll_fd), wake_fd_(wake_fd), limits_(limits), hooks_(std::move(hooks)) {}

ConnectionLoop::~ConnectionLoop() {
  {
    std::lock_guard lock(mu_);
    workers_quit_ = true;
  }
  work_ready_.notify_all();
  for (auto& t : workers_) t.join();
  for (auto& [fd, c] : conns_) close(fd);
  if (listen_fd_ >= 0) close(listen_fd_);
  close(wake_fd_);
  close(epoll_fd_);
}

void ConnectionLoop::stop() {
  stop_requested_ = true;
  std::uint64_t one = 1;
  (void)!write(wake_fd_, &one, sizeof one);
}

LoopLoad ConnectionLoop::load() const {
  return {open_.load(), queued_.load(), busy_.load(), refused_busy_.load(), refused_connections_.load(),
          timed_out_.load()};
}

Status ConnectionLoop::run() {
  epoll_event ev{};
  ev.events = EPOLLIN;
  ev.data.fd = listen_fd_;
  if (epoll_ctl(epoll_fd_, EPOLL_CTL_ADD, listen_fd_, &ev) != 0)
    return Status::IOError(std::string("cannot watch the listening socket: ") + std::strerror(errno));
  ev.data.fd = wake_fd_;
  epoll_ctl(epoll_fd_, EPOLL_CTL_ADD, wake_fd_, &ev);
  for (std::size_t i = 0; i < limits_.workers; ++i) workers_.emplace_back([this] { worker(); });

  Clock::time_point next_sweep = Clock::now() + kTick;
  std::vector<epoll_event> events(256);
  for (;;) {
    int n = epoll_wait(epoll_fd_, events.data(), static_cast<int>(events.size()), static_cast<int>(kTick.count()));
    if (n < 0 && errno != EINTR) return Status::IOError(std::string("epoll_wait failed: ") + std::strerror(errno));
    for (int i = 0; i < n; ++i) {
      int fd = events[static_cast<std::size_t>(i)].data.fd;
      if (fd == listen_fd_) {
        accept_all();
      } else if (fd == wake_fd_) {
        std::uint64_t count = 0;
        (void)!read(wake_fd_, &count, sizeof count);
        collect_done();
      } else {
        on_event(fd, events[static_cast<std::size_t>(i)].events);
      }
    }
    if (stop_requested_ && !stopping_) begin_stop();
    if (Clock::now() >= next_sweep) {
      sweep();
      next_sweep = Clock::now() + kTick;
    }
    if (stopping_) {
      bool working = false;
      for (auto& [fd, c] : conns_) working |= c->phase == Conn::Phase::kWorking;
      if (conns_.empty() || (!working && Clock::now() - stop_started_ > kStopGrace)) break;
    }
  }
  std::vector<int> left;
  for (auto& [fd, c] : conns_) left.push_back(fd);
  for (int fd : left) close_conn(*conns_.at(fd));
  return Status();
}

void ConnectionLoop::begin_stop() {
  stopping_ = true;
  stop_started_ = Clock::now();
  epoll_ctl(epoll_fd_, EPOLL_CTL_DEL, listen_fd_, nullptr);
  close(listen_fd_);
  listen_fd_ = -1;
  std::vector<Conn*> waiting;
  for (auto& [fd, c] : conns_)
    if (c->phase == Conn::Phase::kReading) waiting.push_back(c.get());
  for (Conn* c : waiting) close_conn(*c);
}

void ConnectionLoop::accept_all() {
  for (;;) {
    sockaddr_storage addr{};
    socklen_t len = sizeof addr;
    int fd = accept4(listen_fd_, reinterpret_cast<sockaddr*>(&addr), &len, SOCK_NONBLOCK | SOCK_CLOEXEC);
    if (fd < 0) return;  // EAGAIN, or out of descriptors: the backlog holds them until a close
    int port = 0;
    std::string remote = peer_address(addr, &port);
    if (conns_.size() >= limits_.max_connections) {
      ++refused_connections_;
      std::string bytes = hooks_.refusal(Refusal::kTooManyConnections, remote);
      (void)!send(fd, bytes.data(), bytes.size(), MSG_NOSIGNAL);  // best effort: it is tiny
      close(fd);
      continue;
    }
    int yes = 1;
    setsockopt(fd, IPPROTO_TCP, TCP_NODELAY, &yes, sizeof yes);  // small replies: no Nagle delay
    auto c = std::make_unique<Conn>();
    c->fd = fd;
    c->remote = std::move(remote);
    c->remote_port = port;
    c->deadline = Clock::now() + limits_.idle_timeout;
    Conn& ref = *c;
    conns_.emplace(fd, std::move(c));
    open_ = conns_.size();
    interest(ref, EPOLLIN);
  }
}

void ConnectionLoop::on_event(int fd, std::uint32_t events) {
  auto it = conns_.find(fd);
  if (it == conns_.end()) return;
  Conn& c = *it->second;
  if (c.phase == Conn::Phase::kReading && (events & (EPOLLIN | EPOLLHUP | EPOLLERR))) {
    if (!read_some(c)) c.peer_closed = true;
  }
  advance(c);
}

bool ConnectionLoop::read_some(Conn& c) {
  // A request never needs more than its head and body caps (plus a next
  // request's start); stop reading beyond, framing refuses it.
  const std::size_t cap = limits_.max_head_bytes + limits_.max_body_bytes + 4096;
  char buf[16384];
  while (c.in.size() < cap) {
    ssize_t n = recv(c.fd, buf, sizeof buf, 0);
    if (n > 0) {
      if (c.in.empty()) c.deadline = Clock::now() + limits_.head_deadline;
      c.in.append(buf, static_cast<std::size_t>(n));
      continue;
    }
    if (n < 0 && (errno == EAGAIN || errno == EWOULDBLOCK)) return true;
    if (n < 0 && errno == EINTR) continue;
    return false;
  }
  return true;
}

void ConnectionLoop::advance(Conn& c) {
  for (;;) {
    if (c.phase == Conn::Phase::kWriting && !flush(c)) return;  // waiting to write, or closed
    if (c.phase != Conn::Phase::kReading) return;
    if (stopping_) return close_conn(c);
    if (!start_next(c)) {
      if (c.phase == Conn::Phase::kReading && c.peer_closed) close_conn(c);
      return;
    }
  }
}

bool ConnectionLoop::start_next(Conn& c) {
  Frame f = frame_request(c.in, limits_.max_head_bytes, limits_.max_body_bytes);
  if (f.state == Frame::State::kRefused) {
    respond(c, hooks_.refusal(f.refusal, c.remote), c.in.size(), true);
    return true;
  }
  if (f.state == Frame::State::kIncomplete) {
    if (f.expects_continue && !c.sent_continue) {
      static constexpr std::string_view kContinue = "HTTP/1.1 100 Continue\r\n\r\n";
      (void)!send(c.fd, kContinue.data(), kContinue.size(), MSG_NOSIGNAL);  // an interim reply: best effort
      c.sent_continue = true;
    }
    return false;
  }
  c.sent_continue = false;
  bool last = c.served + 1 >= limits_.max_requests_per_connection || c.peer_closed;
  if (hooks_.answer_inline(f.head)) {
    Exchange ex{std::string_view(c.in).substr(0, f.length), c.remote, c.remote_port, last, {}, 0, false};
    hooks_.handle(ex);
    respond(c, std::move(ex.response), ex.consumed ? ex.consumed : f.length, ex.close || last);
    return true;
  }
  {
    std::lock_guard lock(mu_);
    // Idle workers take requests at once; beyond them, max_queued may wait.
    if (outstanding_ >= limits_.workers + limits_.max_queued) {
      ++refused_busy_;
      respond(c, hooks_.refusal(Refusal::kBusy, c.remote), c.in.size(), true);
      return true;
    }
    c.phase = Conn::Phase::kWorking;
    c.close_after = last;
    c.consumed = f.length;
    queue_.push_back(&c);
    ++outstanding_;
    queued_ = queue_.size();
  }
  interest(c, 0);
  work_ready_.notify_one();
  return false;
}

void ConnectionLoop::worker() {
  for (;;) {
    Conn* c = nullptr;
    {
      std::unique_lock lock(mu_);
      work_ready_.wait(lock, [&] { return workers_quit_ || !queue_.empty(); });
      if (queue_.empty()) return;
      c = queue_.front();
      queue_.pop_front();
      queued_ = queue_.size();
    }
    ++busy_;
    // The loop does not touch a connection in kWorking: its fields are ours.
    Exchange ex{std::string_view(c->in).substr(0, c->consumed), c->remote, c->remote_port, c->close_after, {}, 0,
                false};
    hooks_.handle(ex);
    c->out = std::move(ex.response);
    if (ex.consumed) c->consumed = ex.consumed;
    c->close_after = c->close_after || ex.close;
    --busy_;
    {
      std::lock_guard lock(mu_);
      done_.push_back(c);
      --outstanding_;
    }
    std::uint64_t one = 1;
    (void)!write(wake_fd_, &one, sizeof one);
  }
}

void ConnectionLoop::collect_done() {
  std::vector<Conn*> done;
  {
    std::lock_guard lock(mu_);
    done.swap(done_);
  }
  for (Conn* c : done) {
    std::string out = std::move(c->out);
    respond(*c, std::move(out), c->consumed, c->close_after);
    advance(*c);
  }
}

void ConnectionLoop::respond(Conn& c, std::string bytes, std::size_t consumed, bool close) {
  c.in.erase(0, std::min(consumed, c.in.size()));
  c.out = std::move(bytes);
  c.out_at = 0;
  c.close_after = close;
  ++c.served;
  c.phase = Conn::Phase::kWriting;
  c.deadline = Clock::now() + limits_.write_timeout;
}

bool ConnectionLoop::flush(Conn& c) {
  while (c.out_at < c.out.size()) {
    ssize_t n = send(c.fd, c.out.data() + c.out_at, c.out.size() - c.out_at, MSG_NOSIGNAL);
    if (n > 0) {
      c.out_at += static_cast<std::size_t>(n);
      continue;
    }
    if (n < 0 && (errno == EAGAIN || errno == EWOULDBLOCK)) {
      interest(c, EPOLLOUT);
      return false;
    }
    if (n < 0 && errno == EINTR) continue;
    close_conn(c);
    return false;
  }
  if (c.close_after) {
    close_conn(c);
    return false;
  }
  c.out.clear();
  if (c.out.capacity() > kKeepCapacity) c.out.shrink_to_fit();
  if (c.in.empty() && c.in.capacity() > kKeepCapacity) c.in.shrink_to_fit();
  c.phase = Conn::Phase::kReading;
  c.deadline = Clock::now() + (c.in.empty() ? limits_.idle_timeout : limits_.head_deadline);
  interest(c, EPOLLIN);
  return true;
}

void ConnectionLoop::interest(Conn& c, std::uint32_t events) {
  if (events == c.events) return;
  epoll_event ev{};
  ev.events = events;
  ev.data.fd = c.fd;
  int op = c.events == 0 ? EPOLL_CTL_ADD : events == 0 ? EPOLL_CTL_DEL : EPOLL_CTL_MOD;
  epoll_ctl(epoll_fd_, op, c.fd, &ev);
  c.events = events;
}

void ConnectionLoop::close_conn(Conn& c) {
  int fd = c.fd;
  close(fd);  // also leaves the epoll set
  conns_.erase(fd);
  open_ = conns_.size();
}

void ConnectionLoop::sweep() {
  const auto now = Clock::now();
  std::vector<Conn*> late;
  for (auto& [fd, c] : conns_)
    if (c->phase != Conn::Phase::kWorking && now >= c->deadline) late.push_back(c.get());
  for (Conn* c : late) {
    if (c->phase == Conn::Phase::kReading && !c->in.empty()) {
      ++timed_out_;
      respond(*c, hooks_.refusal(Refusal::kTooSlow, c->remote), c->in.size(), true);
      advance(*c);
    } else {
      close_conn(*c);  // idle past its time, or a response nobody reads
    }
  }
}

}  // namespace lode::server
