#include "app/cli/args.h"

namespace foldline::cli {

std::optional<std::string> Args::parse(int argc, char** argv, int first,
                                       const std::vector<OptionSpec>& specs, Args& out) {
    auto find = [&](const std::string& n) -> const OptionSpec* {
        for (const auto& s : specs)
            if (s.name == n) return &s;
        return nullptr;
    };
    for (int i = first; i < argc; ++i) {
        std::string a = argv[i];
        if (a.size() < 3 || a.rfind("--", 0) != 0) {
            out.positional_.push_back(a);
            continue;
        }
        std::string name = a.substr(2), value;
        bool has_value = false;
        if (auto eq = name.find('='); eq != std::string::npos) {
            value = name.substr(eq + 1);
            name = name.substr(0, eq);
            has_value = true;
        }
        const OptionSpec* spec = find(name);
        if (!spec && name.rfind("no-", 0) == 0) {
            const OptionSpec* pos = find(name.substr(3));
            if (pos && !pos->takes_value && !has_value) {
                out.values_[pos->name] = "false";
                continue;
            }
        }
        if (!spec) return "unknown option --" + name;
        if (spec->takes_value) {
            if (!has_value) {
                if (i + 1 >= argc) return "option --" + name + " needs a value";
                value = argv[++i];
            }
            out.values_[name] = value;
        } else {
            if (has_value) return "option --" + name + " takes no value";
            out.values_[name] = "true";
        }
    }
    return std::nullopt;
}

std::optional<std::string> Args::get(const std::string& name) const {
    auto it = values_.find(name);
    if (it == values_.end()) return std::nullopt;
    return it->second;
}

std::string Args::get_or(const std::string& name, const std::string& fallback) const {
    auto v = get(name);
    return v ? *v : fallback;
}

bool Args::flag(const std::string& name, bool fallback) const {
    auto v = get(name);
    if (!v) return fallback;
    return *v == "true";
}

}  // namespace foldline::cli
