// Package uncertainty combines the 95 % ranges of the factors of a computed
// emission into a 95 % interval of the result, by the two approaches of the
// IPCC 2006 Guidelines Vol 1 Ch 3 (rules recalled from the chapter, from memory):
//
//   - Approach 1, error propagation (Propagate, Product, Sum): Equation 3.1 for a
//     product, U = sqrt(U1² + … + Un²), and Equation 3.2 for a sum,
//     U = sqrt((U1·x1)² + … + (Un·xn)²) / |x1 + … + xn|, with every U the half-width
//     of a 95 % interval as a fraction of the value.
//   - Approach 2, Monte Carlo (MonteCarlo): seeded draws of every factor, the
//     result computed per draw, its mean and 2.5th and 97.5th percentiles reported.
//
// A Model is a sum of terms, each a coefficient times a product of factors
// (each to the power +1 or -1). A factor used by several terms is one
// quantity: Approach 1 counts it once with the sum of the terms it
// multiplies, and Approach 2 draws it once per iteration (fully correlated);
// different factors are independent.
//
// Asymmetric ranges (low and high not equally far from the value): Approach 1
// combines the lower halves and the upper halves separately (RuleSeparate,
// the default) or, as the chapter's reporting table asks for an asymmetric
// range, uses the larger of the two halves on both sides (RuleLarger; IPCC 2006
// Vol 1 Ch 3 Table 3.3 notes, from memory). Approach 2 draws a factor with a
// symmetric range from a normal distribution (mean the value, standard
// deviation the half-width / 1.96) and one with an asymmetric range from a
// two-piece lognormal (IPCC 2006 Vol 1 Ch 3 Section 3.2.2.4 names the
// lognormal for positive, skewed quantities; from memory): the logarithm of
// the factor is normal with one spread below the published value and another
// above it, so that the median is the published value and the 2.5th and
// 97.5th percentiles are the published low and high (our choice: the draws
// centre where Approach 1 does).
//
// The package is pure: standard library only, no state between calls.
package uncertainty
