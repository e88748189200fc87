#include "app/progress.hpp"

#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <limits>
#include <system_error>

#include "core/error.hpp"

namespace wallrans {

namespace {

double now_s() {
  return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count();
}

std::string formatted(const char* format, double value) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, format, value);
  return buffer;
}

}  // namespace

ConvergenceEstimate::ConvergenceEstimate(double target, int window)
    : log_target_(std::log10(target)), window_(static_cast<size_t>(std::max(window, 2))) {}

void ConvergenceEstimate::add(int iteration, const std::vector<double>& residuals, double elapsed_s) {
  Sample sample{iteration, elapsed_s, {}};
  for (double r : residuals)
    sample.log_residuals.push_back(r > 0.0 ? std::log10(r) : -std::numeric_limits<double>::infinity());
  if (!samples_.empty() && samples_.back().log_residuals.size() != sample.log_residuals.size())
    samples_.clear();
  samples_.push_back(std::move(sample));
  if (samples_.size() > window_) samples_.erase(samples_.begin());
}

std::optional<double> ConvergenceEstimate::seconds_per_iteration() const {
  if (samples_.size() < 2) return std::nullopt;
  const Sample &first = samples_.front(), &last = samples_.back();
  if (last.iteration <= first.iteration) return std::nullopt;
  return (last.elapsed_s - first.elapsed_s) / (last.iteration - first.iteration);
}

std::optional<double> ConvergenceEstimate::iterations_to_target() const {
  if (samples_.size() < 5) return std::nullopt;
  double needed = 0.0;
  for (size_t k = 0; k < samples_.back().log_residuals.size(); ++k) {
    const double current = samples_.back().log_residuals[k];
    if (!(current >= log_target_)) continue;  // below the target (or zero)
    // Least-squares slope of log10 r against the iteration number over the window.
    double mean_n = 0.0, mean_r = 0.0;
    for (const Sample& s : samples_) {
      mean_n += s.iteration;
      mean_r += s.log_residuals[k];
    }
    mean_n /= double(samples_.size());
    mean_r /= double(samples_.size());
    double sxy = 0.0, sxx = 0.0;
    for (const Sample& s : samples_) {
      sxy += (s.iteration - mean_n) * (s.log_residuals[k] - mean_r);
      sxx += (s.iteration - mean_n) * (s.iteration - mean_n);
    }
    const double slope = sxx > 0.0 ? sxy / sxx : 0.0;
    if (!std::isfinite(slope) || slope >= 0.0) return std::nullopt;
    needed = std::max(needed, (log_target_ - current) / slope);
  }
  return needed;
}

std::optional<double> ConvergenceEstimate::seconds_to_target() const {
  const auto iterations = iterations_to_target();
  const auto per_iteration = seconds_per_iteration();
  if (!iterations || !per_iteration) return std::nullopt;
  return *iterations * *per_iteration;
}

ProgressOutput::ProgressOutput(const std::filesystem::path& directory, bool append, bool quiet, bool live)
    : quiet_(quiet), live_(live && !quiet) {
  const std::filesystem::path path = directory / progress_log_name;
  log_.reset(std::fopen(path.c_str(), append ? "a" : "w"));
  if (!log_)
    throw Error(path.string() + ": cannot open the progress log: " + std::generic_category().message(errno));
}

ProgressOutput::~ProgressOutput() { clear_status(); }

void ProgressOutput::clear_status() {
  if (!status_shown_) return;
  std::fputs("\r\033[K", stdout);
  std::fflush(stdout);
  status_shown_ = false;
}

void ProgressOutput::line(const std::string& text) {
  // The log is for people reading it later; a full disk must not stop the run over it.
  std::fprintf(log_.get(), "%s\n", text.c_str());
  std::fflush(log_.get());
  if (quiet_) return;
  clear_status();
  std::printf("%s\n", text.c_str());
  std::fflush(stdout);
}

void ProgressOutput::final(const std::string& text) {
  std::fprintf(log_.get(), "%s\n", text.c_str());
  std::fflush(log_.get());
  clear_status();
  std::printf("%s\n", text.c_str());
  std::fflush(stdout);
}

void ProgressOutput::status(const std::string& text) {
  if (!live_) return;
  const double now = now_s();
  if (status_shown_ && now - last_status_ < 0.2) return;
  last_status_ = now;
  std::printf("\r%s\033[K", text.c_str());
  std::fflush(stdout);
  status_shown_ = true;
}

bool stdout_is_terminal() {
  if (isatty(STDOUT_FILENO) != 1) return false;
  // Open MPI's launcher hands each local rank a pseudo-terminal of its own and copies it to the
  // launcher's stdout, which may be a file: then ask where the launcher's (the parent's) stdout goes.
  if (std::getenv("OMPI_COMM_WORLD_SIZE") == nullptr) return true;
  char target[256] = {};
  const std::string link = "/proc/" + std::to_string(getppid()) + "/fd/1";
  const ssize_t length = readlink(link.c_str(), target, sizeof target - 1);
  if (length <= 0) return false;
  const std::string where(target, static_cast<size_t>(length));
  return where.starts_with("/dev/pts/") || where.starts_with("/dev/tty");
}

std::string progress_header(const std::vector<std::string>& residual_names) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%8s", "iter");
  std::string text = buffer;
  for (const auto& name : residual_names) {
    std::snprintf(buffer, sizeof buffer, " %12s", ("res_" + name).c_str());
    text += buffer;
  }
  std::snprintf(buffer, sizeof buffer, " %8s %9s %8s", "time_s", "s_per_it", "eta_s");
  return text + buffer;
}

std::string progress_row(int iteration, const std::vector<double>& residuals, double elapsed_s,
                         const ConvergenceEstimate& estimate, int iterations_left, const std::string& note) {
  std::string text = formatted("%8.0f", double(iteration));
  for (double r : residuals) text += formatted(" %12.4e", r);
  text += formatted(" %8.1f", elapsed_s);
  const auto per_iteration = estimate.seconds_per_iteration();
  text += per_iteration ? formatted(" %9.3g", *per_iteration) : "         -";
  const auto iterations = estimate.iterations_to_target();
  const auto seconds = estimate.seconds_to_target();
  if (iterations && *iterations > iterations_left)
    text += "     >cap";
  else if (seconds)
    text += formatted(" %8.0f", *seconds);
  else
    text += "        -";
  return note.empty() ? text : text + "  " + note;
}

}  // namespace wallrans
