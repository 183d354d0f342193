"""Combined verdicts of `analyze` on series whose singularities are known exactly.

Sources: closed forms (common practice, no source): 1/(1 + x + x^2) has simple poles at the
primitive cube roots of unity exp(+-2 pi i/3) and nothing else; x/(e^x - 1) (generating
function of the Bernoulli numbers) has simple poles at +-2 pi i k, k >= 1, so radius 2 pi;
1/Gamma(1 + x) is entire (reference coefficients: mpmath.taylor of mpmath.rgamma);
(2n)!/4^n grows like 4^-n Gamma(2n + 1) exactly.
"""
import json
import math
from fractions import Fraction

import mpmath

from resum import Context, Series
from resum.analysis import analyze
from resum.cli import main
from resum.series.io import write_series


def _inverse(c, n):
    """Coefficients of 1/sum c_k x^k (exact), n terms."""
    out = []
    for k in range(n):
        s = Fraction(1 if k == 0 else 0) - sum((c[j] * out[k - j] for j in range(1, min(k, len(c) - 1) + 1)),
                                               Fraction(0))
        out.append(s / c[0])
    return out


def test_periodic_zero_coefficients_do_not_make_a_pole_at_minus_one():
    # 1, -1, 0, 1, -1, 0, ...: the ratios skipped the zeros and read x = -1 as a pole
    s = Series(_inverse([Fraction(1)] * 3, 45))
    r = analyze(s, Context(dps=40), verify=False)
    assert r.methods["ratio"].status.value == "not applicable"
    assert "zero coefficients" in r.methods["ratio"].message
    assert len(r.singularities) == 2
    with mpmath.workdps(50):
        want = mpmath.exp(2j * mpmath.pi / 3)
        for sg in r.singularities:
            assert min(abs(sg.location - want), abs(sg.location - mpmath.conj(want))) < 1e-20
    assert r.radius.lower <= 1 <= r.radius.upper


def test_vague_points_do_not_confirm_each_other_at_the_origin():
    # x/(e^x - 1): one odd term (-x/2) on an even function; Padé and dlog each put a vague point
    # near 0 whose bands overlapped, and the radius read 1.5e-32
    s = Series(_inverse([Fraction(1, math.factorial(k + 1)) for k in range(45)], 45))
    r = analyze(s, Context(dps=40), verify=False)
    with mpmath.workdps(50):
        two_pi = 2 * mpmath.pi
        assert r.radius.lower <= two_pi <= r.radius.upper and r.radius.error < 1e-6
        assert abs(abs(r.singularities[0].location) - two_pi) < 1e-6


def test_pade_alone_does_not_give_an_entire_function_a_radius():
    with mpmath.workdps(60):
        c = mpmath.taylor(lambda t: mpmath.rgamma(1 + t), 0, 40)
    r = analyze(Series(c, digits=50), Context(dps=50), verify=False)
    assert r.growth == "entire-like"
    assert not r.singularities and r.radius.value == mpmath.inf
    assert any("Padé alone" in w for w in r.warnings)


