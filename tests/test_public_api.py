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


def test_wrong_argument_types_are_input_errors_naming_the_field():
    # a list instead of a Series, or a digit count instead of a Context, used to surface as an
    # AttributeError from deep inside (common practice, no source)
    import pytest
    from resum import Context, Series, analyze, evaluate, probe_strong_coupling
    from resum.errors import InputError
    s = Series([1] * 12)
    for call, field in ((lambda: analyze([1] * 12), "series"), (lambda: analyze(s, 30), "ctx"),
                        (lambda: evaluate(s, ["0.5"], 30), "ctx"),
                        (lambda: probe_strong_coupling(s, ctx=30), "ctx"),
                        (lambda: Context(dps=3), "dps"), (lambda: Context(guard=-1), "guard")):
        with pytest.raises(InputError) as err:
            call()
        assert str(err.value).startswith(field + ":"), str(err.value)
        assert "\n" not in str(err.value)
