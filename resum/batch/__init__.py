"""Family studies: a parameter grid of one source, one record per point.

* :mod:`resum.batch.spec` -- the TOML spec and its validation
  (:func:`load_spec`, :func:`parse_spec`, :class:`FamilySpec`);
* :mod:`resum.batch.tasks` -- what is computed at each point;
* :mod:`resum.batch.worker` -- :func:`compute_point`, the one function the
  runners call;
* :mod:`resum.batch.runners` -- serial, local process pool, dask cluster;
* :mod:`resum.batch.records` -- the run folder, atomic records, summary;
* :mod:`resum.batch.progress` -- the progress line on stderr;
* :mod:`resum.batch.scan` -- :func:`run_family`, tying them together.
"""
from .spec import FamilySpec, Axis, Point, load_spec, parse_spec, resolve_source
from .tasks import TASKS, ratio_estimate
from .worker import compute_point, strip_run
from .runners import SerialRunner, ProcessRunner, DaskRunner, make_runner, default_jobs
from .records import RunFolder, flatten_record
from .scan import run_family, FamilyOutcome

__all__ = ["FamilySpec", "Axis", "Point", "load_spec", "parse_spec", "resolve_source", "TASKS",
           "ratio_estimate", "compute_point", "strip_run", "SerialRunner", "ProcessRunner",
           "DaskRunner", "make_runner", "default_jobs", "RunFolder", "flatten_record",
           "run_family", "FamilyOutcome"]
