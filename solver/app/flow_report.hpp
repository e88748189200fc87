// What a run reports about its mass balance and, for a periodic case, its driving: a fragment of
// summary.json and the terminal lines.
#pragma once

#include <string>

#include "coupling/flow_solver.hpp"

namespace wallrans {

/// Local. JSON members (",\n  \"mass_balance\": {...}" and, if periodic, ",\n  \"periodic_driving\":
/// {...}") to append after another member of the summary object.
std::string flow_report_json(const MassBalance& balance, const PeriodicDriving& driving, bool periodic);

/// Local. One terminal line for the mass balance and, if periodic, one for the driving.
std::string flow_report_text(const MassBalance& balance, const PeriodicDriving& driving, bool periodic);

}  // namespace wallrans
