#include "core/causal/missing_columns.h"

#include <algorithm>

namespace foldline::causal {

std::vector<std::string> missing_columns(const Diagram& d, const std::vector<std::string>& columns) {
    std::vector<std::string> out;
    for (const auto& c : columns) {
        if (c.empty() || d.find_node(c) >= 0) continue;
        if (std::find(out.begin(), out.end(), c) == out.end()) out.push_back(c);
    }
    return out;
}

std::string missing_columns_sentence(const std::vector<std::string>& missing) {
    if (missing.empty()) return {};
    std::string names;
    for (std::size_t i = 0; i < missing.size(); ++i) {
        if (i > 0) names += i + 1 == missing.size() ? " and " : ", ";
        names += quote_name(missing[i]);
    }
    const bool one = missing.size() == 1;
    return std::string("the diagram lacks the finding's ") + (one ? "column " : "columns ") + names + "; add " +
           (one ? "it" : "them") + " to the diagram to learn which view answers the question";
}

}  // namespace foldline::causal
