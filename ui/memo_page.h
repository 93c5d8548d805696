#pragma once
// Step 6, Memo: a readable preview of the audit so far — the data, the question, the findings
// with the reviewer's decisions and notes, and the caution.
#include <QImage>
#include <QWidget>

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

signals:
    void export_requested();

private:
    FindingsModel* model_;
    QTextBrowser* text_;
    QLabel* preview_;
    QImage page_;
};

}  // namespace foldline::ui
