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
                        (lambda: Context(dps=3), "dps"), (lambda: Context(guard=-1), "guard"),
                        # a text is true to Python: verify="no" used to turn verification on
                        (lambda: evaluate(s, ["0.5"], verify="no"), "verify"),
                        (lambda: analyze(s, verify="no"), "verify"),
                        (lambda: analyze(s, verify=1), "verify")):
        with pytest.raises(InputError) as err:
            call()
        assert str(err.value).startswith(field + ":"), str(err.value)
        assert "\n" not in str(err.value)


def test_series_arguments_of_the_wrong_kind_are_input_errors_naming_the_field():
    # a dict iterated as its keys, a generator read twice (an empty series), a string whose
    # characters became coefficients, decimal texts refused with a bare TypeError: each is now
    # one line naming the argument (common practice, no source). The error is also a TypeError,
    # as before, for code that catches that.
    import pytest
    from resum import Series
    from resum.errors import InputError
    for call, field in ((lambda: Series({0: 1, 1: 2}), "coefficients"),
                        (lambda: Series(5), "coefficients"),
                        (lambda: Series("1,2,3"), "coefficients"),
                        (lambda: Series(["0.5", "0.25"]), "coefficients"),
                        (lambda: Series([1, None]), "coefficients"),
                        (lambda: Series([1, 2], start="1"), "start"),
                        (lambda: Series([1, 2], variable=""), "variable"),
                        (lambda: Series([1, 2], variable=3), "variable")):
        with pytest.raises(InputError) as err:
            call()
        assert str(err.value).startswith(field + ":"), str(err.value)
        assert "\n" not in str(err.value)
    with pytest.raises(TypeError, match="series_from_dict"):
        Series(["0.5"])


def test_series_reads_a_generator_once_and_keeps_numpy_integers_exact():
    # 1/(1-x)^2 = sum (n+1) x^n (common practice, no source)
    import numpy
    from resum import Series
    s = Series(n + 1 for n in range(6))
    assert s.coefficients == (1, 2, 3, 4, 5, 6)
    t = Series(numpy.arange(1, 7))
    assert t.is_exact and t.coefficients == (1, 2, 3, 4, 5, 6)


def test_strong_probe_and_file_functions_refuse_wrong_arguments_in_one_line():
    # a list for the series was an AttributeError inside the probe; a negative max_rel_band
    # trusted no point and reported "too few terms"; a number for a path was a TypeError from
    # pathlib; a negative n_orders was taken silently (common practice, no source)
    import pytest
    from resum import Context, Series, evaluate, probe_strong_coupling, read_series, write_series
    from resum.errors import InputError
    s = Series([(-1) ** n for n in range(12)])
    ctx = Context(dps=15)
    for call, field in ((lambda: probe_strong_coupling([1] * 12, [2, 3, 4, 5], ctx), "series"),
                        (lambda: probe_strong_coupling(s, [2, 3, 4, 5], ctx, max_rel_band=-1),
                         "max_rel_band"),
                        (lambda: probe_strong_coupling(s, [2, 3, 4, 5], ctx, max_rel_band="abc"),
                         "max_rel_band"),
                        (lambda: probe_strong_coupling(s, [2, 3, 4, 5], ctx, n_terms_fit=3),
                         "n_terms_fit"),
                        (lambda: read_series(5), "path"),
                        (lambda: write_series([1, 2], "x.json"), "series"),
                        (lambda: write_series(s, 5), "path"),
                        (lambda: evaluate(s, ["0.5"], ctx, n_orders=-1), "n_orders"),
                        (lambda: evaluate(s, ["0.5"], ctx, lateral="left"), "lateral")):
        with pytest.raises(InputError) as err:
            call()
        assert str(err.value).startswith(field + ":"), str(err.value)
        assert "\n" not in str(err.value)


def test_numpy_booleans_are_flags():
    # a flag computed with numpy (np.True_, np.bool in numpy 2) is a flag (common practice, no source)
    import numpy as np
    from resum.errors import check_flag
    assert check_flag(np.True_, "verify") is True and check_flag(np.bool_(False), "verify") is False
