// Replays inputs through a fuzz target without libFuzzer (any compiler): every file given, and
// every file inside each directory given (README.md files excepted), in name order. A broken
// contract aborts; the run fails if no input was found, so a moved folder cannot pass silently.
#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

extern "C" int LLVMFuzzerInitialize(int* argc, char*** argv);
extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size);

int main(int argc, char** argv) {
  namespace fs = std::filesystem;
  std::vector<fs::path> inputs;
  for (int k = 1; k < argc; ++k) {
    const fs::path given(argv[k]);
    if (fs::is_directory(given)) {
      std::vector<fs::path> inside;
      for (const auto& entry : fs::directory_iterator(given)) {
        if (entry.is_regular_file() && entry.path().filename() != "README.md") inside.push_back(entry.path());
      }
      std::sort(inside.begin(), inside.end());
      inputs.insert(inputs.end(), inside.begin(), inside.end());
    } else if (fs::is_regular_file(given)) {
      inputs.push_back(given);
    } else {
      std::fprintf(stderr, "fuzz replay: expected a file or directory, got '%s'\n", argv[k]);
      return 2;
    }
  }
  if (inputs.empty()) {
    std::fprintf(stderr, "fuzz replay: no inputs found in the arguments\n");
    return 2;
  }
  LLVMFuzzerInitialize(&argc, &argv);
  for (const fs::path& input : inputs) {
    std::ifstream in(input, std::ios::binary);
    const std::vector<char> bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    if (!in.eof() && in.fail()) {
      std::fprintf(stderr, "fuzz replay: cannot read '%s'\n", input.c_str());
      return 2;
    }
    std::printf("fuzz replay: %s (%zu bytes)\n", input.c_str(), bytes.size());
    std::fflush(stdout);
    LLVMFuzzerTestOneInput(reinterpret_cast<const uint8_t*>(bytes.data()), bytes.size());
  }
  std::printf("fuzz replay: %zu input(s), no contract broken\n", inputs.size());
  return 0;
}
