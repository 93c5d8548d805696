#include "core/report/small_counts_json.h"

#include <string>

#include "core/report/json_number.h"

namespace foldline::report {

namespace {

using nlohmann::json;

json exact_json(const stats::ExactCommonOr& e) {
    json at_bound = nullptr;  // S at an end of its support: the MLE is 0 or infinite
    if (e.status == stats::ExactStatus::Computed && e.hi > e.lo) {
        if (e.s <= double(e.lo)) at_bound = "lower";
        else if (e.s >= double(e.hi)) at_bound = "upper";
    }
    return {{"status", std::string(to_string(e.status))},
            {"s", json_number(e.s)},
            {"support_low", e.lo},
            {"support_high", e.hi},
            {"p", json_number(e.p_two_sided)},
            {"p_greater", json_number(e.p_greater)},
            {"p_less", json_number(e.p_less)},
            {"or", json_number(e.estimate)},
            {"or_ci", {json_number(e.ci.lo), json_number(e.ci.hi)}},
            {"s_at_bound", at_bound}};
}

}  // namespace

json small_counts_to_json(const SmallCounts& sc) {
    const auto& mf = sc.mantel_fleiss;
    const auto& bd = sc.breslow_day;
    json fisher = json::array();
    for (const auto& f : sc.fisher) fisher.push_back(exact_json(f));
    json zelen = nullptr;
    if (sc.zelen_run)
        zelen = {{"status", std::string(to_string(sc.zelen.status))},
                 {"p", json_number(sc.zelen.p)},
                 {"tables", json_number(sc.zelen.tables)}};
    return {{"mantel_fleiss",
             {{"expected", json_number(mf.expected)},
              {"lower", json_number(mf.lower)},
              {"upper", json_number(mf.upper)},
              {"distance", json_number(mf.distance)},
              {"satisfied", mf.satisfied}}},
            {"adjusted_test", std::string(to_string(sc.adjusted_used))},
            {"adjusted_reason", sc.adjusted_reason},
            {"exact", sc.exact_run ? exact_json(sc.exact) : json(nullptr)},
            {"fisher", fisher},
            {"breslow_day_fit",
             {{"fitted_cells", sc.breslow_day.fitted_cells},
              {"small_cells", bd.small_cells},
              {"small_share", json_number(bd.small_share)},
              {"trusted", bd.trusted}}},
            {"homogeneity_test", std::string(to_string(sc.homogeneity_used))},
            {"homogeneity_reason", sc.homogeneity_reason},
            {"zelen", zelen}};
}

}  // namespace foldline::report
