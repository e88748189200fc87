#include "app/flow_report.hpp"

#include <cmath>
#include <cstdio>

namespace wallrans {

namespace {

std::string number(double x) {
  if (!std::isfinite(x)) return "null";
  char text[40];
  std::snprintf(text, sizeof text, "%.12g", x);
  return text;
}

// Imbalance relative to the through-flow; null in a closed domain (no through-flow).
double relative(double imbalance, double through_flow) {
  return through_flow > 0.0 ? imbalance / through_flow : std::nan("");
}

}  // namespace

std::string flow_report_json(const MassBalance& balance, const PeriodicDriving& driving, bool periodic) {
  std::string json = ",\n  \"mass_balance\": {\"through_flow\": " + number(balance.through_flow) +
                     ", \"net_outflow\": " + number(balance.net_outflow) +
                     ", \"cells_abs_sum\": " + number(balance.cells_l1) + ", \"cells_abs_sum_relative\": " +
                     number(relative(balance.cells_l1, balance.through_flow)) + "}";
  if (periodic) {
    json +=
        ",\n  \"periodic_driving\": {\"mean_pressure_gradient\": " + number(driving.mean_pressure_gradient) +
        ", \"bulk_velocity\": " + number(driving.bulk_velocity) +
        ", \"target_bulk_velocity\": " + (driving.target ? number(*driving.target) : std::string("null")) +
        ", \"section_height\": " + number(driving.section_height) + "}";
  }
  return json;
}

std::string flow_report_text(const MassBalance& balance, const PeriodicDriving& driving, bool periodic) {
  char line[320];
  std::snprintf(line, sizeof line,
                "wallrans: mass balance: net outflow %.3e m^2/s, sum of |cell imbalance| %.3e m^2/s (%.3e of "
                "the through-flow %.6g m^2/s)\n",
                balance.net_outflow, balance.cells_l1, relative(balance.cells_l1, balance.through_flow),
                balance.through_flow);
  std::string text = line;
  if (periodic) {
    if (driving.target) {
      std::snprintf(line, sizeof line,
                    "wallrans: periodic driving: mean pressure gradient dp/dx = %.10g m/s^2 holds the bulk "
                    "velocity %.10g m/s (target %.10g m/s)\n",
                    driving.mean_pressure_gradient, driving.bulk_velocity, *driving.target);
    } else {
      std::snprintf(line, sizeof line,
                    "wallrans: periodic driving: fixed mean pressure gradient dp/dx = %.10g m/s^2 gives the "
                    "bulk velocity %.10g m/s\n",
                    driving.mean_pressure_gradient, driving.bulk_velocity);
    }
    text += line;
  }
  return text;
}

}  // namespace wallrans
