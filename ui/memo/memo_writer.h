#pragma once
// Draws the memo (core/report/memo_content.h) as a PDF with Qt's own PDF writer: A4 or US
// Letter, fonts embedded, text selectable, a header with the audit title and page numbers on
// every page, charts drawn by QCustomPlot as vector graphics, the causal diagram with node roles.
//
// Every text is laid out as plain text (QTextLayout), never as markup: a column named
// "<b>x</b>" or a note holding HTML prints as typed. Control characters and Unicode bidi
// controls in the texts are shown as visible [U+XXXX] marks so they cannot reorder the page;
// right-to-left words print in their own direction inside left-to-right paragraphs.
#include <string>

// Core headers first: Qt's `slots` keyword macro would otherwise clash with Question::slots().
#include "core/common/error.h"
#include "core/report/memo_content.h"

#include <QByteArray>
#include <QColor>
#include <QImage>

namespace foldline::ui {

/// Makes sure a QApplication exists (the charts are QCustomPlot widgets). When none exists it
/// creates one for the rest of the process, on the offscreen platform unless QT_QPA_PLATFORM
/// says otherwise, so headless commands never need a display. Cheap when one already exists.
void ensure_memo_application();

/// The memo as PDF bytes. An empty MemoContent gives a one-page PDF with the caution.
QByteArray memo_pdf(const report::MemoContent& memo);

/// Page `page` (1-based) of the memo as an image `width_px` wide, for a preview beside the
/// menu action. Null image when the page does not exist or width_px <= 0.
QImage memo_page_image(const report::MemoContent& memo, int page, int width_px);

/// Writes the memo atomically to `path`. Error names the file and the reason (missing or
/// read-only folder); a previous file at `path` is then left as it was.
Status write_memo_pdf(const report::MemoContent& memo, const std::string& path);

/// The fill of a `role`'s box in the memo's diagram: ui/role_style's colour at fill_alpha(false)
/// over white paper, opaque, so print and the canvas in a light theme match.
QColor memo_role_fill(causal::Role role);

/// Text as it will be printed: control and bidi-control characters replaced by visible
/// [U+XXXX] marks (tab and line feed kept). Empty → empty.
QString printable(const std::string& text);

}  // namespace foldline::ui
