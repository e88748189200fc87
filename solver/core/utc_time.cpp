#include "core/utc_time.hpp"

#include <ctime>

#include "core/error.hpp"

namespace wallrans {

std::string utc_now() {
  const std::time_t now = std::time(nullptr);
  std::tm parts{};
  if (gmtime_r(&now, &parts) == nullptr) throw Error("cannot convert the current time to UTC");
  char text[32];
  std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &parts);
  return text;
}

}  // namespace wallrans
