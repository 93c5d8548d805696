#include "core/report/verdict_json.h"

#include <cmath>

#include "core/report/causal_json.h"

namespace foldline::report {

nlohmann::json verdict_to_json(const FindingVerdict& v) {
    using nlohmann::json;
    auto num = [](double x) { return std::isfinite(x) ? json(x) : json(nullptr); };
    json j = to_json(v.verdict);
    json est = nullptr;
    if (const auto& e = v.estimate)
        est = {{"view", std::string(to_string(e->view))}, {"over", e->over}, {"measure", e->measure},
               {"estimate", e->estimate}, {"ci", json::array({num(e->ci_low), num(e->ci_high)})}};
    j["adjusted_estimate"] = std::move(est);
    if (!v.estimate_problem.empty()) j["estimate_problem"] = v.estimate_problem;
    return j;
}

}  // namespace foldline::report
