"""A point on the cut of the conformal map: the message says what to do, and doing it works.

(1 + x)^(-1/3) = sum binom(-1/3, k) x^k has its cut on (-inf, -1] (common practice, no
source); truths from mpmath's principal power at 50 digits.
"""
from fractions import Fraction

import mpmath

from resum.context import Context, workdps
from resum.resummation import evaluate
from resum.series import Series
from tests.known_series import binomial_series


def test_point_on_the_cut_gets_advice_on_one_line():
    res = evaluate(binomial_series(Fraction(-1, 3), 30), ["-2", "1"], Context(dps=20), method="conformal-pade",
                   singularities=[-1], verify=False)
    bad, good = res.points
    assert not bad.success and good.success
    assert "lies on the cut of the map" in bad.message
    assert "slightly off it" in bad.message and "1e-6*I" in bad.message and "--method" in bad.message
    assert "\n" not in bad.message
    assert "imaginary part" not in good.message


def test_following_the_advice_gives_the_side_of_the_cut():
    res = evaluate(binomial_series(Fraction(-1, 3), 30), ["-2+1e-6*I"], Context(dps=20),
                   method="conformal-pade", singularities=[-1], verify=False)
    p = res.points[0]
    assert p.success
    with workdps(50):
        truth = mpmath.power(1 + mpmath.mpc(-2, mpmath.mpf("1e-6")), -mpmath.mpf(1) / 3)
        assert p.value.contains(truth.real) and p.imag.contains(truth.imag)
        assert abs(p.value.value - truth.real) < 1e-5      # the upper side: 1/2 - i sqrt(3)/2


def test_point_on_a_vertical_cut_is_called_on_the_cut_not_at_the_rim():
    # (1 + x + x^2)^(-1/3): branch points at exp(+-2 pi i/3) (common practice, no source); the
    # map's two cuts run from them along Re x = -1/2, and -1/2 + 2i lies on the upper one. A
    # step along the cut (imaginary) saw no jump and called the point "at the rim".
    with workdps(50):
        c = mpmath.taylor(lambda t: (1 + t + t * t) ** (-mpmath.mpf(1) / 3), 0, 40)
    from resum import Series
    res = evaluate(Series(c, digits=45), ["-0.5+2*I"], Context(dps=30), method="conformal-pade",
                   verify=False)
    p = res.points[0]
    assert not p.success
    assert "lies on the cut of the map" in p.message and "rim" not in p.message


def test_pade_on_a_cut_says_so_and_a_meromorphic_point_does_not():
    # Padé approximants of (1 + x)^(-1/3) put their poles on the cut (-inf, -1] (Baker and
    # Graves-Morris, Padé Approximants, 2nd ed. (1996), ch. 6: Stieltjes-type convergence); at
    # x = -2 they give no value, and the message now says why.
    res = evaluate(binomial_series(Fraction(-1, 3), 40), ["-2"], Context(dps=20), method="pade",
                   verify=False)
    p = res.points[0]
    assert not p.success
    assert "branch cut" in p.message and "1e-6*I" in p.message and "\n" not in p.message
    # tan x is meromorphic (poles at pi/2 + k pi, common practice, no source): x = 2 lies between
    # two of them, Padé converges there, and nothing is said about a cut
    with workdps(50):
        c = mpmath.taylor(mpmath.tan, 0, 40)
        from resum import Series
        res = evaluate(Series(c, digits=45), ["2"], Context(dps=20), method="pade", verify=False)
        truth = mpmath.tan(2)
    p = res.points[0]
    assert p.success and p.value.contains(truth)
    assert "cut" not in p.message


def test_cut_advice_is_given_in_the_coupling():
    # (1 + x)^(-1/3) with x = g^2: the cut x <= -1 is the imaginary g axis beyond |g| = 1, where
    # adding 1e-6*I to g stays on the cut; the advice must name the real nudge instead
    from resum import Series
    from resum.series.core import Coupling
    s = Series(list(binomial_series(Fraction(-1, 3), 30).coefficients), coupling=Coupling("g", 2))
    res = evaluate(s, ["2*I"], Context(dps=20), method="conformal-pade", singularities=[-1], verify=False)
    p = res.points[0]
    assert not p.success and "lies on the cut" in p.message
    step = p.message.split("add ")[1].split(" to g")[0]
    assert "I" not in step                        # a real nudge in g
    res = evaluate(s, [f"2*I+{step}"], Context(dps=20), method="conformal-pade", singularities=[-1],
                   verify=False)
    p = res.points[0]
    assert p.success
    with workdps(50):
        g = mpmath.mpc(mpmath.mpf(step), 2)
        truth = mpmath.power(1 + g * g, -mpmath.mpf(1) / 3)   # principal power, mpmath
        assert p.value.contains(truth.real) and p.imag.contains(truth.imag)


def test_a_pole_times_a_root_of_a_log_is_not_summed_as_a_pole():
    # f = (1 - x)^(-1) sqrt(-log(1 - x)/x): a cut from x = 1, no pole (closed form, common
    # practice, no source); coefficients sum_{j<=k} s_j with s the series of sqrt(-log(1-x)/x),
    # 80 terms at 50 digits. The analysis gives the exponent -1.07(11), kind "pole" (its band
    # holds -1); method auto then took Padé as for a meromorphic function and failed at every
    # point beyond the radius, where a map from x = 1 gives 10 to 37 digits.
    n = 80
    with workdps(90):
        lg = [mpmath.mpf(1) / (k + 1) for k in range(n)]          # -log(1 - x)/x
        s = [mpmath.mpf(1)]
        for k in range(1, n):
            s.append((lg[k] - sum(s[i] * s[k - i] for i in range(1, k))) / 2)
        c = [sum(s[:k + 1]) for k in range(n)]
    with workdps(50):
        c = [+v for v in c]
    res = evaluate(Series(c, digits=50), ["-3", "-30"], Context(dps=30))
    with workdps(60):
        for p in res.points:
            x = mpmath.mpf(p.at)
            truth = mpmath.sqrt(-mpmath.log(1 - x) / x) / (1 - x)
            assert p.success and p.value.contains(truth), (p.at, p.message)
            assert p.value.digits() > 15
            assert p.method == "conformal-pade"


def test_no_cut_from_a_pole_when_a_branch_point_is_there_to_cut_from():
    # f = sqrt(1 + x)/(2 - exp(x)): simple poles at log 2 + 2 pi i k, a branch point at -1, no
    # cut on (log 2, +inf) (closed form, common practice, no source); 80 terms at 50 digits. The
    # map once joined log 2 and -1 through infinity and x = 1, 1.5, 3 lay "on its cut".
    n = 80
    with workdps(90):
        e = [1 / mpmath.factorial(k) for k in range(n)]
        inv = [mpmath.mpf(1)]                       # 1/(2 - e^x) = 1/(1 - (e^x - 1))
        for k in range(1, n):
            inv.append(sum(e[i] * inv[k - i] for i in range(1, k + 1)))
        sq = [mpmath.binomial(mpmath.mpf(1) / 2, k) for k in range(n)]
        c = [sum(sq[i] * inv[k - i] for i in range(k + 1)) for k in range(n)]
    with workdps(50):
        c = [+v for v in c]
    res = evaluate(Series(c, digits=50), ["1", "3"], Context(dps=30))
    with workdps(60):
        for p in res.points:
            x = mpmath.mpf(p.at)
            truth = mpmath.sqrt(1 + x) / (2 - mpmath.exp(x))
            assert p.success and p.value.contains(truth), (p.at, p.message)
            assert p.value.digits() > 20
