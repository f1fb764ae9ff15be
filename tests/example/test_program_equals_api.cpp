// The program and the C++ API give the same numbers for the shipped cases: the summary the program
// writes is byte-identical to the one made here through the API.
#include <doctest/doctest.h>

#include <cstdlib>
#include <filesystem>
#include <string>
#include <unistd.h>
#include <fstream>
#include <sstream>
#include <string>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/results.hpp"

namespace fs = std::filesystem;

TEST_CASE("program output equals the API's for the shipped cases") {
  for (const char* name : {"demo-site", "drifting-gas"}) {
    const std::string file = std::string(ACIDLOAD_SOURCE_DIR) + "/cases/" + name + ".yaml";
    const acidload::io::CaseFile c = acidload::io::load_case(file);
    std::vector<acidload::VariantSummary> rows;
    for (const auto& v : c.variants) rows.push_back(acidload::summarize(v));
    const std::string api = acidload::io::summary_json(c, rows);
    // a folder of this process's own: runs in other build folders at the same time must not meet here
    const fs::path out = fs::temp_directory_path() / ("acidload-example-" + std::to_string(::getpid()) + "-" + name);
    fs::remove_all(out);
    const std::string cmd = std::string("\"") + ACIDLOAD_CLI + "\" run \"" + file + "\" --out \"" + out.string() + "\" > /dev/null";
    REQUIRE(std::system(cmd.c_str()) == 0);
    std::ifstream in(out / "summary.json");
    std::stringstream program;
    program << in.rdbuf();
    INFO(name);
    CHECK(program.str() == api);
    CHECK(acidload::io::trajectories_csv(rows).size() == fs::file_size(out / "trajectories.csv"));
    fs::remove_all(out);
  }
}
