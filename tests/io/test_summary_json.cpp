#include <catch2/catch.hpp>

#include "io/results/summary_json.hpp"

using namespace aquiledger;

// JSON string escaping follows RFC 8259, section 7: quote, backslash and control characters
// must be escaped; NaN has no JSON form (section 6), so it is written as null.
TEST_CASE("summary JSON escapes text and has the documented keys", "[io][json]") {
  RunSummary s;
  s.version = "0.1.0";
  s.title = "Basin \"north\"\\2\n\ttab";
  s.newton_iterations_per_step = {3, 5, 4};
  s.max_abs_imbalance_percent = std::numeric_limits<double>::quiet_NaN();
  s.warnings = {"river partly outside", "bell\x07"};
  const std::string j = summary_json(s);
  CHECK(j.find(R"("model_title": "Basin \"north\"\\2\n\ttab")") != std::string::npos);
  CHECK(j.find(R"("iterations_per_step": [3, 5, 4])") != std::string::npos);
  CHECK(j.find(R"("iterations_per_step_stats": {"min": 3, "max": 5, "mean": 4})") !=
        std::string::npos);
  CHECK(j.find(R"("largest_imbalance_percent": null)") != std::string::npos);
  CHECK(j.find(R"("bell\u0007")") != std::string::npos);
  CHECK(j.find(R"("newton_iterations": 12)") != std::string::npos);  // 3 + 5 + 4
  CHECK(j.find(R"("converged": true)") != std::string::npos);
  CHECK(j.find(R"("failure": null)") != std::string::npos);
  CHECK(j.find(R"("caution": ")") != std::string::npos);
  CHECK(j.front() == '{');
}
