"""The output folder of a family run: spec copy, one record per point, summary.

Layout of ``DIR``::

    DIR/spec.toml        the spec as given (copied at the first run)
    DIR/run.json         study name, spec digest, number of points
    DIR/points/p00000.json ...   one record per point, written atomically
    DIR/summary.csv      one row per recorded point (flattened)
    DIR/summary.json     the same rows plus counts
    DIR/summary.tex      the same rows as a LaTeX table, each band as value(error)
    DIR/plots/           family figures (PNG and PDF)

Each record is written to a temporary file in ``DIR/points`` and renamed
into place (``os.replace``), so a record on disk is always complete; a run
killed at any moment loses only the points still being computed. Leftover
temporary files (``.<name>.<8 characters>.tmp`` beside the files above) are
removed when a run starts.

``spec.toml`` is written before ``run.json``; a folder that holds only the
``spec.toml`` of the same spec (a first run killed between the two writes)
is taken up as a new run.
"""
from __future__ import annotations

import csv
import io
import json
import re
import time
from pathlib import Path
from typing import Iterable, Optional

from ..errors import InputError
from ..estimators.strong_coupling import leading_label
from ..results import row_point
from ..series.io import atomic_write_text, clean_temp_files, temp_target
from .spec import FamilySpec, spec_digest, tomllib

__all__ = ["RunFolder", "flatten_record", "summary_rows", "RUN_FORMAT"]

RUN_FORMAT = "resum-family-run/1"
_TOP_FILES = ("spec.toml", "run.json", "summary.json", "summary.csv", "summary.tex")
_RECORD = re.compile(r"^p\d+\.json$")


def _ours_top(target: str) -> bool:
    return target in _TOP_FILES


def _ours_points(target: str) -> bool:
    return bool(_RECORD.match(target))


def _dump(obj) -> str:
    return json.dumps(obj, indent=1, sort_keys=True) + "\n"


