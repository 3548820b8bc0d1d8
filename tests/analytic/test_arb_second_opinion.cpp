// Second opinion from the Arb ball-arithmetic library (Debian libflint-arb, test only): its
// Weierstrass ℘, ℘', inverse ℘, lattice invariants and σ, evaluated on our periods, must agree
// with our roots, points, logarithms and archimedean local heights, at random precisions.
#ifdef ARCSIEVE_HAVE_ARB

#include <acb.h>
#include <acb_elliptic.h>
#include <arb.h>
#include <gtest/gtest.h>

#include <random>

#include "analytic/height.hpp"
#include "test_support.hpp"

namespace arcsieve {
namespace {

using namespace testing_support;

// RAII holders for Arb numbers.
struct Ball {
    arb_t value;
    Ball() { arb_init(value); }
    ~Ball() { arb_clear(value); }
    Ball(const Ball&) = delete;
    Ball& operator=(const Ball&) = delete;
};
struct ComplexBall {
    acb_t value;
    ComplexBall() { acb_init(value); }
    ~ComplexBall() { acb_clear(value); }
    ComplexBall(const ComplexBall&) = delete;
    ComplexBall& operator=(const ComplexBall&) = delete;
};

void set_exact(arb_t out, const Real& x) {
    arf_t f;
    arf_init(f);
    arf_set_mpfr(f, x.backend().data());
    arb_set_arf(out, f);
    arf_clear(f);
}

Real midpoint_of(const arb_t x, unsigned digits) {
    Real r = make_real(0, digits);
    arf_get_mpfr(r.backend().data(), arb_midref(x), MPFR_RNDN);
    return r;
}

Real radius_of(const arb_t x, unsigned digits) {
    arf_t f;
    arf_init(f);
    arf_set_mag(f, arb_radref(x));
    Real r = make_real(0, digits);
    arf_get_mpfr(r.backend().data(), f, MPFR_RNDU);
    arf_clear(f);
    return r;
}

// Our lattice in Arb's normalisation Z + τZ (scaled by ω1): τ = ω2/ω1.
void set_tau(acb_t tau, const RealStructure& real) {
    Ball re, im, omega1;
    set_exact(re.value, real.imaginary_period_re);
    set_exact(im.value, real.imaginary_period_im);
    set_exact(omega1.value, real.real_period);
    const slong prec = static_cast<slong>(bits_for_digits(real.real_period.precision()));
    arb_div(acb_realref(tau), re.value, omega1.value, prec);
    arb_div(acb_imagref(tau), im.value, omega1.value, prec);
}

struct Sample {
    const char* curve;
    const char* x;
    const char* y;
};

const Sample samples[] = {
    {"[0,109,0,224,0]", "-100", "260"}, {"[1,-1,1,4,6]", "0", "2"},
    {"[0,1,1,-23,-50]", "8", "18"},     {"[1,1,0,-3,-3]", "2", "1"},
    {"[0,0,1,-21,40]", "4", "4"},       {"[0,0,0,13524,-400624]", "109", "1539"},
};

TEST(ArbSecondOpinion, WeierstrassPAndDerivativeOnOurPeriodsGiveOurPoints) {
    std::mt19937 random(7);
    for (const Sample& sample : samples) {
        const Curve curve = parse_curve(sample.curve);
        const Point generator = rational_point(sample.x, sample.y);
        for (int trial = 0; trial < scaled(20); ++trial) {
            const unsigned digits = 30 + random() % 170;
            const slong prec = static_cast<slong>(bits_for_digits(digits + 20));
            const RealStructure real = real_structure(curve, digits);
            const Point p = multiply(curve, generator, 1 + static_cast<int>(random() % 6));
            if (p.at_infinity) continue;
            const EllipticLog log = elliptic_log(curve, real, p);
            ComplexBall tau, z, value, derivative;
            set_tau(tau.value, real);
            acb_zero(z.value);
            set_exact(acb_realref(z.value), log.t);
            if (log.component == 1) {
                acb_t half_tau;
                acb_init(half_tau);
                acb_mul_2exp_si(half_tau, tau.value, -1);
                acb_add(z.value, z.value, half_tau, prec);
                acb_clear(half_tau);
            }
            acb_elliptic_p(value.value, z.value, tau.value, prec);
            acb_elliptic_p_prime(derivative.value, z.value, tau.value, prec);
            const unsigned w = digits + 20;
            const Real omega = with_digits(real.real_period, w);
            // x = ℘(z; Λ) − b2/12 with ℘(tω1; Λ) = ℘(t; Z + τZ)/ω1^2; Y = ℘'(z; Λ) = ℘'(t)/ω1^3.
            const Real x_arb = midpoint_of(acb_realref(value.value), w) / (omega * omega) -
                               make_real(b_invariants(curve).b2 / 12, w);
            const Real Y_arb =
                midpoint_of(acb_realref(derivative.value), w) / (omega * omega * omega);
            const Real x = make_real(p.x, w);
            const Real Y = make_real(2 * p.y + curve.a1 * p.x + curve.a3, w);
            const Real tolerance = power_of_ten(-static_cast<int>(digits) + 8, w);
            EXPECT_LT(abs(x_arb - x) / (1 + abs(x)),
                      tolerance + radius_of(acb_realref(value.value), w))
                << sample.curve << " digits " << digits << " t=" << show(log.t);
            EXPECT_LT(abs(Y_arb - Y) / (1 + abs(Y)),
                      tolerance + radius_of(acb_realref(derivative.value), w))
                << sample.curve << " digits " << digits;
            EXPECT_LT(abs(midpoint_of(acb_imagref(value.value), w)), tolerance)
                << "℘ must be real on E(R)";
        }
    }
}

TEST(ArbSecondOpinion, InverseWeierstrassPIsOurEllipticLogUpToSignAndLattice) {
    std::mt19937 random(11);
    for (const Sample& sample : samples) {
        const Curve curve = parse_curve(sample.curve);
        const Point p = rational_point(sample.x, sample.y);
        const unsigned digits = 40 + random() % 100;
        const unsigned w = digits + 20;
        const slong prec = static_cast<slong>(bits_for_digits(w));
        const RealStructure real = real_structure(curve, digits);
        const EllipticLog log = elliptic_log(curve, real, p);
        const Real omega = with_digits(real.real_period, w);
        // ℘(z; Z + τZ) = (x + b2/12) ω1^2.
        const Real target =
            (make_real(p.x, w) + make_real(b_invariants(curve).b2 / 12, w)) * omega * omega;
        ComplexBall tau, argument, inverse;
        set_tau(tau.value, real);
        acb_zero(argument.value);
        set_exact(acb_realref(argument.value), target);
        acb_elliptic_inv_p(inverse.value, argument.value, tau.value, prec);
        // Arb returns some w with ℘(w) = target: w ≡ ±(t + component τ/2) mod Z + τZ. Take the
        // real part mod 1 and compare with t or 1 − t; the imaginary part is 0 or ±Im τ/2 mod Im τ.
        const Real re = midpoint_of(acb_realref(inverse.value), w);
        const Real im = midpoint_of(acb_imagref(inverse.value), w);
        const Real im_tau = with_digits(real.imaginary_period_im, w) / omega;
        const Real re_tau = with_digits(real.imaginary_period_re, w) / omega;
        // Remove multiples of τ to bring Im into [−Im τ/2, Im τ/2], then compare.
        const Real k = floor(im / im_tau + 0.5);
        const Real re_reduced = re - k * re_tau;
        const Real im_reduced = im - k * im_tau;
        const Real tolerance = power_of_ten(-static_cast<int>(digits) + 8, w);
        Real t_candidate = re_reduced;
        if (log.component == 1) {
            // on the egg: ±(t + τ/2): the imaginary part is ±Im τ/2, the real part ±t + Re τ/2.
            EXPECT_LT(abs(abs(im_reduced) - im_tau / 2), tolerance) << sample.curve;
            t_candidate =
                im_reduced > 0 ? Real(re_reduced - re_tau / 2) : Real(re_reduced + re_tau / 2);
        } else {
            EXPECT_LT(abs(im_reduced), tolerance) << sample.curve;
        }
        const Real distance = std::min(Real(circle_distance(t_candidate, log.t)),
                                       Real(circle_distance(t_candidate, Real(1 - log.t))));
        EXPECT_LT(distance, tolerance)
            << sample.curve << " arb " << show(re) << " ours " << show(log.t);
    }
}

TEST(ArbSecondOpinion, LatticeInvariantsAndRootsOfOurPeriodsAreTheCurves) {
    for (const Sample& sample : samples) {
        const Curve curve = parse_curve(sample.curve);
        const unsigned digits = 60;
        const unsigned w = digits + 20;
        const slong prec = static_cast<slong>(bits_for_digits(w));
        const RealStructure real = real_structure(curve, digits);
        ComplexBall tau, g2, g3, e1, e2, e3;
        set_tau(tau.value, real);
        acb_elliptic_invariants(g2.value, g3.value, tau.value, prec);
        acb_elliptic_roots(e1.value, e2.value, e3.value, tau.value, prec);
        const Real omega = with_digits(real.real_period, w);
        // g2(Λ) = g2(τ)/ω1^4 = c4/12, g3(Λ) = g3(τ)/ω1^6 = c6/216 (Silverman AEC VI.3).
        const Real g2_ours = make_real(c4(curve) / 12, w);
        const Real g3_ours = make_real(c6(curve) / 216, w);
        const Real g2_arb = midpoint_of(acb_realref(g2.value), w) / pow(omega, 4);
        const Real g3_arb = midpoint_of(acb_realref(g3.value), w) / pow(omega, 6);
        const Real tolerance = power_of_ten(-static_cast<int>(digits) + 8, w);
        EXPECT_LT(abs(g2_arb - g2_ours) / (1 + abs(g2_ours)), tolerance) << sample.curve;
        EXPECT_LT(abs(g3_arb - g3_ours) / (1 + abs(g3_ours)), tolerance) << sample.curve;
        if (real.components == 2) {
            // Arb orders the lattice roots e1 = ℘(1/2), e2 = ℘((1+τ)/2), e3 = ℘(τ/2); ours
            // are e1 > e2 > e3 with ℘(ω2/2) = e3 (the egg's point t = 0), which the ℘ test
            // above checks on its own.
            const Real shift = make_real(b_invariants(curve).b2 / 12, w);
            const Real arb_e1 = midpoint_of(acb_realref(e1.value), w) / (omega * omega) - shift;
            const Real arb_e2 = midpoint_of(acb_realref(e2.value), w) / (omega * omega) - shift;
            const Real arb_e3 = midpoint_of(acb_realref(e3.value), w) / (omega * omega) - shift;
            const Real scale = 1 + abs(real.roots[2]);
            EXPECT_LT(abs(arb_e1 - real.roots[0]) / scale, tolerance) << sample.curve;
            EXPECT_LT(abs(arb_e2 - real.roots[1]) / scale, tolerance) << sample.curve;
            EXPECT_LT(abs(arb_e3 - real.roots[2]) / scale, tolerance) << sample.curve;
        }
    }
}

// λ^S(z) = −log|e^{−z η(z)/2} σ(z)| − (1/12) log|Δ(Λ)| with η the R-linear quasi-period map,
// η(ω1) = 2ζ(ω1/2), η(ω2) = 2ζ(ω2/2) (Silverman, Advanced Topics VI.3 Theorem 3.2; Cohen
// GTM 138 §7.5). Everything scales out, so Arb works on Z + τZ; ours is 2λ^S + (1/6) log|Δ_E|.
TEST(ArbSecondOpinion, SigmaFunctionGivesOurArchimedeanLocalHeights) {
    std::mt19937 random(5);
    for (const Sample& sample : samples) {
        const Curve curve = parse_curve(sample.curve);
        const Point generator = rational_point(sample.x, sample.y);
        for (int trial = 0; trial < scaled(5); ++trial) {
            const unsigned digits = 30 + random() % 120;
            const unsigned w = digits + 20;
            const slong prec = static_cast<slong>(bits_for_digits(w));
            const Point p = multiply(curve, generator, 1 + static_cast<int>(random() % 4));
            if (p.at_infinity) continue;
            const RealStructure real = real_structure(curve, digits + 10);
            const EllipticLog log = elliptic_log(curve, real, p);
            ComplexBall tau, z, half, half_tau, zeta1, zeta2, sigma, eta, g2, g3,
                lattice_discriminant, exponent, t_ball;
            set_tau(tau.value, real);
            acb_zero(t_ball.value);
            set_exact(acb_realref(t_ball.value), log.t);
            acb_set(z.value, t_ball.value);
            acb_one(half.value);
            acb_mul_2exp_si(half.value, half.value, -1);
            acb_mul_2exp_si(half_tau.value, tau.value, -1);
            acb_elliptic_zeta(zeta1.value, half.value, tau.value, prec);
            acb_elliptic_zeta(zeta2.value, half_tau.value, tau.value, prec);
            // η(z) for z = t·1 + c·τ (c = 0 or 1/2): t η1 + c η2 with η_i = 2 ζ(ω_i/2).
            acb_mul(eta.value, t_ball.value, zeta1.value, prec);
            acb_mul_2exp_si(eta.value, eta.value, 1);
            if (log.component == 1) {
                acb_add(z.value, z.value, half_tau.value, prec);
                acb_add(eta.value, eta.value, zeta2.value, prec);  // (1/2)·2ζ(τ/2)
            }
            acb_elliptic_sigma(sigma.value, z.value, tau.value, prec);
            acb_elliptic_invariants(g2.value, g3.value, tau.value, prec);
            // Δ = g2^3 − 27 g3^2
            acb_pow_ui(lattice_discriminant.value, g2.value, 3, prec);
            acb_t g3sq;
            acb_init(g3sq);
            acb_sqr(g3sq, g3.value, prec);
            acb_submul_ui(lattice_discriminant.value, g3sq, 27, prec);
            acb_clear(g3sq);
            // −z η(z)/2 ; |e^{w}| = e^{Re w}
            acb_mul(exponent.value, z.value, eta.value, prec);
            Ball log_sigma, log_disc, value;
            acb_abs(log_sigma.value, sigma.value, prec);
            arb_log(log_sigma.value, log_sigma.value, prec);
            acb_abs(log_disc.value, lattice_discriminant.value, prec);
            arb_log(log_disc.value, log_disc.value, prec);
            // λ^S = Re(z η)/2 − log|σ| − log|Δ|/12
            arb_mul_2exp_si(value.value, acb_realref(exponent.value), -1);
            arb_sub(value.value, value.value, log_sigma.value, prec);
            arb_div_ui(log_disc.value, log_disc.value, 12, prec);
            arb_sub(value.value, value.value, log_disc.value, prec);
            const Real lambda_s = midpoint_of(value.value, w);
            const Rational delta = discriminant(curve);
            const Real abs_delta = abs(make_real(delta, w));
            const Real ours_from_arb = 2 * lambda_s + boost::multiprecision::log(abs_delta) / 6;
            const Real ours = archimedean_local_height(curve, p, digits);
            EXPECT_LT(abs(ours - ours_from_arb), power_of_ten(-static_cast<int>(digits) + 8, w))
                << sample.curve << " digits " << digits << " ours " << show(ours) << " arb "
                << show(ours_from_arb);
        }
    }
}

}  // namespace
}  // namespace arcsieve

#endif  // ARCSIEVE_HAVE_ARB
