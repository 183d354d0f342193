"""matplotlib figures; each ``plot_x(result, ax=None) -> ax``. Import the submodules
(``resum.plots.analysis``, ``resum.plots.evaluation``, ``resum.plots.family``) directly;
matplotlib is an optional dependency (extra ``plot``)."""

import os as _os
from pathlib import Path as _Path


def save_figure(fig, path, **kwargs) -> str:
    """``fig.savefig`` written atomically: into a temporary file of the atomic writers'
    pattern in the same folder, then renamed over ``path``, so an interrupted run never
    leaves a half-written figure. The format comes from the extension."""
    from ..series.io import _open_temp
    path = _Path(path)
    fd, tmp = _open_temp(path.parent if str(path.parent) else _Path("."), path.name)
    try:
        with _os.fdopen(fd, "wb") as fh:
            fig.savefig(fh, format=path.suffix.lstrip(".") or "png", **kwargs)
            fh.flush()
            _os.fsync(fh.fileno())
        _os.replace(tmp, path)
    except BaseException:
        try:
            _os.unlink(tmp)
        except OSError:
            pass
        raise
    return str(path)