class RunFolder:
    """The output folder of one study (see the module docstring)."""

    def __init__(self, path):
        self.path = Path(path)
        self.points = self.path / "points"
        self.plots = self.path / "plots"

    # ----------------------------------------------------------- preparation
    def prepare(self, spec: FamilySpec, resume: bool = False) -> None:
        """Create the folder, or check that it belongs to ``spec``.

        Raises InputError when ``DIR`` holds a run of a different spec, or
        holds records of this one and ``resume`` is False.
        """
        self.check(spec, resume)
        self._create(spec)

    def check(self, spec: FamilySpec, resume: bool = False) -> None:
        """The checks of :meth:`prepare`, writing nothing."""
        meta_path = self.path / "run.json"
        if self.path.exists() and not self.path.is_dir():
            raise InputError("exists and is not a folder; choose another -o", where=str(self.path))
        if meta_path.exists():
            try:
                meta = json.loads(meta_path.read_text(encoding="utf-8"))
            except (OSError, ValueError):
                raise InputError("run.json is unreadable; choose a new -o folder",
                                 where=str(meta_path)) from None
            if meta.get("spec_digest") != spec.digest:
                raise InputError(
                    f"holds a run of a different spec (study {meta.get('study')!r}); "
                    "use a new -o folder, or restore the spec saved in it as spec.toml",
                    where=str(self.path))
            n = len(self.record_paths())
            if n and not resume:
                raise InputError(f"already holds {n} point records of this study; pass --resume "
                                 "to continue it or choose a new -o folder", where=str(self.path))
        elif self.path.exists():
            self._check_unfinished_creation(spec)

    def _check_unfinished_creation(self, spec: FamilySpec) -> None:
        """Accept a folder without run.json only if it is empty or holds what an
        interrupted creation of this same spec leaves: its spec.toml, an empty
        points/ folder and temporary files of our atomic writes."""
        def ours(p: Path, in_points: bool) -> bool:
            t = temp_target(p.name)
            return t is not None and p.is_file() and (_ours_points(t) if in_points else _ours_top(t))

        entries = list(self.path.iterdir())
        if not entries:
            return
        strange = []
        for p in entries:
            if p.name == "spec.toml" and p.is_file():
                continue
            if p == self.points and p.is_dir() and not p.is_symlink():
                strange += [q for q in p.iterdir() if not ours(q, True)]
                continue
            if not ours(p, False):
                strange.append(p)
        if strange:
            raise InputError("is not empty and holds no resum run; choose a new -o folder",
                             where=str(self.path))
        saved = self.path / "spec.toml"
        if saved.exists():
            try:
                same = spec_digest(tomllib.loads(saved.read_text(encoding="utf-8"))) == spec.digest
            except (OSError, ValueError):   # unreadable, not UTF-8, not TOML
                same = False
            if not same:
                raise InputError("holds only the spec.toml of an unfinished run of another spec; "
                                 "choose a new -o folder", where=str(self.path))

    def _create(self, spec: FamilySpec) -> None:
        meta_path = self.path / "run.json"
        try:
            self.points.mkdir(parents=True, exist_ok=True)
        except OSError as exc:
            raise InputError(f"cannot create the results folder ({exc.strerror or exc}); choose a "
                             "writable -o folder", where=str(self.path)) from None
        # temporary files left by atomic writes of a run that was killed
        clean_temp_files(self.path, _ours_top)
        clean_temp_files(self.points, _ours_points)
        if not meta_path.exists() or not (self.path / "spec.toml").exists():
            atomic_write_text(self.path / "spec.toml", spec.text or "")
        if not meta_path.exists():
            atomic_write_text(meta_path, _dump({
                "format": RUN_FORMAT, "study": spec.name, "spec_digest": spec.digest,
                "n_points": spec.n_points, "source": spec.source,
                "axes": [a.name for a in spec.axes], "plot_against": spec.plot_against,
                "created": time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime())}))

    # -------------------------------------------------------------- records
    def record_path(self, key: str) -> Path:
        return self.points / f"{key}.json"

    def record_paths(self) -> list:
        if not self.points.is_dir():
            return []
        return sorted(p for p in self.points.glob("p*.json"))

    def write_record(self, record: dict) -> Path:
        path = self.record_path(record["key"])
        atomic_write_text(path, _dump(record))
        return path

    def read_record(self, key: str) -> Optional[dict]:
        return _load_record(self.record_path(key))

    def records(self) -> list:
        return self.read_all()[0]

    def read_all(self) -> tuple:
        """``(records, unreadable)``: the records on disk by index, and the record files
        (``points/p*.json``) that hold no record of ours, whose points count as not computed
        (see :func:`_load_record`); one read of each file."""
        out, bad = [], []
        for p in self.record_paths():
            r = _load_record(p)
            (bad if r is None else out).append(p if r is None else r)
        return sorted(out, key=lambda r: r["index"]), bad

    def statuses(self, records=None) -> dict:
        """``{key: status}`` of the records on disk (or of ``records`` already read)."""
        return {r["key"]: r.get("status", "failed") for r in (self.records() if records is None else records)}

    # -------------------------------------------------------------- summary
    def write_summary(self, spec: FamilySpec) -> dict:
        from ..report.latex import family_table_tex
        recs = self.records()
        columns, names = _param_columns_of(recs)
        rows = [flatten_record(r, columns=columns) for r in recs]
        counts = {"points": spec.n_points, "recorded": len(recs),
                  "ok": sum(r["status"] == "ok" for r in recs),
                  "failed": sum(r["status"] != "ok" for r in recs)}
        counts["missing"] = spec.n_points - counts["recorded"]
        atomic_write_text(self.path / "summary.json", _dump(
            {"format": "resum-family-summary/1", "study": spec.name, "spec_digest": spec.digest,
             "counts": counts, "bands": SUMMARY_BAND_NOTE, "rows": rows}))
        atomic_write_text(self.path / "summary.csv", rows_to_csv(rows))
        # the table shows a parameter as the spec wrote it (pi/8, not 0.392699081698724)
        texts = {ax.name: ax.texts for ax in spec.axes if any(ax.texts)}
        tex_rows = []
        for rec, row in zip(recs, rows):
            row = dict(row)
            for n, tx in texts.items():
                i = (rec.get("axis_index") or {}).get(n)
                if isinstance(i, int) and 0 <= i < len(tx) and tx[i] and columns.get(n) in row:
                    row[columns[n]] = tx[i]
            tex_rows.append(row)
        atomic_write_text(self.path / "summary.tex", family_table_tex(
            tex_rows, [columns[n] for n in names], title=spec.name, note=SUMMARY_BAND_NOTE.replace(
                "The strings carry the digits the band supports plus three guard digits.",
                "Written with the digits the band supports.")))
        return counts


#: What the summary's numbers are (the ``bands`` note of summary.json; the CSV's columns
#: ``X``, ``X_lo``, ``X_hi`` are the same strings).
SUMMARY_BAND_NOTE = ("Each X, X_lo, X_hi is a band: an estimate of where the true value lies, made as "
                     "the point's record says ('how' of each task), not a proof. The strings carry the "
                     "digits the band supports plus three guard digits.")


