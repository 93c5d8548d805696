#pragma once
// The path through an audit drawn as a strip of folded cards, one per step. A card shows its
// number, its name and its state (ahead, open, current, done); clicking an open card asks to go
// there. The strip paints itself; it holds no audit state of its own.
#include <QStringList>
#include <QVector>
#include <QWidget>

namespace foldline::ui {

class StepBar : public QWidget {
    Q_OBJECT
public:
    enum class State { Locked, Open, Done };
    explicit StepBar(const QStringList& names, QWidget* parent = nullptr);

    int current() const { return current_; }
    int count() const { return int(names_.size()); }
    State state(int i) const { return states_.value(i, State::Locked); }
    /// Rectangle of card i in widget coordinates (empty for i out of range).
    QRect card_rect(int i) const;

    QSize sizeHint() const override;
    QSize minimumSizeHint() const override;

public slots:
    void set_current(int i);
    void set_state(int i, foldline::ui::StepBar::State s);

signals:
    void step_requested(int index);

protected:
    void paintEvent(QPaintEvent*) override;
    void mousePressEvent(QMouseEvent*) override;
    void mouseMoveEvent(QMouseEvent*) override;
    void leaveEvent(QEvent*) override;
    bool event(QEvent*) override;
    bool dark() const;

private:
    int card_at(QPoint p) const;
    QStringList names_;
    QVector<State> states_;
    int current_ = 0;
    int hover_ = -1;
};

}  // namespace foldline::ui
