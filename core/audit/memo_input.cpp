#include "core/audit/memo_input.h"

#include <cstdlib>
#include <ctime>

namespace foldline::audit {

report::MemoInput memo_input(const ScanResult& result, const DataInfo& data, const project::Project* project,
                             const Table* table, std::string date, std::string data_change) {
    report::MemoInput in;
    in.scan = &result;
    in.data = data;
    in.project = project;
    in.table = table;
    in.date = std::move(date);
    in.data_change = std::move(data_change);
    return in;
}

std::string today() {
    std::time_t t = std::time(nullptr);
    if (const char* epoch = std::getenv("SOURCE_DATE_EPOCH"); epoch && *epoch) t = static_cast<std::time_t>(std::atoll(epoch));
    std::tm tm{};
    gmtime_r(&t, &tm);
    char buf[16];
    std::strftime(buf, sizeof buf, "%Y-%m-%d", &tm);
    return buf;
}

}  // namespace foldline::audit
