"""What poles inside the mapped disk add to a value (RationalIntegrator.inner_terms), against
mpmath: for r(t) = a/(t - p) + conj(a)/(t - conj(p)) the integral from 0 to w of each term is
a log(1 - w/p) (common practice, no source)."""
import mpmath

from resum.context import workdps
from resum.estimators.resum_band import Rational, RationalIntegrator


def _pair(a, p):
    """a/(t - p) + conj(a)/(t - conj(p)) as P/Q with Q(0) = 1."""
    pc, ac = mpmath.conj(p), mpmath.conj(a)
    # numerator a (t - pc) + ac (t - p), denominator (t - p)(t - pc), divided by p pc
    n0, n1 = -(a * pc + ac * p), a + ac
    d0, d1, d2 = p * pc, -(p + pc), mpmath.mpf(1)
    return Rational((mpmath.re(n0 / d0), mpmath.re(n1 / d0)), (mpmath.mpf(1), mpmath.re(d1 / d0), mpmath.re(d2 / d0)), 1, 2)


def test_inner_pair_terms_match_the_logarithms():
    with workdps(40):
        a, p, w = mpmath.mpc("0.006", "0.001"), mpmath.mpc("0.88", "0.40"), mpmath.mpf("0.939")
        integ = RationalIntegrator(_pair(a, p), 30)
        want = 2 * abs(a * mpmath.log(1 - w / p))
        assert abs(integ.inner_terms(w) - want) < mpmath.mpf(10) ** -20 * want
        # the value itself is the sum of the two logarithms (the same reference)
        assert abs(integ(w) - 2 * mpmath.re(a * mpmath.log(1 - w / p))) < mpmath.mpf(10) ** -20


def test_poles_on_the_rim_or_the_axis_add_nothing():
    with workdps(40):
        w = mpmath.mpf("0.9")
        on_rim = RationalIntegrator(_pair(mpmath.mpc("0.3", "0"), mpmath.expj(0.5)), 30)
        assert on_rim.inner_terms(w) == 0
        real_pole = RationalIntegrator(Rational((mpmath.mpf(1),), (mpmath.mpf(1), -1 / mpmath.mpf("0.98")), 0, 1), 30)
        assert real_pole.inner_terms(w) == 0
