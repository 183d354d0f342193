"""matplotlib figures; each ``plot_x(result, ax=None) -> ax``. Import the submodules
(``resum.plots.analysis``, ``resum.plots.evaluation``, ``resum.plots.family``) directly;
matplotlib is an optional dependency (extra ``plot``)."""
