#include "core/report/causal_json.h"

namespace foldline::report {

using nlohmann::json;

namespace {

json optional_set(const std::optional<std::vector<std::string>>& s) {
    return s ? json(*s) : json(nullptr);
}

}  // namespace

json roles_to_json(const std::vector<causal::NamedRole>& roles) {
    json out = json::array();
    for (const auto& r : roles)
        out.push_back({{"name", r.name}, {"role", std::string(causal::to_string(r.role))}, {"observed", r.observed}});
    return out;
}

json to_json(const causal::Verdict& v) {
    const auto& d = v.direct_effect;
    return json{
        {"answer", std::string(causal::to_string(v.answer))},
        {"exposure", v.exposure},
        {"outcome", v.outcome},
        {"stratifier", v.stratifier},
        {"stratifier_roles", roles_to_json(v.stratifier_roles)},
        {"stratifier_valid", v.stratifier_valid},
        {"empty_set_valid", v.empty_set_valid},
        {"valid_sets", v.valid_sets},
        {"standardise_over", optional_set(v.standardise_over)},
        {"unobserved_needed", v.unobserved_needed},
        {"roles", roles_to_json(v.roles)},
        {"reason", v.reason},
        {"direct_effect",
         {{"applies", d.applies},
          {"mediators", d.mediators},
          {"identifiable", d.identifiable},
          {"stratifier_suffices", d.stratifier_suffices},
          {"conditioning_set", d.conditioning_set},
          {"extra_sets", d.extra_sets},
          {"reason", d.reason}}},
    };
}

json to_json(const causal::AdjustmentReport& r) {
    return json{
        {"exposure", r.exposure},
        {"outcome", r.outcome},
        {"roles", roles_to_json(r.roles)},
        {"empty_set_valid", r.empty_set_valid},
        {"minimal_sets", r.minimal_sets},
        {"truncated", r.truncated},
        {"smallest", optional_set(r.smallest)},
        {"identifiable", r.identifiable},
        {"unobserved_needed", r.unobserved_needed},
        {"outcome_causes_exposure", r.outcome_causes_exposure},
        {"summary", r.summary},
    };
}

}  // namespace foldline::report
