#pragma once
// A small command-line parser shared by every subcommand: positionals, `--name value`,
// `--name=value`, boolean `--flag` / `--no-flag`. Unknown options are usage errors (exit 2).
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace foldline::cli {

struct OptionSpec {
    std::string name;      ///< without leading dashes
    bool takes_value = true;
    std::string help;
};

class Args {
public:
    /// Parses argv[first..]; returns an error message for unknown options or missing values.
    static std::optional<std::string> parse(int argc, char** argv, int first,
                                            const std::vector<OptionSpec>& specs, Args& out);
    const std::vector<std::string>& positional() const { return positional_; }
    bool has(const std::string& name) const { return values_.count(name) > 0; }
    std::optional<std::string> get(const std::string& name) const;
    std::string get_or(const std::string& name, const std::string& fallback) const;
    /// For boolean options: --x → true, --no-x → false, absent → fallback.
    bool flag(const std::string& name, bool fallback) const;

private:
    std::vector<std::string> positional_;
    std::map<std::string, std::string> values_;
};

}  // namespace foldline::cli
