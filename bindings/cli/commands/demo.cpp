// acidload demo: the bundled demo case (invented data), run as `run` would.
#include "../cli.hpp"
#include "acidload/core/version.hpp"
#include "demo_case.hpp"
#include "run_case.hpp"

namespace acidload_cli {
namespace {

int run(const std::vector<std::string>& args, std::FILE* out) {
  Options("demo").parse(args);
  std::fprintf(out, "acidload %s — demo: Harrowfield landfill, engine 2 (invented data)\n\n", acidload::version());
  return run_case(out, acidload::io::load_case_text(demo_case_text, "demo-site.yaml (bundled)", "."), "");
}

}  // namespace

extern const Command demo_command{
    "demo", "demo", "run the bundled demo site (invented data)",
    "usage: acidload demo\n\n"
    "Runs the bundled demo case (a copy of cases/demo-site.yaml built into the program: Harrowfield\n"
    "landfill, engine 2 — invented data).\n",
    run};

}  // namespace acidload_cli