def _load_record(path: Path) -> Optional[dict]:
    """The point record in ``path``, or None when it is missing or not a record of ours (cut
    short, edited by hand: not a JSON object, or without its own key, an integer index and a
    status); such a point counts as not computed and a resumed run computes it again."""
    try:
        rec = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError, RecursionError):   # not with atomic writes: treat as missing
        return None
    if not isinstance(rec, dict) or rec.get("key") != path.stem or not isinstance(rec.get("status"), str) \
            or not isinstance(rec.get("index"), int) or isinstance(rec.get("index"), bool):
        return None
    return rec


# ----------------------------------------------------------------------------
# flattening records into table rows
# ----------------------------------------------------------------------------

def _est(prefix: str, e, row: dict) -> None:
    if isinstance(e, dict) and "value" in e:
        row[prefix] = e.get("value")
        if "lo" in e:
            row[prefix + "_lo"] = e.get("lo")
            row[prefix + "_hi"] = e.get("hi")
    elif e is not None and not isinstance(e, (dict, list)):
        row[prefix] = e


def _sing_fields(prefix, s, row):
    if not isinstance(s, dict):
        return
    for k in ("re", "im"):
        band = s.get(f"{k}_band")
        if isinstance(band, dict):
            _est(f"{prefix}_{k}", band, row)
        elif k in s:
            _est(f"{prefix}_{k}", s[k], row)
    if s.get("exponent") is not None:
        _est(f"{prefix}_exponent", s["exponent"], row)
    if s.get("kind"):
        row[f"{prefix}_kind"] = s["kind"]


def _values_fields(prefix, values, row):
    for v in values or []:
        if not isinstance(v, dict) or "at" not in v:
            continue
        at = row_point(v)
        _est(f"{prefix}@{at}", {"value": v.get("value"), **({"lo": v["lo"], "hi": v["hi"]}
                                                             if "lo" in v else {})}, row)
        if "im" in v:
            # lateral Borel sums value +- i im: the ambiguity belongs in the table too
            _est(f"{prefix}_im@{at}", {"value": v["im"], **({"lo": v["im_lo"], "hi": v["im_hi"]}
                                                             if "im_lo" in v else {})}, row)


# columns of the summary table that are not parameters: fixed names, and the families of names
# whose members depend on the results (sing2_re_lo, strong_truth_leading, ...)
_RESULT_COLUMNS = {"key", "index", "status", "error", "seconds", "n_terms", "ratio_growth",
                   "ratio_status", "analyze_status", "analyze_growth", "truth_status"}
_RESULT_FAMILIES = re.compile(r"^((radius|ratio_radius|ratio_borel_distance|borel_A|borel_b)"
                              r"(_lo|_hi)?|sing\d+_.*|beyond\d+.*|strong_(resummed|truth)_.*|(value|truth)(_im)?@.*)$")
PARAM_PREFIX = "param_"
#: columns for this many points beyond the nearest singularity (analyze's "beyond")
N_BEYOND = 3


def param_columns(names, taken=()) -> dict:
    """``{parameter name: column name}`` for the summary table.

    A parameter keeps its name as its column unless that name is also a result column (a
    source parameter called ``radius`` beside the analysis estimate ``radius``, or any name in
    ``taken``): then its column is ``param_<name>``. Result columns keep their names in every
    study, and no value hides another.
    """
    taken = set(taken)
    out = {}
    for n in names:
        col = n
        while col in _RESULT_COLUMNS or col in taken or _RESULT_FAMILIES.match(col):
            col = PARAM_PREFIX + col
        out[n] = col
    return out


def flatten_record(rec: dict, n_sing: int = 2, columns: Optional[dict] = None) -> dict:
    """One summary-table row (strings) from a point record.

    ``columns`` maps parameter names to column names (default: :func:`param_columns`, so that
    a parameter named like a result column is ``param_<name>``)."""
    results = _result_fields(rec, n_sing)
    labels = rec.get("labels", {})
    names = rec.get("axes", sorted(labels))
    if columns is None:
        columns = param_columns(names, results)
    row = {"key": rec["key"], "index": rec["index"], "status": rec.get("status", "")}
    for k in names:
        row[columns.get(k, k)] = labels.get(k)
    row.update(results)
    err = rec.get("error")
    if err:
        row["error"] = f"{err.get('step')}: {err.get('type')}: {err.get('message')}"
    secs = (rec.get("run") or {}).get("seconds", {})
    if "total" in secs:
        row["seconds"] = secs["total"]
    return row


