// libFuzzer entry point for the run-file loader. Build and run (README, "Fuzzing"):
//
//   cmake -S . -B build/fuzz -G Ninja -DTUBEWAVE_FUZZ=ON -DCMAKE_CXX_COMPILER=clang++ \
//         -DCMAKE_C_COMPILER=clang -DCMAKE_BUILD_TYPE=RelWithDebInfo -DBUILD_TESTING=OFF
//   cmake --build build/fuzz --target fuzz_runfile -j2
//   mkdir -p build/fuzz/corpus
//   build/fuzz/tests/fuzz/fuzz_runfile -dict=tests/fuzz/runfile.dict -max_len=4096 \
//         -runs=1000000 build/fuzz/corpus tests/fuzz/corpus/runfile
//
// A finding aborts with the input saved as crash-*; add it (minimised) to
// tests/fuzz/corpus/runfile so the replay test keeps it fixed.
#include <cstdio>
#include <cstdlib>

#include "fuzz/runfile_target.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const tw::fuzz::Result r = tw::fuzz::run_file_input(data, size);
  if (r.verdict == tw::fuzz::Verdict::bug) {
    std::fprintf(stderr, "run-file fuzz finding: %s\n", r.message.c_str());
    std::abort();
  }
  return 0;
}
