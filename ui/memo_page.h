#pragma once
// Step 6, Memo: a readable preview of the audit so far — the data, the question, the findings
// with the reviewer's decisions and notes, and the caution.
#include <QImage>
#include <QWidget>

class QComboBox;
class QLabel;
class QTextBrowser;

namespace foldline::ui {

class FindingsModel;
struct QuestionSpec;

class MemoPage : public QWidget {
    Q_OBJECT
public:
    MemoPage(FindingsModel* model, QWidget* parent = nullptr);
    /// Rebuilds the preview from the current source, question and findings.
    void refresh(const QString& source, const QuestionSpec* question);
    QString html() const;
    /// Shows page 1 of the PDF memo as it will be written; a null image shows a hint instead.
    void set_page_preview(const QImage& page);
    /// The preview shown (null when none).
    QImage page_preview() const { return page_; }
    /// The memo's detail: "families" (one section per family lead, the default) or "full" (one
    /// section per finding), as the project file's `memo.detail` spells it.
    QString detail() const;
    /// Shows a project's choice without signalling a change; anything else reads as "families".
    void set_detail(const QString& detail);

signals:
    void export_requested();
    /// The reviewer chose another detail (not emitted by set_detail).
    void detail_changed();

private:
    FindingsModel* model_;
    QTextBrowser* text_;
    QLabel* preview_;
    QComboBox* detail_;
    QImage page_;
};

}  // namespace foldline::ui
