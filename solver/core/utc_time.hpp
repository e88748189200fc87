// Wall-clock time stamps for files and messages.
#pragma once

#include <string>

namespace wallrans {

/// Local. The current time, UTC, ISO 8601 ("2026-01-01T12:34:56Z"). Throws Error if the clock
/// cannot be converted.
std::string utc_now();

}  // namespace wallrans
