// Inflow profile tables: what a good table gives (its columns, shifted coordinates, linear
// interpolation), one-line errors for every bad table (missing or unreadable file, missing
// columns, too few rows, coordinates that do not increase, non-finite values), the case loader's
// message around them, and the boundary map's check that a profile covers its segment.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "grid/boundary.hpp"
#include "io/case_loader.hpp"
#include "io/profile_reader.hpp"
#include "meshes/node_coordinates.hpp"
#include "unit/io/input_error_of.hpp"

using namespace wallrans;
using test_support::input_error_of;
namespace fs = std::filesystem;

namespace {

// A scratch folder for the tables of one test, removed afterwards.
class Tables : public ::testing::Test {
 protected:
  void SetUp() override {
    const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
    dir_ = fs::temp_directory_path() / ("wallrans_profile_" + std::string(info->name()));
    fs::remove_all(dir_);
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }
  std::string write(const std::string& name, const std::string& text) const {
    std::ofstream(dir_ / name) << text;
    return (dir_ / name).string();
  }
  // A channel case 2 m x 1 m, 4 x 4 cells, whose left side takes the given profile file.
  std::string channel_case(const std::string& model, const std::string& table, double shift = 0.0) const {
    return "flow: {kinematic_viscosity: 1.0e-3}\n"
           "grid: {generator: channel, cells: [4, 4], length: 2.0, height: 1.0}\n"
           "boundaries:\n"
           "  - {side: left, kind: inflow, profile_file: " +
           table + ", profile_shift: " + std::to_string(shift) +
           "}\n"
           "  - {side: right, kind: outflow}\n"
           "  - {side: bottom, kind: wall}\n"
           "  - {side: top, kind: wall}\n"
           "turbulence: {model: " +
           model + "}\n";
  }
  fs::path dir_;
};

// A table in the layout of the program's profile_x<x>.csv (extra columns are ignored).
const char* good_table =
    "x,y,wall_distance,u,v,nu_tilde\n"
    "5,0.0,0.0,0.0,0.0,0.0\n"
    "5,0.25,0.25,0.5,0.01,3e-3\n"
    "5,0.5,0.5,0.8,0.02,4e-3\n"
    "5,1.0,1.0,1.0,0.03,3e-3\n";

}  // namespace

TEST_F(Tables, GoodTableGivesItsColumnsShiftedAndInterpolatesLinearly) {
  const std::string path = write("inlet.csv", good_table);
  const InflowProfile p = read_inflow_profile(path, "y", "nu_tilde", "spalart_allmaras", 2.0);
  EXPECT_EQ(p.file, path);
  ASSERT_EQ(p.coordinate.size(), 4u);
  EXPECT_EQ(p.front(), 2.0);
  EXPECT_EQ(p.back(), 3.0);
  EXPECT_EQ(p.u[2], 0.8);
  EXPECT_EQ(p.v[3], 0.03);
  EXPECT_EQ(p.model_variable[1], 3e-3);
  const ProfileValue mid = p.at(2.375);  // halfway between the rows at y = 0.25 and 0.5
  EXPECT_NEAR(mid.velocity.x, 0.65, 1e-15);
  EXPECT_NEAR(mid.velocity.y, 0.015, 1e-15);
  EXPECT_NEAR(mid.model_variable, 3.5e-3, 1e-17);
  EXPECT_TRUE(p.covers(2.0));
  EXPECT_TRUE(p.covers(3.0));
  EXPECT_FALSE(p.covers(1.99));
  EXPECT_FALSE(p.covers(3.01));
  // A model without a transported variable needs no such column.
  const InflowProfile laminar = read_inflow_profile(path, "y", "", "laminar", 0.0);
  EXPECT_TRUE(laminar.model_variable.empty());
  EXPECT_EQ(laminar.at(0.5).model_variable, 0.0);
}

