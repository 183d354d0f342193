"""The curated public names stay importable (common practice, no source)."""
import resum


def test_public_names():
    for name in resum.__all__:
        assert hasattr(resum, name), name
    assert callable(resum.analyze) and callable(resum.evaluate)


def test_estimate_contains_keeps_the_digits_of_its_argument():
    # a band 1e-40 wide around pi (mpmath at 60 digits) does not contain pi + 1e-30, even when
    # asked at mpmath's default 15 digits (rounding the argument would have said it does)
    import mpmath
    from resum.results import Estimate
    with mpmath.workdps(60):
        pi = +mpmath.pi
        e = Estimate(pi, pi - mpmath.mpf(10) ** -40, pi + mpmath.mpf(10) ** -40)
        off = pi + mpmath.mpf(10) ** -30
    assert e.contains(pi)
    assert not e.contains(off)
