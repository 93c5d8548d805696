#pragma once
// Parsing one record-aligned chunk of a CSV body into per-chunk column pieces: numbers for
// columns still believed numeric, chunk-local dictionary codes for categorical ones. The reader
// merges the pieces in file order (csv_reader.cpp).
#include <array>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/progress.h"
#include "core/io/csv_tokenizer.h"
#include "core/io/level_dictionary.h"
#include "core/io/local_codes.h"

namespace foldline {

/// How a column is read. Inferred: numeric until a cell is not a number, then categorical.
enum class ColumnKind : std::uint8_t { Inferred, Numeric, Categorical, Count };

/// Which cell texts mean "missing".
class MissingMarkers {
public:
    explicit MissingMarkers(const std::vector<std::string>& markers);
    /// True when text is one of the markers (empty text only if "" is a marker).
    bool operator()(std::string_view text) const {
        if (text.empty()) return empty_;
        if (text.size() > max_len_ || !first_[static_cast<unsigned char>(text[0])]) return false;
        for (const auto& m : markers_)
            if (m == text) return true;
        return false;
    }

private:
    bool empty_ = false;
    std::size_t max_len_ = 0;
    std::array<bool, 256> first_{};
    std::vector<std::string> markers_;
};

struct ChunkPlan {
    const char* data = nullptr;  ///< whole input; chunk offsets index it
    std::size_t size = 0;        ///< bytes in the whole input
    char delimiter = ',';
    std::vector<ColumnKind> kinds;
    MissingMarkers missing{{}};
    bool skip_ragged = false;
    std::size_t max_field_bytes = 0;
    std::size_t max_fields_per_row = 0;
    std::size_t bytes_per_row = 64;  ///< estimate, for reserving
};

struct ChunkColumn {
    bool categorical = false;    ///< encoding as levels in this chunk
    std::vector<double> values;  ///< numeric cells (NaN = missing); weights for the count column
    LevelDictionary dict;
    LocalCodes codes;
    std::size_t missing = 0;
    bool overflow = false;  ///< saw a number beyond the double range
    std::size_t overflow_line = 0;
    std::string overflow_text;
};

struct Chunk {
    std::size_t begin = 0, end = 0;  ///< byte range in the input, record-aligned
    std::size_t rows = 0;
    std::size_t lines = 0;  ///< newlines in the range
    std::vector<ChunkColumn> cols;
    std::vector<std::size_t> skipped;  ///< 0-based lines, relative to the chunk start
    bool parsed = false;
    bool overran = false;  ///< a quoted field runs past `end`: the split was inside quotes
    std::size_t overrun_from = 0;  ///< offset of that field's opening quote
    bool failed = false;
    TokenError error;  ///< line relative to the chunk start
};

/// Parses chunk.begin..chunk.end. On malformed input sets chunk.failed and chunk.error and
/// stops; a stop request gives the error "cancelled". When a quoted field is still open at
/// `end` (and `end` is not the end of input) it sets chunk.overran instead: the chunk must be
/// joined with the next one. New levels are checked to be UTF-8 (numbers are ASCII by
/// construction), so every cell of a finished chunk is valid UTF-8. An empty range gives zero rows.
void parse_chunk(const ChunkPlan& plan, Chunk& chunk, const Work& work);

/// Re-reads the chunk's first `row_limit` rows and dictionary-encodes columns `cols` of them,
/// replacing whatever those columns held (row_limit 0 leaves them empty). Used when a column
/// turns out not to be numeric.
void encode_as_categorical(const ChunkPlan& plan, Chunk& chunk, const std::vector<std::size_t>& cols,
                           std::size_t row_limit);

}  // namespace foldline
