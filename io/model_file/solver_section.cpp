// [solver]: tolerances, linear solver, face thickness scheme and threads.
#include <algorithm>
#include <cmath>
#include <fstream>

#include "io/files/input_file_guard.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"
#include "solver/linear_solver.hpp"

namespace aquiledger {

void read_solver(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::table* t = optional_table(ctx, root, "solver");
  if (!t) return;
  const std::string path = "[solver]";
  check_keys(ctx, *t, path,
             {"linear", "head_tolerance", "flow_tolerance", "max_iterations", "max_cutbacks",
              "threads", "face_thickness"});
  SolverSettings& s = model.solver;
  if (auto l = read_choice(ctx, *t, "linear", path,
                           {"auto", "direct", "pcg", "bicgstab", "multigrid"})) {
    s.linear = *l == "direct"      ? LinearChoice::direct
               : *l == "pcg"       ? LinearChoice::pcg
               : *l == "bicgstab"  ? LinearChoice::bicgstab
               : *l == "multigrid" ? LinearChoice::multigrid
                                   : LinearChoice::automatic;
    if (s.linear == LinearChoice::multigrid && !multigrid_available())
      ctx.error(*t->get("linear"), key_path(path, "linear"),
                "\"multigrid\" needs a program built with -DAQUILEDGER_WITH_HYPRE=ON; this one "
                "was built without it (use \"auto\")");
  }
  if (auto f = read_choice(ctx, *t, "face_thickness", path, {"mean", "upstream"}))
    s.face_thickness = *f == "upstream" ? FaceThickness::upstream : FaceThickness::mean;
  auto positive = [&](std::string_view key, double& into, const std::string& unit) {
    if (auto v = read_number(ctx, *t, key, path, false)) {
      if (*v > 0.0)
        into = *v;
      else
        ctx.error(*t->get(key), key_path(path, key),
                  "value " + show_number(*v) + "; expected > 0" + unit);
    }
  };
  positive("head_tolerance", s.head_tolerance, " " + ctx.length_unit);
  positive("flow_tolerance", s.flow_tolerance, " (relative to the throughflow)");
  auto count = [&](std::string_view key, int& into, long long lowest) {
    if (auto v = read_integer(ctx, *t, key, path, false)) {
      if (*v >= lowest && *v <= 1000000)
        into = static_cast<int>(*v);
      else
        ctx.error(*t->get(key), key_path(path, key),
                  "value " + std::to_string(*v) + "; expected an integer from " +
                      std::to_string(lowest) + " to 1000000");
    }
  };
  count("max_iterations", s.max_iterations, 1);
  count("max_cutbacks", s.max_cutbacks, 0);
  count("threads", s.threads, 0);
}

}  // namespace aquiledger
