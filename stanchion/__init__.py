"""stanchion: axial compression checks of steel columns straight from IFC models.

The installed package holds three subpackages, kept as top-level folders in the repository:

* :mod:`stanchion.engine` -- every engineering rule, pure numpy (AISC 360-22 Chapter E, ASCE
  7-22 combinations, catalog, materials, selection);
* :mod:`stanchion.ifc_bridge` -- ifcopenshell only: facts out of a model, results back in;
* :mod:`stanchion.service` -- the pipeline and its front ends (command line, HTTP, jobs,
  report writers).
"""

from importlib.metadata import PackageNotFoundError, version

try:
    __version__ = version("stanchion")
except PackageNotFoundError:  # pragma: no cover - run from a checkout that is not installed
    __version__ = "0+unknown"
