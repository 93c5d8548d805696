#include "core/scan/classify.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace foldline;

// The rules of classify.h, each exercised on both sides of its threshold. Normal tail values
// [from memory]: P(Z > 1.96) = 0.025, P(Z > 3) = 0.00135.
TEST(Classify, IntersectionUnionReversal) {
    ClassInputs in{-0.2, -5.0, std::log(1.3), 3.0, false, NAN};
    EXPECT_NEAR(reversal_p(in), 0.0013499, 1e-6);  // larger of the two one-sided p-values
    EXPECT_TRUE(direction_flips(in));
    EXPECT_EQ(classify(in, reversal_p(in), 0.05), FindingClass::Reversal);
    // The same figures with a q-value above alpha: both effects present, so stable.
    EXPECT_EQ(classify(in, 0.2, 0.05), FindingClass::Stable);
    in.adjusted_z = 1.0;  // adjusted not significant: no reversal
    EXPECT_GT(reversal_p(in), 0.15);
    EXPECT_EQ(classify(in, reversal_p(in), 0.05), FindingClass::Explained);
    in.adjusted_z = -3.0;  // same side: the reversal p is near 1
    in.adjusted_effect = -0.3;
    EXPECT_GT(reversal_p(in), 0.99);
    EXPECT_EQ(classify(in, reversal_p(in), 0.05), FindingClass::Stable);
}

TEST(Classify, MaskedHeterogeneousAndUndefined) {
    ClassInputs masked{0.01, 0.5, 0.4, 4.0, false, NAN};
    EXPECT_EQ(classify(masked, reversal_p(masked), 0.05), FindingClass::Masked);
    ClassInputs het{0.1, 4.0, 0.3, 4.0, true, 0.001};
    EXPECT_EQ(classify(het, reversal_p(het), 0.05), FindingClass::Heterogeneous);
    het.p_homogeneity = 0.2;
    EXPECT_EQ(classify(het, reversal_p(het), 0.05), FindingClass::Stable);
    ClassInputs none{NAN, NAN, NAN, NAN, false, NAN};
    EXPECT_DOUBLE_EQ(reversal_p(none), 1.0);
    EXPECT_EQ(classify(none, 1.0, 0.05), FindingClass::Stable);
}

// Where the exact conditional test is in use (core/scan/small_counts.h) its p-values replace the
// CMH z: two-sided for explained / masked, one-sided against the crude direction for a reversal.
TEST(Classify, ExactPValuesReplaceTheCmhZ) {
    ClassInputs in{0.01, 0.5, 0.4, 4.0, false, NAN};  // CMH alone: masked (p 6e-5)
    in.adjusted_p_exact = 0.2;
    in.adjusted_p_exact_greater = 0.1;
    in.adjusted_p_exact_less = 0.95;
    EXPECT_EQ(classify(in, reversal_p(in), 0.05), FindingClass::Stable);
    in.adjusted_p_exact = 0.03;
    EXPECT_EQ(classify(in, reversal_p(in), 0.05), FindingClass::Masked);

    ClassInputs rev{-0.2, -5.0, std::log(1.3), 3.0, false, NAN};  // crude below: adjusted "greater" counts
    rev.adjusted_p_exact = 0.08;
    rev.adjusted_p_exact_greater = 0.04;
    rev.adjusted_p_exact_less = 0.99;
    EXPECT_NEAR(reversal_p(rev), 0.04, 1e-12);
    rev.crude_effect = 0.2;  // crude above: adjusted "less" counts
    rev.crude_z = 5.0;
    EXPECT_NEAR(reversal_p(rev), 0.99, 1e-12);
}
