// Fuzz target: case-file text -> parse_case_text. Bad text must end in a one-line InputError
// naming the file; an accepted case must write a resolved YAML that reads back to the same case.
#include <cstddef>
#include <cstdint>
#include <string>

#include "fuzz_support.hpp"
#include "io/case_loader.hpp"

namespace {
constexpr const char* source_name = "fuzz_case.yaml";
}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) { return 0; }

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace wallrans;
  const std::string text(reinterpret_cast<const char*>(data), size);
  CaseSpec spec;
  if (!fuzz::accepts(source_name, [&] { spec = parse_case_text(text, source_name); })) return 0;
  const std::string resolved = resolved_case_yaml(spec);
  std::string again;
  try {
    // Read under the same name: the resolved text's header comment names its source.
    again = resolved_case_yaml(parse_case_text(resolved, source_name));
  } catch (const std::exception& e) {
    fuzz::finding(std::string("the resolved YAML of an accepted case is rejected: ") + e.what());
  }
  if (again != resolved) fuzz::finding("the resolved YAML does not read back to the same case");
  return 0;
}
