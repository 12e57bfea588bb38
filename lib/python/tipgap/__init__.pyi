# Type stub of the tipgap package: the public API, for editors and type checkers. Units are in
# the keyword names; see help(tipgap.<function>) for ranges.
from os import PathLike
from typing import Any, Literal, Sequence, Union

import numpy
import numpy.typing

__version__: str

ArrayLike = numpy.typing.ArrayLike
FloatArray = numpy.typing.NDArray[numpy.float64]
Path = Union[str, PathLike[str]]

class Error(ValueError):
    """Bad input; str(e) is the CLI's one-line message."""
    kind: str  # "error", "usage error" or "no answer"
    exit_code: int  # the CLI's exit code: 3, 2 or 4
    detail: str
    key: str
    file: str
    line: int
    column: int

class Config:
    @staticmethod
    def default() -> Config: ...
    @staticmethod
    def from_yaml(path: str) -> Config: ...
    @staticmethod
    def from_text(yaml: str, name: str = "<text>") -> Config: ...
    def replace(
        self,
        *,
        tip_material: str = ...,
        sample_material: str = ...,
        tip_work_function_eV: float = ...,
        sample_work_function_eV: float = ...,
        tip_fermi_energy_eV: float = ...,
        sample_fermi_energy_eV: float = ...,
        tip_work_function_stddev_eV: float = ...,
        sample_work_function_stddev_eV: float = ...,
        image_potential: Literal["exact", "approximate", "none"] = ...,
        relative_permittivity: float = ...,
        temperature_K: float = ...,
        method: Literal["wkb", "simmons", "exact"] = ...,
        tolerance: float = ...,
        bias_limit_V: float = ...,
        geometry: Literal["planar", "paraboloid", "contact_anchored"] = ...,
        area_nm2: float = ...,
        apex_radius_nm: float = ...,
        apex_radius_stddev_nm: float = ...,
        contact_distance_nm: float = ...,
    ) -> Config: ...
    def to_dict(self) -> dict[str, Any]: ...
    @property
    def source(self) -> str: ...

def predict(
    config: Config,
    gap_nm: ArrayLike,
    bias_V: ArrayLike,
    *,
    threads: int = 0,
    mc_samples: int = 400,
    seed: int = 1,
) -> dict[str, Any]: ...
def plan(
    config: Config,
    current_A: ArrayLike,
    bias_V: ArrayLike,
    *,
    threads: int = 0,
    mc_samples: int = 400,
    seed: int = 1,
) -> dict[str, Any]: ...
def fit(
    z_nm: ArrayLike,
    current_A: ArrayLike,
    bias_V: float | None = None,
    *,
    model: Literal["linear", "offset"] = "offset",
    noise_floor_A: float | None = None,
    saturation_A: float | None = None,
    current_noise_A: float | None = None,
    window_points: int | None = None,
    window_nm: float | None = None,
    calibration_uncertainty: float = 0.0,
    confidence: float = 0.95,
    contact_distance_nm: float | None = None,
    config: Config | None = None,
    name: str = "<arrays>",
) -> dict[str, Any] | list[dict[str, Any]]: ...
def map(
    z_nm: ArrayLike,
    current_A: ArrayLike,
    bias_V: float | None = None,
    *,
    x_nm: ArrayLike | None = None,
    y_nm: ArrayLike | None = None,
    model: Literal["linear", "offset"] = "linear",
    noise_floor_A: float | None = None,
    saturation_A: float | None = None,
    current_noise_A: float | None = None,
    calibration_uncertainty: float = 0.0,
    confidence: float = 0.95,
    contact_distance_nm: float | None = None,
    min_decades: float = 1.0,
    max_relative_error: float = 0.1,
    threads: int = 0,
    name: str = "<arrays>",
) -> dict[str, Any]: ...
def read_curve(path: Path, *, turn_fraction: float = 0.05) -> dict[str, Any]: ...
def read_grid(path: Path, *, threads: int = 0, chunk_bytes: int = 1048576) -> dict[str, Any]: ...
def synth_curve(
    config: Config | None = None,
    *,
    bias_V: float = 0.1,
    gap_nm: Sequence[float] = (0.45, 1.0),
    points: int = 121,
    gap_at_z0_nm: float | None = None,
    sweeps: Literal["retract", "approach", "approach_retract"] = "retract",
    noise_A: float = 0.0,
    baseline_A: float = 0.0,
    saturation_A: float = 0.0,
    drift_nm: float = 0.0,
    jump_gap_nm: float = 0.0,
    contact_conductance_G0: float = 1.0,
    seed: int = 1,
) -> dict[str, Any]: ...
