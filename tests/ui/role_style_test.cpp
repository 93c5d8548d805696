// tests/ui/role_style_test.cpp <-> ui/role_style.h, ui/diagram_scene.h (NodeItem),
// ui/memo/memo_writer.h (memo_role_fill)
//
// One table of role styles: every causal::Role has one, the canvas keeps the colours and shapes
// it had (Okabe–Ito colours: Okabe & Ito 2008, "Color Universal Design", hex values as in
// ui/palette.cpp), and the canvas and the memo paint the same colour for each role — checked on
// rendered pixels, not on the table itself.
#include "core/report/memo_content.h"  // core before Qt (see DEVELOPERS.md)

#include <QApplication>
#include <QGraphicsScene>
#include <QImage>
#include <QPainter>
#include <QSet>
#include <QtTest>

#include "ui/diagram_scene.h"
#include "ui/memo/memo_writer.h"
#include "ui/role_style.h"

using namespace foldline;
using namespace foldline::ui;
using causal::Role;

namespace {

constexpr int kRoleCount = static_cast<int>(Role::Unrelated) + 1;

// Pixels of `img` within `tol` of `c` in every channel.
int count_colour(const QImage& img, const QColor& c, int tol) {
    int n = 0;
    const QImage rgb = img.convertToFormat(QImage::Format_RGB32);
    for (int y = 0; y < rgb.height(); ++y) {
        const auto* line = reinterpret_cast<const QRgb*>(rgb.constScanLine(y));
        for (int x = 0; x < rgb.width(); ++x)
            if (std::abs(qRed(line[x]) - c.red()) <= tol && std::abs(qGreen(line[x]) - c.green()) <= tol &&
                std::abs(qBlue(line[x]) - c.blue()) <= tol)
                ++n;
    }
    return n;
}

QPalette light_palette() {
    QPalette pal;
    pal.setColor(QPalette::Window, QColor(0xEF, 0xEF, 0xEF));
    pal.setColor(QPalette::Base, Qt::white);
    pal.setColor(QPalette::WindowText, Qt::black);
    pal.setColor(QPalette::Text, Qt::black);
    return pal;
}

// One node with `role` drawn by the canvas, on a white base.
QImage canvas_image(Role role) {
    QGraphicsScene scene;
    scene.setBackgroundBrush(Qt::white);
    scene.addItem(new NodeItem(DiagramNode{QStringLiteral("income band"), true, QPointF(0, 0)}, role));
    QImage img(240, 120, QImage::Format_RGB32);
    img.fill(Qt::white);
    QPainter p(&img);
    scene.render(&p, QRectF(0, 0, 240, 120), QRectF(-110, -50, 240, 120));
    return img;
}

// A memo whose one section's diagram has a node with `role` (plus exposure and outcome).
QImage memo_images(Role role) {
    report::MemoContent m;
    m.title = "Role colours";
    m.caution = report::kMemoCaution;
    report::MemoSection sec;
    sec.heading = "1. Reversal — branch";
    report::MemoDiagram d;
    d.name = "diagram";
    d.nodes.push_back({"branch", 0, -120, true, role, false});
    d.nodes.push_back({"group", -200, 0, true, Role::Exposure, false});
    d.nodes.push_back({"approved", 200, 0, true, Role::Outcome, false});
    d.edges = {{0, 1}, {0, 2}, {1, 2}};
    sec.diagram = d;
    m.sections.push_back(sec);
    // Every page stacked: the diagram's page is not fixed by this test.
    QImage all(900, 900 * 4, QImage::Format_RGB32);
    all.fill(Qt::white);
    QPainter p(&all);
    int y = 0;
    for (int page = 1; page <= 4; ++page) {
        const QImage img = ui::memo_page_image(m, page, 900);
        if (img.isNull()) break;
        p.drawImage(0, y, img.scaled(900, 900, Qt::KeepAspectRatio));
        y += 900;
    }
    return all;
}

}  // namespace

class RoleStyleTest : public QObject {
    Q_OBJECT
private slots:
    void initTestCase() { QApplication::setPalette(light_palette()); }

