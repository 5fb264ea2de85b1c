// The helper's boundary allocates nothing on a warm solve: every malloc of the process, the
// module's included, is counted while a mixer built with unit_module.hpp solves through the raw C
// interface. A flowsheet solves its units thousands of times while converging a recycle.
#include <array>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>

#include <dlfcn.h>

#include <protonflow/unit_abi.h>

#include "../support/malloc_counter.hpp"

using protonflow::test_support::allocations;
using protonflow::test_support::counting_allocations;

int main() {
  void* library = dlopen(ABI_GOOD_MODULE, RTLD_NOW | RTLD_LOCAL);
  if (library == nullptr) {
    std::printf("FAILED: %s\n", dlerror());
    return 1;
  }
  void* symbol = dlsym(library, pfu_entry_symbol());
  pfu_entry_fn entry = nullptr;
  std::memcpy(&entry, &symbol, sizeof entry);
  const pfu_module* table = entry();
  const pfu_unit_class* mixer = nullptr;
  for (std::uint32_t i = 0; i < table->class_count; ++i) {
    if (std::strcmp(table->classes[i].type, "mixer") == 0) mixer = &table->classes[i];
  }
  if (mixer == nullptr) {
    std::puts("FAILED: no mixer");
    return 1;
  }

  const std::array<const char*, 2> components{"H2O", "NaOH"};
  const pfu_slate slate{{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_slate)}, 2, 0, components.data(), nullptr};
  std::array<char, 256> message{};
  pfu_instance* instance = mixer->create(nullptr, 0, &slate, message.data(), message.size());
  if (instance == nullptr) {
    std::printf("FAILED: %s\n", message.data());
    return 1;
  }
  std::array<double, 4> feed_1{1.0, 0.01, 0.0, 0.0};
  std::array<double, 4> feed_2{0.5, 0.0, 0.0, 0.0};
  std::array<double, 4> product{};
  constexpr pfu_header stream_header{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_stream_state)};
  const pfu_stream_state in_1{stream_header, 298.15, 101325.0, 2, 2, feed_1.data()};
  const pfu_stream_state in_2{stream_header, 320.0, 101325.0, 2, 2, feed_2.data()};
  pfu_stream_state out{stream_header, 0.0, 0.0, 2, 2, product.data()};
  const pfu_stream_state* inlets[] = {&in_1, &in_2};
  pfu_stream_state* outlets[] = {&out};
  std::array<double, 2> results{};
  std::array<char, 1024> warnings{};

  const auto solve = [&] {
    return mixer->solve(instance, inlets, 2, outlets, 1, results.data(), 2, warnings.data(), warnings.size(),
                        message.data(), message.size());
  };
  pfu_status status = solve();  // cold: sizes the instance's scratch
  counting_allocations = true;
  for (int i = 0; i < 100 && status == PFU_OK; ++i) {
    feed_2[1] = 1e-4 * i;  // a nearby state, as in a recycle iteration
    status = solve();
  }
  counting_allocations = false;
  if (status != PFU_OK) {
    std::printf("FAILED: %s: %s\n", pfu_status_name(status), message.data());
    return 1;
  }
  mixer->destroy(instance);
  dlclose(library);
  std::printf("%ld allocations in 100 warm solves through the boundary\n", allocations);
  return allocations == 0 ? 0 : 1;
}
