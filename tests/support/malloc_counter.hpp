// Counts every malloc, calloc and realloc of the process while counting is on: the way a test
// proves that a warm solve allocates nothing. Include in exactly one source file of an executable
// of its own: it replaces the C allocator's entry points (glibc lets an executable interpose them).
#pragma once

#include <cstddef>

extern "C" void* __libc_malloc(std::size_t size);  // glibc's own allocator entry points
extern "C" void* __libc_calloc(std::size_t count, std::size_t size);
extern "C" void* __libc_realloc(void* pointer, std::size_t size);

namespace protonflow::test_support {

inline bool counting_allocations = false;
inline long allocations = 0;

}  // namespace protonflow::test_support

extern "C" void* malloc(std::size_t size) {
  if (protonflow::test_support::counting_allocations) ++protonflow::test_support::allocations;
  return __libc_malloc(size);
}
extern "C" void* calloc(std::size_t count, std::size_t size) {
  if (protonflow::test_support::counting_allocations) ++protonflow::test_support::allocations;
  return __libc_calloc(count, size);
}
extern "C" void* realloc(void* pointer, std::size_t size) {
  if (protonflow::test_support::counting_allocations) ++protonflow::test_support::allocations;
  return __libc_realloc(pointer, size);
}
