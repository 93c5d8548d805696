#include "core/report/diagram_checks_json.h"

#include "core/report/json_number.h"

namespace foldline::report {

nlohmann::json to_json(const causal::DiagramChecks& checks) {
    nlohmann::json claims = nlohmann::json::array();
    for (const auto& c : checks.checks) {
        const bool ran = c.method != causal::CheckMethod::None;
        claims.push_back({{"a", c.a},
                          {"b", c.b},
                          {"given", c.given},
                          {"form", causal::to_string(c.form)},
                          {"unobserved", c.unobserved},
                          {"method", causal::to_string(c.method)},
                          {"statistic", ran ? json_number(c.test.statistic) : nullptr},
                          {"df", ran ? json_number(c.test.df) : nullptr},
                          {"p", ran ? json_number(c.test.p) : nullptr},
                          {"q", json_number(c.q)},
                          {"n", ran ? json_number(c.test.n) : nullptr},
                          {"partial_r", ran ? json_number(c.test.partial_r) : nullptr},
                          {"contradicted", c.contradicted},
                          {"note", c.note},
                          {"sentence", c.sentence}});
    }
    return {{"alpha", checks.alpha},
            {"tested", checks.tested},
            {"contradicted", checks.contradicted},
            {"claims", std::move(claims)}};
}

}  // namespace foldline::report
