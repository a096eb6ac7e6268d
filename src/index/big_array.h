// big_array<T>(n): an uninitialised array for the writer's large, write-once
// batch buffers. On Linux, arrays of 2 MiB or more are mapped on their own
// and offered to transparent huge pages: filling a 256 MiB batch otherwise
// takes 65,536 page faults, a tenth of indexing time in a virtual machine
// (bench/: perf, kernel page-fault handler). Where huge pages are off the
// advice is ignored and the array behaves like any other.
//
// Thread safety: plain memory, no shared state.
#pragma once

#include <cstddef>
#include <cstdlib>
#include <memory>
#include <new>
#include <type_traits>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace lode {

// Frees a big_array: unmaps what was mapped, else free().
struct BigDeleter {
  std::size_t mapped = 0;  // bytes mapped; 0: from malloc
  void operator()(void* p) const {
#if defined(__linux__)
    if (mapped != 0) {
      (void)munmap(p, mapped);
      return;
    }
#endif
    std::free(p);
  }
};
template <typename T>
using BigArray = std::unique_ptr<T[], BigDeleter>;

inline constexpr std::size_t kHugePageBytes = std::size_t{2} << 20;

// `huge`: false keeps small pages (a first chunk that may stay nearly
// empty). Huge arrays are mapped apart from the heap and unmapped when
// freed, so each batch returns them to the system whole (2 MiB-aligned
// blocks carved from the heap fragmented it, batch after batch). REQUIRES:
// T trivially copyable (nothing is constructed). Throws std::bad_alloc like
// new when memory is exhausted.
template <typename T>
BigArray<T> big_array(std::size_t n, bool huge = true) {
  static_assert(std::is_trivially_copyable_v<T>);
  std::size_t bytes = n * sizeof(T);
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  if (huge && bytes >= kHugePageBytes) {
    bytes = (bytes + kHugePageBytes - 1) / kHugePageBytes * kHugePageBytes;
    void* p = mmap(nullptr, bytes, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
    if (p == MAP_FAILED) throw std::bad_alloc();
    (void)madvise(p, bytes, MADV_HUGEPAGE);  // advice only: failure changes nothing
    return BigArray<T>(static_cast<T*>(p), BigDeleter{bytes});
  }
#endif
  (void)huge;
  void* p = std::malloc(bytes == 0 ? 1 : bytes);
  if (p == nullptr) throw std::bad_alloc();
  return BigArray<T>(static_cast<T*>(p), BigDeleter{});
}

}  // namespace lode
