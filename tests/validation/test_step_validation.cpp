// Validation of the backward-facing step, run as a user runs it: the program (one process),
// first the precursor plate whose profile_x<x>.csv becomes the step's inflow table, then the step
// cases of configs/ on coarsened versions of their grids. Reattachment lengths from wall.csv.
//  - Le, Moin & Kim (1997, J. Fluid Mech. 330:349) DNS conditions: SA, SA-negative and the k
//    model on two grids (the shipped one and half its cells in each direction); both SA variants
//    within 15 % of the DNS x_r = 6.28 h (from memory; ERCOFTAC case 31 gives "about 6h").
//  - Our scenario at the conditions of Driver & Seegmiller (1985, AIAA J. 23:163): SA on three
//    grids (r = 2, the shipped one the finest), observed order and GCI of x_r (Roache 1994;
//    Celik et al. 2008), beside the measured 6.26 +/- 0.10 H.
// Every run: converged, and the global mass imbalance (the net flux out through every boundary
// face, from the final checkpoint) at most 1e-10 of the through-flow. Long: about an hour on a
// busy machine. The runs stay in WALLRANS_STEP_RESULTS (build/step_validation) for
// docs/validation-step.md and its figure (tools/plot_step_cf.py). With the environment variable
// WALLRANS_STEP_REUSE=1, a run whose directory holds a converged run of the same case text is read
// instead of run again.
#include <gtest/gtest.h>
#include <hdf5.h>
#include <yaml-cpp/yaml.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "app/program_runner.hpp"
#include "core/inflow_profile.hpp"
#include "io/csv_writer.hpp"
#include "io/profile_reader.hpp"
#include "validation/grid_convergence.hpp"
#include "verification/step_reattachment.hpp"

namespace fs = std::filesystem;
using namespace wallrans;