TEST_F(Tables, BadTablesAreOneLineErrorsNamingTheFile) {
  struct Bad {
    const char* name;
    std::string text;  // "" : no file at all
    std::string also;
  };
  const Bad cases[] = {
      {"missing.csv", "", "expected a readable profile file (CSV), got No such file or directory"},
      {"no_v.csv", "y,u,nu_tilde\n0,0,0\n1,1,0\n",
       ":1: expected columns y, u, v and nu_tilde (the variable of "
       "model spalart_allmaras), got y, u, nu_tilde (no column 'v')"},
      {"no_variable.csv", "y,u,v\n0,0,0\n1,1,0\n", "(no column 'nu_tilde')"},
      {"one_row.csv", "y,u,v,nu_tilde\n0.5,1,0,0\n",
       "expected at least 2 rows to interpolate between, got 1"},
      {"header_only.csv", "y,u,v,nu_tilde\n", "expected at least 2 rows to interpolate between, got 0"},
      {"decreasing.csv", "y,u,v,nu_tilde\n0,0,0,0\n0.5,1,0,0\n0.4,1,0,0\n",
       "row 3 (after the header): column 'y': expected coordinates increasing strictly from row to row, got "
       "0.4 after 0.5"},
      {"repeated.csv", "y,u,v,nu_tilde\n0,0,0,0\n0,1,0,0\n", "row 2 (after the header): column 'y'"},
      {"nan.csv", "y,u,v,nu_tilde\n0,0,0,0\n1,nan,0,0\n",
       "row 2 (after the header): column 'u': expected a finite number, got nan"},
      {"text.csv", "y,u,v,nu_tilde\n0,0,0,0\n1,fast,0,0\n", ":3: column 'u': expected a number, got 'fast'"},
  };
  for (const Bad& bad : cases) {
    const std::string path = bad.text.empty() ? (dir_ / bad.name).string() : write(bad.name, bad.text);
    const std::string message =
        input_error_of([&] { read_inflow_profile(path, "y", "nu_tilde", "spalart_allmaras", 0.0); });
    SCOPED_TRACE(bad.name);
    EXPECT_EQ(message.rfind(path, 0), 0u) << message;
    EXPECT_NE(message.find(bad.also), std::string::npos) << message;
    EXPECT_EQ(message.find('\n'), std::string::npos) << message;
  }
  const std::string message =
      input_error_of([&] { read_inflow_profile(dir_.string(), "y", "", "laminar", 0.0); });
  EXPECT_NE(message.find("expected a readable profile file (CSV), got a directory"), std::string::npos)
      << message;
}

TEST_F(Tables, CaseLoaderReadsTheTableForTheCasesModelAndNamesTheSegment) {
  const std::string path = write("inlet.csv", good_table);
  const CaseSpec spec = parse_case_text(channel_case("spalart_allmaras", path), dir_ / "case.yaml");
  ASSERT_TRUE(spec.boundaries[0].profile);
  EXPECT_EQ(spec.boundaries[0].profile->variable_column, "nu_tilde");
  EXPECT_EQ(spec.boundaries[0].profile->coordinate.size(), 4u);
  // A relative path is taken from the case file's folder.
  const CaseSpec relative =
      parse_case_text(channel_case("laminar", "inlet.csv"), (dir_ / "case.yaml").string());
  EXPECT_EQ(relative.boundaries[0].profile->file, path);
  // The k model needs its own variable, which this table lacks: the message names the case file,
  // the segment's line and key, then the table's own complaint.
  const std::string message = input_error_of(
      [&] { parse_case_text(channel_case("k_equation", path), (dir_ / "case.yaml").string()); });
  EXPECT_EQ(message.rfind((dir_ / "case.yaml").string() + ":4: key 'boundaries[0].profile_file': " + path +
                              ":1: "
                              "expected columns y, u, v and k (the variable of model k_equation)",
                          0),
            0u)
      << message;
  EXPECT_EQ(message.find('\n'), std::string::npos);
}

TEST_F(Tables, BoundaryMapRefusesAProfileThatDoesNotCoverItsSegment) {
  const std::string path = write("inlet.csv", good_table);
  const std::string case_file = (dir_ / "case.yaml").string();
  // Rows from y = 0 to 1 cover the side [0, 1]; shifted by 0.2 they start above the lowest face
  // centre (y = 0.125).
  const CaseSpec covered = parse_case_text(channel_case("laminar", path), case_file);
  EXPECT_NO_THROW(BoundaryMap(covered, generate_nodes(covered.grid)));
  const CaseSpec shifted = parse_case_text(channel_case("laminar", path, 0.2), case_file);
  const std::string message = input_error_of([&] { BoundaryMap(shifted, generate_nodes(shifted.grid)); });
  EXPECT_EQ(message.rfind(case_file +
                              ":4: key 'boundaries[0].profile_file': expected a profile covering every "
                              "face of the segment on side 'left', got rows from 0.200000 to 1.200000 in " +
                              path + " and a face at y = 0.125000",
                          0),
            0u)
      << message;
}
