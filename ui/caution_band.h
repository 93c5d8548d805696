#pragma once
// The caution shown wherever findings appear: a statistical screen, not a determination.
#include <QLabel>

namespace foldline::ui {

/// The caution sentence itself (also used in tooltips and the memo page).
QString caution_text();

class CautionBand : public QLabel {
    Q_OBJECT
public:
    explicit CautionBand(QWidget* parent = nullptr);

protected:
    void changeEvent(QEvent* e) override;

private:
    void restyle();
};

}  // namespace foldline::ui