namespace {

const fs::path source = WALLRANS_SOURCE_DIR;
const fs::path results = WALLRANS_STEP_RESULTS;

struct StepRun {
  std::string label;
  int cells_x = 0, cells_y = 0;
  bool converged = false;
  double x_r = NAN;         // reattachment length / step height (step height 1 m in every case)
  double mass_ratio = NAN;  // |net flux out of the domain| / through-flow at the last iteration
  double y_plus_max = NAN;  // largest first-cell y+ on the bottom wall
  std::string zeros;        // every sign change of the bottom-wall shear, for the table
  std::string log;          // what the program said, on failure
};

// Runs `config` (a case file) through the program into results/`label`, or with
// WALLRANS_STEP_REUSE=1 keeps a converged earlier run of the same case text there. One process:
// on a loaded machine two ranks that poll for messages cost far more than they gain.
test_support::ProgramResult run(const fs::path& config, const std::string& label) {
  const fs::path dir = results / label;
  const char* reuse = std::getenv("WALLRANS_STEP_REUSE");
  const std::string text = test_support::read_text(config);
  if (reuse && std::string(reuse) == "1" && test_support::read_text(dir / "case.copy") == text &&
      test_support::read_text(dir / "summary.json").find("\"converged\": true") != std::string::npos) {
    return {0, "reused " + dir.string(), ""};
  }
  fs::remove_all(dir);
  auto result = test_support::run_program(source, {"run", config.string(), "--output-dir", dir.string()},
                                          results / "logs", label);
  if (fs::exists(dir)) test_support::write_text(dir / "case.copy", text);
  return result;
}

// The case text of a step config with its grid refined by `factor` (cells times factor, spacings
// divided by it: the same stretching functions on a finer grid), the inflow table `table` and the
// output directory results/`label`.
fs::path step_variant(const fs::path& config, double factor, const fs::path& table,
                      const std::string& label) {
  YAML::Node node = YAML::LoadFile(config.string());
  YAML::Node grid = node["grid"];
  auto scale_count = [&](YAML::Node value) {
    const double n = value.as<int>() * factor;
    if (std::abs(n - std::round(n)) > 1e-9)
      throw std::runtime_error("cell count does not scale by " + std::to_string(factor));
    value = static_cast<int>(std::round(n));
  };
  scale_count(grid["cells"][0]);
  scale_count(grid["cells"][1]);
  scale_count(grid["upstream_cells"]);
  scale_count(grid["step_cells"]);
  for (const char* key : {"first_cell_height", "top_cell_height", "corner_spacing"})
    grid[key] = grid[key].as<double>() / factor;
  node["boundaries"][0]["profile_file"] = table.string();
  node["output"]["directory"] = (results / label).string();
  const fs::path path = results / "cases" / (label + ".yaml");
  fs::create_directories(path.parent_path());
  YAML::Emitter out;
  out.SetDoublePrecision(17);
  out << node;
  std::ofstream(path) << "# " << config.filename().string() << " with the grid refined by " << factor << "\n"
                      << out.c_str() << "\n";
  return path;
}

int column(const CsvTable& table, const std::string& name) {
  for (size_t k = 0; k < table.columns.size(); ++k)
    if (table.columns[k] == name) return static_cast<int>(k);
  throw std::runtime_error("no column " + name);
}

// The volume flux through the inlet [m^2/s]: the table's u integrated over the inlet channel,
// y in [step_height, height] (trapezoids through the rows, the top stretch held at the last row).
double through_flow(const fs::path& table, double step_height, double height) {
  const InflowProfile p = read_inflow_profile(table.string(), "y", "", "laminar", step_height);
  double q = 0.0;
  for (size_t k = 0; k + 1 < p.coordinate.size() && p.coordinate[k] < height; ++k) {
    const double top = std::min(p.coordinate[k + 1], height);
    q += 0.5 * (p.u[k] + p.at(top).velocity.x) * (top - p.coordinate[k]);
  }
  return q;
}

// The net volume flux out through every boundary face [m^2/s] in the checkpoint of a finished run
// (its boundary_flux array; docs of solver/io/checkpoint.hpp): the sum of every cell's imbalance.
double net_boundary_flux(const fs::path& dir) {
  fs::path file;  // the newest checkpoint_<iteration>.h5
  int newest = -1;
  for (const auto& entry : fs::directory_iterator(dir)) {
    const std::string name = entry.path().filename().string();
    if (entry.path().extension() != ".h5" || name.rfind("checkpoint_", 0) != 0) continue;
    const int iteration = std::stoi(name.substr(11));
    if (iteration > newest) {
      newest = iteration;
      file = entry.path();
    }
  }
  const hid_t h5 = H5Fopen(file.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT);
  if (h5 < 0) throw std::runtime_error("cannot open " + file.string());
  const hid_t set = H5Dopen2(h5, "/boundary/boundary_flux", H5P_DEFAULT);
  const hid_t space = H5Dget_space(set);
  std::vector<double> flux(static_cast<size_t>(H5Sget_simple_extent_npoints(space)));
  const herr_t status = H5Dread(set, H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, flux.data());
  H5Sclose(space);
  H5Dclose(set);
  H5Fclose(h5);
  if (status < 0) throw std::runtime_error("cannot read the boundary fluxes of " + file.string());
  double net = 0.0;
  for (double f : flux) net += f;
  return net;
}

StepRun run_step(const fs::path& config, double factor, const fs::path& table, const std::string& label,
                 double height) {
  const fs::path case_file = step_variant(config, factor, table, label);
  const auto result = run(case_file, label);
  StepRun r;
  r.label = label;
  r.log = result.out.substr(result.out.size() > 3000 ? result.out.size() - 3000 : 0) + result.err;
  r.converged = result.exit_status == 0;
  const fs::path dir = results / label;
  if (!fs::exists(dir / "wall.csv")) return r;
  const CsvTable wall = read_csv((dir / "wall.csv").string(), {"side"});
  std::vector<std::array<double, 3>> faces;
  const int x = column(wall, "x"), y = column(wall, "y"), tau = column(wall, "wall_shear_stress"),
            yp = column(wall, "first_cell_y_plus");
  r.y_plus_max = 0.0;
  for (const auto& row : wall.rows) {
    faces.push_back({row[x], row[y], row[tau]});
    if (std::abs(row[y]) < 1e-9 && row[x] > 0.0) r.y_plus_max = std::max(r.y_plus_max, row[yp]);
  }
  const auto bubble = test_support::bottom_wall_recirculation(faces);
  r.x_r = bubble.reattachment;
  for (const auto& z : bubble.zeros) {
    char text[48];
    std::snprintf(text, sizeof text, "%s%s %.3f", r.zeros.empty() ? "" : ", ", z.is_separation ? "S" : "R",
                  z.s);
    r.zeros += text;
  }
  r.mass_ratio = std::abs(net_boundary_flux(dir)) / through_flow(table, 1.0, height);
  const YAML::Node summary = YAML::LoadFile((dir / "summary.json").string());
  r.cells_x = summary["cells"][0].as<int>();
  r.cells_y = summary["cells"][1].as<int>();
  r.converged = r.converged && summary["converged"].as<bool>();
  return r;
}

void print_row(const StepRun& r, double reference) {
  std::printf("| %s | %d x %d | %.3f | %+.1f %% | %s | %.1e | %.2f |\n", r.label.c_str(), r.cells_x,
              r.cells_y, r.x_r, 100.0 * (r.x_r / reference - 1.0), r.zeros.c_str(), r.mass_ratio,
              r.y_plus_max);
  std::fflush(stdout);
}

// Every run: converged, mass balanced, a recirculation that reattaches.
void expect_sound(const StepRun& r) {
  EXPECT_TRUE(r.converged) << r.label << "\n" << r.log;
  // Global mass balance at convergence: 1e-10 of the through-flow (the issue's bound).
  EXPECT_LE(r.mass_ratio, 1e-10) << r.label;
  EXPECT_TRUE(std::isfinite(r.x_r)) << r.label << ": no reattachment on the bottom wall";
}

fs::path precursor(const std::string& name) {
  const std::string label = "precursor_" + name;
  const auto result = run(source / "configs" / ("step_" + name + ".yaml"), label);
  EXPECT_EQ(result.exit_status, 0) << result.out << result.err;
  // The precursor configs name one station: its profile_x<x>.csv is the table.
  for (const auto& entry : fs::directory_iterator(results / label))
    if (entry.path().filename().string().starts_with("profile_x")) return entry.path();
  ADD_FAILURE() << label << ": no profile_x<x>.csv";
  return results / label / "profile_x.csv";
}

}  // namespace

