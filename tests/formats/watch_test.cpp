// watch_paths(): changes become incremental runs; a root that moves away is
// reported and its files kept until it is back. Waits are for liveness only
// (a generous deadline per expected event); nothing here asserts on time.
#include <doctest/doctest.h>

#include <atomic>
#include <condition_variable>
#include <mutex>
#include <thread>

#include "harness.h"

namespace {

using namespace lode::testing;
using Type = lode::WatchEvent::Type;

class Events {
 public:
  void push(const lode::WatchEvent& e) {
    std::lock_guard lock(mu_);
    seen_.push_back({e.type, e.message, e.report ? e.report->added + e.report->updated + e.report->removed : 0});
    cv_.notify_all();
  }
  // Waits until an event of `type` beyond the first `from` events arrives;
  // returns its index, or -1 after the deadline.
  int wait_for(Type type, std::size_t from) {
    std::unique_lock lock(mu_);
    int found = -1;
    cv_.wait_for(lock, std::chrono::seconds(30), [&] {
      for (std::size_t i = from; i < seen_.size(); ++i)
        if (seen_[i].type == type) {
          found = static_cast<int>(i);
          return true;
        }
      return false;
    });
    return found;
  }
  std::size_t size() {
    std::lock_guard lock(mu_);
    return seen_.size();
  }

 private:
  struct Seen {
    Type type;
    std::string message;
    std::size_t changes;
  };
  std::mutex mu_;
  std::condition_variable cv_;
  std::vector<Seen> seen_;
};

TEST_CASE("watch mode indexes changes in bursts and survives its root moving away") {
  Scratch s;
  s.write("a.txt", "initial anemometer\n");
  auto writer = lode::IndexWriter::open(s.index(), std::nullopt);
  REQUIRE(writer.ok());
  std::atomic<bool> stop{false};
  lode::IndexRunOptions options;
  options.cancelled = [&] { return stop.load(); };
  lode::WatchOptions watch;
  watch.quiet_ms = 100;
  watch.recheck_ms = 100;
  Events events;
  lode::Status result;
  std::jthread thread([&] {
    result = lode::watch_paths(**writer, {s.tree()}, options, watch, [&](const lode::WatchEvent& e) { events.push(e); });
  });
  REQUIRE(events.wait_for(Type::kIndexed, 0) == 0);  // the first full run
  CHECK(hit_ids(search(s.index(), "anemometer")) == std::vector<std::string>{"a.txt"});

  // A burst: a new folder with files, an edit and a delete.
  std::size_t mark = events.size();
  s.write("new/b.txt", "barometer reading\n");
  s.write("new/deeper/c.txt", "ceilometer data\n");
  s.write("a.txt", "edited anemometer log\n");
  REQUIRE(events.wait_for(Type::kIndexed, mark) >= 0);
  // Later events may still be on their way; wait until every change is in.
  for (int i = 0; i < 50 && (search(s.index(), "ceilometer").hits.empty() || search(s.index(), "edited").hits.empty()); ++i)
    events.wait_for(Type::kIndexed, events.size());
  CHECK(hit_ids(search(s.index(), "barometer")) == std::vector<std::string>{"new/b.txt"});
  CHECK(hit_ids(search(s.index(), "ceilometer")) == std::vector<std::string>{"new/deeper/c.txt"});
  CHECK(hit_ids(search(s.index(), "edited")) == std::vector<std::string>{"a.txt"});

  // The root moves away: reported, nothing removed.
  mark = events.size();
  std::filesystem::rename(s.tree(), s.other("moved"));
  REQUIRE(events.wait_for(Type::kRootGone, mark) >= 0);
  CHECK(hit_ids(search(s.index(), "barometer")) == std::vector<std::string>{"new/b.txt"});
  // It comes back with a change made while away.
  {
    std::ofstream(s.other("moved/new/b.txt")) << "barometer fell\n";
  }
  mark = events.size();
  std::filesystem::rename(s.other("moved"), s.tree());
  REQUIRE(events.wait_for(Type::kRootBack, mark) >= 0);
  REQUIRE(events.wait_for(Type::kIndexed, mark) >= 0);
  CHECK(hit_ids(search(s.index(), "fell")) == std::vector<std::string>{"new/b.txt"});
  CHECK(hit_ids(search(s.index(), "anemometer")) == std::vector<std::string>{"a.txt"});

  stop = true;
  thread.join();
  CHECK_MESSAGE(result.ok(), result.to_string());
}

}  // namespace