    void every_role_has_a_style() {
        QCOMPARE(int(all_roles().size()), kRoleCount);
        QSet<QString> words;
        for (int i = 0; i < kRoleCount; ++i) {
            const Role r = static_cast<Role>(i);
            QCOMPARE(all_roles()[std::size_t(i)], r);
            const QString w = role_words(r);
            QVERIFY2(!w.isEmpty(), causal::to_string(r).data());
            words.insert(w);
            QVERIFY(role_style(r).fill.isValid());
            QCOMPARE(role_style(r).fill.alpha(), 255);
        }
        QCOMPARE(words.size(), kRoleCount);  // no two roles read alike in a legend
        // No role yet: a grey box, no words.
        QVERIFY(role_words(std::nullopt).isEmpty());
        QCOMPARE(role_style(std::nullopt).shape, RoleShape::Box);
    }

    void the_canvas_keeps_its_colours_and_shapes() {
        // Okabe & Ito (2008) hex values, as ui/palette.cpp lists them.
        const QColor vermillion(0xD5, 0x5E, 0x00), yellow(0xF0, 0xE4, 0x42), orange(0xE6, 0x9F, 0x00),
            green(0x00, 0x9E, 0x73), purple(0xCC, 0x79, 0xA7), sky(0x56, 0xB4, 0xE9), grey(0x99, 0x99, 0x99);
        const std::vector<std::tuple<Role, QColor, RoleShape, QString>> expected = {
            {Role::Exposure, vermillion, RoleShape::Framed, "exposure"},
            {Role::Outcome, yellow, RoleShape::Octagon, "outcome"},
            {Role::Confounder, orange, RoleShape::Hexagon, "confounder"},
            {Role::Mediator, green, RoleShape::Capsule, "mediator"},
            {Role::MediatorDescendant, green, RoleShape::Capsule, "after a mediator"},
            {Role::Collider, purple, RoleShape::Funnel, "collider"},
            {Role::ColliderDescendant, purple, RoleShape::Funnel, "after a collider"},
            {Role::OutcomeDescendant, sky, RoleShape::Notched, "after the outcome"},
            {Role::ExposureDescendant, grey, RoleShape::Box, "side effect of exposure"},
            {Role::ExposureCause, grey, RoleShape::Pointer, "cause of exposure only"},
            {Role::OutcomeCause, grey, RoleShape::Box, "cause of outcome only"},
            {Role::Unrelated, grey, RoleShape::Box, "unrelated"},
        };
        QCOMPARE(int(expected.size()), kRoleCount);
        for (const auto& [role, colour, shape, words] : expected) {
            QCOMPARE(role_style(role).fill, colour);
            QCOMPARE(role_style(role).shape, shape);
            QCOMPARE(role_words(role), words);
            const NodeItem item(DiagramNode{QStringLiteral("n"), true, {}}, role);
            QColor drawn = item.fill(light_palette());
            QCOMPARE(drawn.alpha(), fill_alpha(false));
            drawn.setAlpha(255);
            QCOMPARE(drawn, colour);
        }
    }

    void canvas_and_memo_paint_the_same_colour() {
        for (const Role r : all_roles()) {
            const QColor memo = memo_role_fill(r);
            const int on_canvas = count_colour(canvas_image(r), memo, 2);
            const int in_memo = count_colour(memo_images(r), memo, 2);
            // A node box is thousands of pixels at these sizes; a few hundred is a safe floor.
            QVERIFY2(on_canvas > 300, qPrintable(QStringLiteral("%1: canvas %2 px of %3")
                                                      .arg(causal::to_string(r).data()).arg(on_canvas).arg(memo.name())));
            QVERIFY2(in_memo > 100, qPrintable(QStringLiteral("%1: memo %2 px of %3")
                                                   .arg(causal::to_string(r).data()).arg(in_memo).arg(memo.name())));
        }
    }
};

QTEST_MAIN(RoleStyleTest)
#include "role_style_test.moc"
