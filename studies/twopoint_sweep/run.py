"""Two-point approximants (known strong-coupling terms) against closed forms: do the bands hold?

    python studies/twopoint_sweep/run.py          # about two minutes on one core

Three functions with their cut on the negative axis and a large-x expansion in powers of x
spaced by 1/2 (common practice, no source for the expansions; truths through mpmath):

* sqrt(x) atan(sqrt(x)) = sum (-1)^(k-1) x^k/(2k-1); at large x (pi/2) x^(1/2) - 1 + x^(-1)/3
  - x^(-2)/5 + ...; branch point x = -1;
* sqrt(1 + x) + sqrt(1 + x/3); at large x (1 + r) x^(1/2) + (1/2 + 3r/2) x^(-1/2)
  - (1/8 + 9r/8) x^(-3/2) + ..., r = 1/sqrt(3); branch points -1 and -3;
* (2/pi^2) log cosh(2 pi sqrt(x)) (Taylor series through Bernoulli numbers); at large x
  (4/pi) x^(1/2) - 2 log2/pi^2 plus exponentially small terms; branch points -(2k+1)^2/16.

From 30 and 60 terms (55-digit coefficients, 30 digits asked, verification on) at three points
far out, with the first k = 1 ... 5 strong-coupling terms given: the variant kept, digits
correct, digits claimed and the error in units of the band's half-width (above 1: a miss).
"""
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))          # run from a checkout
import mpmath  # noqa: E402
from mpmath import mpf  # noqa: E402
from resum.context import Context, workdps  # noqa: E402
from resum.series import Series  # noqa: E402
from resum.resummation import evaluate  # noqa: E402


def atan_case(n):
    """sqrt(x) atan(sqrt(x)): coefficients, strong terms (power in x, value), truth, branch point."""
    c = [mpf(0)] + [mpf(-1) ** (k - 1) / (2 * k - 1) for k in range(1, n)]
    terms = [("1/2", "pi/2"), ("0", "-1"), ("-1/2", "0"), ("-1", "1/3"), ("-3/2", "0")]
    return c, terms, (lambda x: mpmath.sqrt(x) * mpmath.atan(mpmath.sqrt(x))), -1


def two_roots_case(n):
    """sqrt(1 + x) + sqrt(1 + x/3)."""
    c = [mpmath.binomial(mpf(1) / 2, k) * (1 + mpf(3) ** -k) for k in range(n)]
    r = 1 / mpmath.sqrt(3)
    terms = [("1/2", 1 + r), ("0", 0), ("-1/2", mpf(1) / 2 + 3 * r / 2), ("-1", 0),
             ("-3/2", -mpf(1) / 8 - 9 * r / 8)]
    return c, terms, (lambda x: mpmath.sqrt(1 + x) + mpmath.sqrt(1 + x / 3)), -1


def logcosh_case(n):
    """(2/pi^2) log cosh(2 pi sqrt(x))."""
    c = [mpf(0)] + [2 / mpmath.pi ** 2 * 2 ** (2 * k) * (2 ** (2 * k) - 1) * mpmath.bernoulli(2 * k)
                    * (4 * mpmath.pi ** 2) ** k / (2 * k * mpmath.factorial(2 * k)) for k in range(1, n)]
    terms = [("1/2", 4 / mpmath.pi), ("0", -2 * mpmath.log(2) / mpmath.pi ** 2), ("-1/2", 0), ("-1", 0),
             ("-3/2", 0)]
    return c, terms, (lambda x: 2 / mpmath.pi ** 2 * mpmath.log(mpmath.cosh(2 * mpmath.pi * mpmath.sqrt(x)))), \
        -mpf(1) / 16


def main():
    total = misses = 0
    worst = 0
    ratios = []
    print("case      terms  k  x         variant     digits  claimed  error/half-width")
    for name, case in (("atan", atan_case), ("two-roots", two_roots_case), ("logcosh", logcosh_case)):
        for n in (30, 60):
            with workdps(60):
                c, terms, truth, x0 = case(n)
                s = Series(c, digits=55)
                xs = [-x0 * mpf(v) for v in (10, 1000, 10 ** 5)]
            for k in range(1, len(terms) + 1):
                r = evaluate(s, xs, Context(dps=30), strong_terms=dict(terms[:k]))
                for x, p in zip(xs, r.points):
                    if p.value is None:
                        print(f"{name:9} {n:5}  {k}  {mpmath.nstr(x, 3):8}  no value ({p.message})")
                        continue
                    with workdps(60):
                        t = truth(x)
                        err = abs(p.value.value - t)
                        ratio = err / p.value.error
                        dig = -mpmath.log10(err / abs(t)) if err else mpmath.inf
                        claim = -mpmath.log10(p.value.error / abs(t))
                    total += 1
                    misses += ratio > 1
                    worst = max(worst, ratio)
                    ratios.append(ratio)
                    print(f"{name:9} {n:5}  {k}  {mpmath.nstr(x, 3):8}  {str(p.diagnostics.get('variant')):10}  "
                          f"{mpmath.nstr(dig, 3):6}  {mpmath.nstr(claim, 3):7}  {mpmath.nstr(ratio, 3)}"
                          + ("   MISS" if ratio > 1 else ""), flush=True)
    print(f"\n{total} values, {misses} outside their band (largest error {mpmath.nstr(worst, 3)} half-widths)")


if __name__ == "__main__":
    main()
