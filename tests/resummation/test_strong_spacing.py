"""The spacing S of the strong-coupling powers p, p - S, p - 2S, ... (``probe_strong_coupling
(spacing=...)``, ``resum strong --spacing``), given or chosen automatically.

The anharmonic oscillator H = p^2 + x^2 + g x^4: x -> g^(-1/6) y gives
H = g^(1/3) (p^2 + y^4 + g^(-2/3) y^2), so E_n(g) = g^(1/3) (e_n + c_n g^(-2/3) + ...), powers
1/3, -1/3, -1, ... stepping by 2/3 (common practice, no source: the scaling above). e_n are the
levels of p^2 + y^4, c_n = <y^2> in them (first-order perturbation theory, Hellmann-Feynman):
e_0 = 1.0603620905, e_1 = 3.7996730298 from memory, and all four checked here by an independent
finite-difference diagonalization (:func:`_quartic`).
"""
import json
from fractions import Fraction

import mpmath
import pytest

from resum.cli import main
from resum.commands.strong import _render
from resum.context import Context, workdps
from resum.errors import InputError
from resum.estimators.strong_coupling import StrongCouplingResult, probe_strong_coupling
from resum.results import Estimate
from resum.series import Series
from resum.sources import oscillator
from tests.known_series import quartic_levels

E0, E1 = "1.0603620905", "3.7996730298"          # levels of p^2 + y^4, from memory
FD_TOL = 1e-8


def _quartic(lam=0.0, n=2000, L=8.0):
    """The two lowest levels of p^2 + y^4 + lam y^2 (:func:`tests.known_series.quartic_levels`);
    FD_TOL = 1e-8 covers its error at n = 2000."""
    return quartic_levels(2, n, lam, L)


def _y2(d=1e-4):
    """<y^2> in the two lowest levels of p^2 + y^4: dE/dlam at lam = 0, central difference."""
    return (_quartic(d) - _quartic(-d)) / (2 * d)


def test_quartic_levels_by_finite_differences():
    e = _quartic()
    assert abs(e[0] - float(E0)) < FD_TOL and abs(e[1] - float(E1)) < FD_TOL, e
    # <y^2> has no published value we could check; instead the derivative must not depend on
    # the grid (n = 2000 against 4000: 0.3620225 and 0.9016060 against 0.9016056 when written)
    c, c2 = _y2(), (_quartic(1e-4, n=4000) - _quartic(-1e-4, n=4000)) / 2e-4
    assert all(abs(a - b) < 1e-5 for a, b in zip(c, c2)), (c, c2)