def _result_fields(rec: dict, n_sing: int) -> dict:
    """The columns of a record's task results, in table order."""
    row = {}
    tasks = rec.get("tasks", {})
    co = tasks.get("coefficients")
    if co:
        row["n_terms"] = co.get("n_terms")
        ratio = co.get("ratio") or {}
        row["ratio_growth"] = ratio.get("growth", "")
        _est("ratio_radius", ratio.get("radius"), row)
        _est("ratio_borel_distance", ratio.get("borel_distance"), row)
        row["ratio_status"] = ratio.get("status", "")
    an = tasks.get("analyze")
    if isinstance(an, dict):
        for k in ("status", "growth"):
            if k in an:
                row[f"analyze_{k}"] = an[k]
        _est("radius", an.get("radius"), row)
        if isinstance(an.get("natural_boundary"), dict):
            # the radius is then the circle along which the approximants' poles crowd
            row["analyze_natural_boundary"] = True
        borel = an.get("borel") if isinstance(an.get("borel"), dict) else {}
        _est("borel_A", borel.get("A", an.get("borel_singularity")), row)
        _est("borel_b", borel.get("b", an.get("borel_exponent")), row)
        for i, s in enumerate((an.get("singularities") or [])[:n_sing]):
            _sing_fields(f"sing{i + 1}", s, row)
        # singular points further along the nearest one's cut (in x^power), the nearest few
        for i, p in enumerate([p for p in (an.get("beyond") or []) if isinstance(p, dict)][:N_BEYOND]):
            _est(f"beyond{i + 1}", p.get("x"), row)
            row[f"beyond{i + 1}_kind"] = p.get("kind", "")
            if str(p.get("power", 1)) != "1":
                row[f"beyond{i + 1}_power"] = p["power"]
    ev = tasks.get("evaluate")
    if isinstance(ev, dict):
        _values_fields("value", ev.get("values"), row)
        search = ev.get("order_search")
        if isinstance(search, dict):
            row["value_terms_used"] = search.get("terms_used", "")
            row["value_goal_reached"] = search.get("reached", "")
    tr = tasks.get("truth")
    if isinstance(tr, dict):
        if tr.get("status"):
            # "not available" where the source has no value at these parameters (its cells empty)
            row["truth_status"] = tr["status"]
        _values_fields("truth", tr.get("values"), row)
    st = tasks.get("strong")
    if isinstance(st, dict):
        for kind in ("resummed", "truth"):
            d = st.get(kind)
            if not isinstance(d, dict):
                continue
            row[f"strong_{kind}_status"] = d.get("status", "")
            if d.get("spacing") is not None:
                # the step S between the fitted powers p, p - S, ... (chosen automatically unless
                # the spec gives it): which form the coefficients belong to
                row[f"strong_{kind}_spacing"] = d["spacing"]
            _est(f"strong_{kind}_power", d.get("leading_power"), row)
            if d.get("kappa") is not None:
                # the rate of an exponentially small term the fit kept (e^(-kappa g))
                _est(f"strong_{kind}_kappa", d["kappa"], row)
            co = d.get("coefficients") or {}
            lead = leading_label(co)
            if lead is not None:
                # the leading coefficient under one name for every point (the fitted power, and so
                # the label, can differ from point to point); found by its power, since the
                # record's keys are sorted ("g^-1" before "g^1")
                _est(f"strong_{kind}_leading", co[lead], row)
            for label, e in co.items():
                if "." not in label:     # a power read as a decimal is no stable column name
                    _est(f"strong_{kind}_{label.replace(' ', '_')}", e, row)
    return row


def _param_columns_of(records: list):
    """``(columns, names)``: the parameters' column names over all ``records`` (see
    :func:`param_columns`) and the parameter names in table order."""
    taken, names = set(), []
    for r in records:
        taken.update(_result_fields(r, 2))
        for k in r.get("axes", sorted(r.get("labels", {}))):
            if k not in names:
                names.append(k)
    return param_columns(names, taken), names


def summary_rows(records: Iterable[dict]) -> list:
    """The summary table's rows; a parameter's column is the same in every row (decided over
    the result columns of all records, see :func:`param_columns`)."""
    records = list(records)
    columns, _ = _param_columns_of(records)
    return [flatten_record(r, columns=columns) for r in records]


def rows_to_csv(rows: list) -> str:
    cols = []
    for r in rows:
        for k in r:
            if k not in cols:
                cols.append(k)
    # errors and timings last
    cols = [c for c in cols if c not in ("error", "seconds")] + [c for c in ("error", "seconds")
                                                                 if c in cols]
    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=cols, lineterminator="\n")
    w.writeheader()
    for r in rows:
        w.writerow({k: ("" if r.get(k) is None else r.get(k)) for k in cols})
    return buf.getvalue()

