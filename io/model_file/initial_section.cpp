// [initial]: the starting heads (a field value, a head array of an earlier run) or steady = true.
#include <cmath>

#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

void read_initial(ReaderContext& ctx, const toml::table& root, Model& model) {
  const std::string path = "[initial]";
  const toml::node* node = root.get("initial");
  if (!node || !node->as_table()) {
    if (node)
      ctx.error(*node, path, "expected a table, found " + type_name(*node));
    else
      ctx.error(ctx.file_spot(), path,
                "missing required section (head = field value, or steady = true)");
    return;
  }
  const toml::table& t = *node->as_table();
  check_keys(ctx, t, path, {"head", "steady"});
  const bool steady = read_bool(ctx, t, "steady", path).value_or(false);
  if (steady && t.contains("head")) {
    ctx.error(*t.get("head"), path + ".head", "give either head or steady = true, not both");
    return;
  }
  model.initial.steady = steady;
  if (steady) return;
  auto head = read_field_key(ctx, t, "head", path, true);
  if (!head) return;
  if (!check_field(
          ctx, *head, path + ".head", [](double v) { return std::isfinite(v); },
          "a head in " + ctx.length_unit))
    return;
  // A head array written by a run whose active cells differ marks its inactive cells with
  // the no-value number: such a cell active here has no head to start from.
  if (!check_field(
          ctx, *head, path + ".head", [](double v) { return v != head_array_no_value; },
          "a head; " + show_number(head_array_no_value) +
              " marks a cell that was inactive in the run that wrote the head array"))
    return;
  if (!ctx.diagnostics.has_errors()) model.initial.head = head->take();
}

}  // namespace aquiledger