def test_first_excited_level_fits_with_spacing_two_thirds(tmp_path, capsys):
    """(10 s) 40 orders of the first excited level (the series the project generates), default grid:
    the automatic choice is 2/3 and the g^(1/3) band holds the level of p^2 + y^4. With the
    old form (spacing 1) the same values gave 3.86(5), which misses it."""
    f = tmp_path / "o1.json"
    assert main(["generate", "oscillator", "--state", "1", "--orders", "40", "-o", str(f)]) == 0
    capsys.readouterr()
    code = main(["strong", str(f), "--json", "--expect", f"g^1/3={E1}"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0 and doc["success"], doc["message"]
    assert doc["spacing"] == "2/3" and doc["spacing_source"].startswith("automatic: the largest spacing")
    assert not any("no fit matches" in w for w in doc["warnings"]), doc["warnings"]
    fd, c = _quartic()[1], _y2()[1]
    with workdps(30):
        coef = {k: Estimate.from_dict(v) for k, v in doc["coefficients"]}
        lead = coef["g^1/3"]
        assert lead.contains(mpmath.mpf(E1)) and lead.contains(fd) and lead.error < 0.01, lead  # 3.800(4)
        assert coef["g^-1/3"].contains(c), coef["g^-1/3"]                                      # 0.90(3)
        assert doc["comparison"]["g^1/3"]["inside"] is True
        # the text report says which spacing and why
        res = StrongCouplingResult.from_dict(doc)
        assert str(res.spacing) == "2/3"
        assert "powers spaced by S = 2/3: p, p - S, p - 2S" in _render(res)
        # fractional powers print in parentheses (g^1/3 reads as g/3); the keys stay bare
        assert "g^(1/3)" in _render(res) and "g^(-1/3)" in _render(res) and "g^1/3 " not in _render(res)
        # the same values fitted with spacing 1 (the form before the spacing was a choice)
        gs = [g for g, v in zip(res.couplings, res.values) if v is not None]
        vals = [v for v in res.values if v is not None]
    one = probe_strong_coupling(oscillator.series(1, 40), gs, Context(dps=30), values=vals, spacing=1,
                                expected={"g^1/3": E1})
    assert one.spacing == 1 and one.spacing_source == "given"
    assert one.comparison["g^1/3"]["inside"] is False, one.coefficient("g^1/3")


@pytest.mark.slow
def test_ground_state_fits_with_spacing_two_thirds():
    # 14 s: 40 orders of the ground state resummed on the default grid
    s = oscillator.series(0, 40)
    r = probe_strong_coupling(s, ctx=Context(dps=30), expected={"g^1/3": E0})
    assert r.success and str(r.spacing) == "2/3", (r.message, r.spacing_source)
    with workdps(30):
        assert abs(r.leading_power.value - mpmath.mpf(1) / 3) < mpmath.mpf(10) ** -25
    assert r.leading_power.error == 0
    fd, c = _quartic()[0], _y2()[0]
    lead = r.coefficient("g^1/3")
    assert lead.contains(mpmath.mpf(E0)) and lead.contains(fd) and lead.error < 0.002, lead    # 1.0604(7)
    assert r.coefficient("g^-1/3").contains(c), r.coefficient("g^-1/3")                          # 0.362(7)
    assert r.comparison["g^1/3"]["inside"] is True


@pytest.mark.parametrize("name, f, power, spacing", [
    # binomial series at large g (common practice, no source):
    ("sqrt(1 + g^2) = g + g^-1/2 - ...", lambda g: mpmath.sqrt(1 + g * g), 1, "2"),
    ("(1 + g)^(1/3) = g^(1/3) + g^(-2/3)/3 + ...", lambda g: mpmath.cbrt(1 + g), "1/3", "1"),
    ("sqrt(1 + g^(2/3)) = g^(1/3) + g^(-1/3)/2 + ...", lambda g: mpmath.sqrt(1 + mpmath.cbrt(g) ** 2), "1/3", "2/3"),
    ("sqrt(1 + sqrt g) = g^(1/4) + g^(-1/4)/2 + ...", lambda g: mpmath.sqrt(1 + mpmath.sqrt(g)), "1/4", "1/2"),
    ("sqrt(1 + g^(1/3)) = g^(1/6) + g^(-1/6)/2 + ...", lambda g: mpmath.sqrt(1 + mpmath.cbrt(g)), "1/6", "1/3"),
])
def test_automatic_spacing_on_known_expansions(name, f, power, spacing):
    """Values with 1e-8 relative bands at g = 100 ... 12800: the automatic choice finds each
    expansion's spacing (2 over 1 for an odd function of 1/g times g, whose powers 1 also holds)
    and the leading power from secants extrapolated in g^-S."""
    gs = [100 * 2 ** k for k in range(8)]
    with workdps(40):
        vals = [Estimate(f(g), f(g) * (1 - mpmath.mpf(10) ** -8), f(g) * (1 + mpmath.mpf(10) ** -8)) for g in gs]
    r = probe_strong_coupling(Series([1] * 8, variable="g"), gs, Context(dps=30), values=vals)
    assert r.success and str(r.spacing) == spacing, (name, r.spacing, r.spacing_source)
    with workdps(30):
        fr = Fraction(str(power))
        p = mpmath.mpf(fr.numerator) / fr.denominator
        assert abs(r.leading_power.value - p) < mpmath.mpf(10) ** -25, (name, r.leading_power)
        lead = r.coefficients[0][1]
        assert lead.contains(1) and lead.error < 1e-4, (name, lead)


def test_spacing_given_is_used_and_bad_ones_are_refused():
    s = Series([1] * 8, variable="g")
    gs = [100 * 2 ** k for k in range(8)]
    with workdps(40):
        vals = [Estimate(mpmath.cbrt(1 + g), mpmath.cbrt(1 + g) * (1 - mpmath.mpf(10) ** -8),
                         mpmath.cbrt(1 + g) * (1 + mpmath.mpf(10) ** -8)) for g in gs]
    r = probe_strong_coupling(s, gs, Context(dps=30), values=vals, spacing="1/2")
    assert str(r.spacing) == "1/2" and r.spacing_source == "given"
    assert [k for k, _ in r.coefficients][:3] == ["g^1/3", "g^-1/6", "g^-2/3"]
    for bad in (0, -1, "abc", "1/0", 1j, True, "1e-9", 1000):
        with pytest.raises(InputError, match="spacing"):
            probe_strong_coupling(s, gs, Context(dps=30), values=vals, spacing=bad)


@pytest.mark.parametrize("bad", ["0", "-1", "abc", "-2/3", "1/0"])
def test_strong_spacing_option_rejects_bad_values(tmp_path, capsys, bad):
    f = tmp_path / "s.txt"
    f.write_text("\n".join(str((-1) ** k) for k in range(20)) + "\n")
    assert main(["strong", str(f), "--spacing", bad]) == 2
    captured = capsys.readouterr()
    err = captured.err.strip()
    assert len(err.splitlines()) == 1 and "--spacing" in err and repr(bad) in err, err
    assert "probing" not in err and captured.out == ""


def test_a_spacing_whose_power_is_no_simple_fraction_is_not_chosen():
    """Resummed values of the kernel family at a = pi/3 from 60 loops (studies/
    strong_coupling_reach, band below 0.5 %): with spacing 2 the secants give the power 1.0297,
    and that tuned power let the 4-term fit match (chi2/dof 1.1, leading coefficient 2.821(19));
    spacing 1, whose power rounds to 1, matches with as many terms and is the one kept."""
    rows = [("1.0", "2.259624752729", "2.259624752761", "2.259624752792"),
            ("1.5", "3.820746743", "3.820746855", "3.820746968"),
            ("2.0", "5.3771788", "5.3771871", "5.3771955"),
            ("3.0", "8.470928", "8.471649", "8.472369"),
            ("4.0", "11.5499", "11.5572", "11.5646"),
            ("6.0", "17.697", "17.72", "17.744"),
            ("8.0", "23.851", "23.876", "23.901")]
    with workdps(30):
        gs = [g for g, _, _, _ in rows]
        vals = [Estimate(mpmath.mpf(v), mpmath.mpf(lo), mpmath.mpf(hi)) for _, lo, v, hi in rows]
    s = Series([1] * 8, variable="g")
    r = probe_strong_coupling(s, gs, Context(dps=30), values=vals, max_rel_band=mpmath.mpf("0.005"))
    assert r.success and r.spacing == 1 and r.leading_power.value == 1, (r.spacing, r.spacing_source)
    # the left-out power is printed with its band, value(error), which holds the 1.0297 the study's
    # secants gave (not as 1.0297 alone: its band is a few hundredths wide)
    import re
    m = re.search(r"2 \(power (\d+)\.(\d+)\((\d+)\)\)", r.spacing_source)
    assert "left out" in r.spacing_source and m, r.spacing_source
    unit = mpmath.mpf(10) ** -len(m.group(2))
    centre = mpmath.mpf(f"{m.group(1)}.{m.group(2)}")
    assert abs(centre - mpmath.mpf("1.0297")) <= int(m.group(3)) * unit, r.spacing_source
    assert r.coefficients[0][0] == "g^1"
    two = probe_strong_coupling(s, gs, Context(dps=30), values=vals, max_rel_band=mpmath.mpf("0.005"), spacing=2)
    assert two.leading_power.error > 0 and not two.coefficient("g^1")


def test_printed_labels_and_expect_keys_of_fractional_powers():
    # common practice, no source: g^1/3 reads as (g^1)/3, so the text puts the power in
    # parentheses; --expect takes either form for the same coefficient
    from resum.estimators.strong_coupling import power_key as _expect_key
    from resum.commands.strong import _shown
    assert _shown("g^1/3") == "g^(1/3)" and _shown("g^-1/3 log g") == "g^(-1/3) log g"
    assert _shown("g^1") == "g^1" and _shown("g^-2 log g") == "g^-2 log g"
    assert _expect_key("g^(1/3)") == _expect_key("g^1/3") == "g^1/3"
    assert _expect_key(" g^(-1/2)   log  g ") == "g^-1/2 log g"