TEST(StepValidation, LeMoinKimReattachmentForThreeModelsOnTwoGrids) {
  // Le, Moin & Kim (1997) x_r = 6.28 h: from memory, see tests/data and docs/validation-step.md.
  constexpr double dns_x_r = 6.28;
  const fs::path sa_table = precursor("lmk_precursor_sa"), k_table = precursor("lmk_precursor_k");
  std::printf(
      "\n| run | cells | x_r/h | vs DNS 6.28 | bottom-wall shear zeros (S/R at x/h) | mass imbalance/Q | y+ "
      "max |\n"
      "|---|---|---|---|---|---|---|\n");
  for (const auto& [name, table] :
       {std::pair{"sa", sa_table}, std::pair{"sa_negative", sa_table}, std::pair{"k", k_table}}) {
    for (const auto& [factor, grid] : {std::pair{0.5, "coarse"}, std::pair{1.0, "medium"}}) {
      const StepRun r = run_step(source / "configs" / ("step_lmk_" + std::string(name) + ".yaml"), factor,
                                 table, std::string("lmk_") + name + "_" + grid, 6.0);
      print_row(r, dns_x_r);
      expect_sound(r);
      // SA within 15 % of the DNS (the issue's target band; the DNS value itself is recalled from
      // memory). The k model is reported, not held to a band.
      if (std::string(name) != "k") {
        EXPECT_NEAR(r.x_r, dns_x_r, 0.15 * dns_x_r) << r.label;
      }
    }
  }
}

TEST(StepValidation, DriverSeegmillerConditionsThreeGridStudy) {
  constexpr double measured_x_r = 6.26;  // +/- 0.10, Driver & Seegmiller (1985), as on TMR's page
  const fs::path table = precursor("ds_precursor");
  std::printf(
      "\n| run | cells | x_r/H | vs measured 6.26 | bottom-wall shear zeros (S/R at x/H) | mass imbalance/Q "
      "| y+ max |\n"
      "|---|---|---|---|---|---|---|\n");
  // The shipped grid (192 x 160) is the finest; r = 2 gives 96 x 80 and 48 x 40 with the step
  // corner on a grid line (upstream 32/16/8, below the step 64/32/16 cells). The family r = 4/3
  // (108 x 90 coarsest) stalled on its coarsest grid with residuals frozen at 5e-4 (measured
  // 2026-12-03, with and without the nested start), so it is not used.
  constexpr double r = 2.0;
  std::vector<StepRun> runs;  // fine, medium, coarse
  for (const auto& [factor, grid] :
       {std::pair{1.0, "fine"}, std::pair{1.0 / r, "medium"}, std::pair{1.0 / (r * r), "coarse"}}) {
    runs.push_back(
        run_step(source / "configs" / "step_ds_sa.yaml", factor, table, std::string("ds_") + grid, 9.0));
    print_row(runs.back(), measured_x_r);
    expect_sound(runs.back());
  }
  const auto c = test_support::grid_convergence(runs[0].x_r, runs[1].x_r, runs[2].x_r, r);
  std::printf(
      "\nx_r/H: R = %.3f, observed order p = %.2f, extrapolated %.3f, GCI21 = %.2f %% (%.3f H), GCI32 = %.2f "
      "%%, "
      "GCI21 with p = 2: %.2f %%\n",
      c.ratio_r, c.order, c.extrapolated, 100.0 * c.gci_fine, c.gci_fine * runs[0].x_r, 100.0 * c.gci_medium,
      100.0 * c.gci_fine_formal);
  // Monotone convergence (0 < R < 1, Celik et al. 2008); otherwise p and the GCI mean nothing.
  EXPECT_GT(c.ratio_r, 0.0);
  EXPECT_LT(c.ratio_r, 1.0);
}