def test_gamma_of_twice_n_is_named_in_text_and_json(tmp_path, capsys):
    s = Series([Fraction(math.factorial(2 * n), 4 ** n) for n in range(40)], name="g2n")
    p = write_series(s, tmp_path / "g.json")
    assert main(["analyze", str(p), "--no-verify"]) == 0
    out = capsys.readouterr().out
    assert "Gamma(2 n + b)" in out and "Gamma(n + b)" not in out
    assert main(["analyze", str(p), "--no-verify", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["borel"]["gamma_multiple"] == "2" and doc["borel"]["stride"] == "1"
    a = doc["borel"]["A"]
    assert mpmath.mpf(a["lo"]) <= 4 <= mpmath.mpf(a["hi"])
    # every method's radius as decimal strings (the JSON contract), value(error) text beside it
    for m in doc["methods"].values():
        assert m["radius"] is None or set(m["radius"]) == {"value", "lo", "hi"}


def test_short_decimals_note_is_in_the_json_warnings(tmp_path, capsys):
    # 1/sqrt(1 - x) written with as few decimals as each needs (0.5, 0.375, ...): the
    # precision note goes to stderr and into the JSON warnings
    lines = [str(float(Fraction(math.comb(2 * n, n), 4 ** n))) for n in range(30)]
    p = tmp_path / "d.txt"
    p.write_text("\n".join(lines) + "\n")
    assert main(["analyze", str(p), "--no-verify", "--json"]) == 0
    cap = capsys.readouterr()
    doc = json.loads(cap.out)
    assert "least precise coefficient" in doc["warnings"][0] and "d.txt" in doc["warnings"][0]
    assert "least precise coefficient" in cap.err


def test_double_indicial_root_is_a_branch_point_with_logarithm():
    # log(1 - x) (1 - x)^(-1/2) (exact product of the two series): the exact second-order
    # equation has the double indicial root -1/2 at x = 1, which forces a logarithm
    # (Frobenius' method: common practice, no source)
    n = 50
    lg = [Fraction(0)] + [Fraction(-1, k) for k in range(1, n)]
    bi = [Fraction(math.comb(2 * k, k), 4 ** k) for k in range(n)]
    c = [sum((lg[j] * bi[k - j] for j in range(k + 1)), Fraction(0)) for k in range(n)]
    r = analyze(Series(c), Context(dps=40), verify=False)
    s0 = r.singularities[0]
    assert abs(s0.location - 1) < 1e-20
    assert s0.kind == "branch-log"
    assert s0.exponent.contains(mpmath.mpf(-1) / 2)
    # the pure power keeps the kind "branch": (1 - x)^(-1/2)
    r2 = analyze(Series(bi), Context(dps=40), verify=False)
    assert r2.singularities[0].kind == "branch"


def test_double_pole_band_covers_the_split_of_the_root():
    # (1 - x)^-2 = sum (n + 1) x^n (common practice, no source): a double pole at 1. Its Padé
    # denominators have the double root, which rounding splits by about eps^(1/2); the Padé
    # method's band must cover the split (it was 1e-39 around 1 - 3.9e-34 + 1.3e-26 i).
    r = analyze(Series([n + 1 for n in range(60)]), Context(dps=40), methods=["pade"], verify=False)
    s0 = r.methods["pade"].singularities[0]
    assert s0.kind == "pole" and s0.exponent.value == -2
    assert s0.re.contains(1) and s0.im.contains(0)


def test_equation_of_a_series_in_x_squared_is_written_in_u():
    # (1 - x^2)^(-1/3) = sum binom(-1/3, k) (-x^2)^k (binomial series, common practice, no source):
    # F(u) = (1 - u)^(-1/3) obeys (1 - u) F' - F/3 = 0 with u = x^2; f itself does not obey
    # (1 - x) f' - f/3 = 0 (its x^0 coefficient: f'(0) - f(0)/3 = -1/3), which used to be printed
    c = []
    b = Fraction(1)
    for k in range(40):
        c += [b * (-1) ** k, Fraction(0)]
        b = b * (Fraction(-1, 3) - k) / (k + 1)
    res = analyze(Series(c[:80]), Context(dps=30), verify=False)
    eq = res.contract_dict().get("equation", "")
    assert "u = x^2" in eq and "F(u)" in eq, eq
    assert "[1 - u] F'" in eq and "[-1/3] F" in eq, eq


def test_complex_exponent_is_not_reported_as_its_real_part():
    # 2F1(1/2 + i, 1/3; 3/2; x): its only finite singular point is x = 1, where it behaves like
    # A + B (1 - x)^(c - a - b) with c - a - b = 2/3 - i (Gauss' connection formula, from
    # memory); coefficients from the term ratio (a)_k (b)_k / ((c)_k k!), checked here against
    # mpmath.hyp2f1 inside the disk. Every exponent estimator once gave the real part 2/3
    # with a band of 1e-28 and no word of the imaginary part.
    a, b, c = mpmath.mpc("0.5", 1), mpmath.mpf(1) / 3, mpmath.mpf("1.5")
    with mpmath.workdps(60):
        co = [mpmath.mpc(1)]
        for k in range(69):
            co.append(co[-1] * (a + k) * (b + k) / ((c + k) * (k + 1)))
        assert abs(mpmath.polyval(co[::-1], mpmath.mpf("0.1")) - mpmath.hyp2f1(a, b, c, mpmath.mpf("0.1"))) < 1e-50
    with mpmath.workdps(40):
        co = [+v for v in co]
    res = analyze(Series(co, digits=40), Context(dps=30))
    assert res.radius.contains(1)
    s = res.singularities[0]
    assert s.re.contains(1) and s.im.contains(0)
    assert s.exponent is None or (s.exponent.contains(mpmath.mpf(2) / 3) and s.exponent.width > 1)
    assert any("complex exponent" in w and "0.66666667 - 1.0 i" in w for w in res.warnings)
