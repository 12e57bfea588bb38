"""tipgap: the STM tunnelling-gap model, setpoint planner and I(z) fitter on NumPy arrays.

The same library as the ``tipgap`` command: for the same inputs the numbers are identical, and the
dict keys are the keys of the CLI's JSON output, units in the names (``gap_nm``, ``current_A``,
``apparent_barrier_eV``).

    >>> import tipgap
    >>> cfg = tipgap.Config.default()
    >>> tipgap.plan(cfg, current_A=1e-10, bias_V=0.5)["gap_nm"]      # doctest: +SKIP
    0.879...

Functions: predict, plan (the model at gaps or setpoints, arrays broadcast like NumPy), fit (one
measured I(z) curve), map (a grid of curves), read_curve, read_grid (the project's file readers),
synth_curve (synthetic curves with their ground truth). Bad input raises tipgap.Error, a ValueError
whose message is the CLI's one-line message. Computations release the GIL.
"""

import os
import sys

# The interpreter version the compiled module was built for (filled in by CMake).
_BUILT_FOR = "@TIPGAP_PYTHON_BUILT_FOR@"
# Where Debian's python3-numpy lives.
_DEBIAN_DIST_PACKAGES = "/usr/lib/python3/dist-packages"


def _import_numpy():
    try:
        import numpy
        return numpy
    except ImportError as first:
        running = "%d.%d" % sys.version_info[:2]
        # Why: the module is built against Debian's python3, whose numpy is the Debian package
        # python3-numpy. Another interpreter of the same version (e.g. a pyenv python3 first on
        # PATH) loads the same compiled module but may have no numpy of its own; Debian's numpy is
        # built for that version too, so look there, after the interpreter's own directories.
        if running == _BUILT_FOR and os.path.isdir(_DEBIAN_DIST_PACKAGES):
            if _DEBIAN_DIST_PACKAGES not in sys.path:
                sys.path.append(_DEBIAN_DIST_PACKAGES)
            try:
                import numpy
                return numpy
            except ImportError:
                pass
        raise ImportError(
            "tipgap needs numpy: this Python %s (%s) has none%s; install numpy for it, or run Debian's "
            "/usr/bin/python3 with python3-numpy (apt-get install python3-numpy)"
            % (running, sys.executable,
               "" if running == _BUILT_FOR else ", and the module was built for Python %s" % _BUILT_FOR)) from first


numpy = _import_numpy()

from ._tipgap import Config, Error, __version__  # noqa: E402
from . import _tipgap  # noqa: E402

__all__ = ["Config", "Error", "predict", "plan", "fit", "map", "read_curve", "read_grid", "synth_curve",
           "__version__"]


# ---------------------------------------------------------------------------------------------
# Helpers: broadcasting in, shapes out.

def _error(key, detail):
    """A tipgap.Error for a bad argument, worded as the library words its own."""
    e = Error("tipgap: error: %s: %s" % (key, detail))
    e.kind, e.exit_code, e.detail, e.key, e.file, e.line, e.column = "error", 3, detail, key, "", 0, 0
    return e


def _floats(value, key):
    try:
        return numpy.asarray(value, dtype=numpy.float64)
    except (TypeError, ValueError) as e:
        raise _error(key, "%r is not a number or an array of numbers" % (value,)) from e


def _broadcast(**arrays):
    """The common shape of the arrays, and each as a flat contiguous float64 array."""
    values = [_floats(v, k) for k, v in arrays.items()]
    try:
        b = numpy.broadcast_arrays(*values)
    except ValueError as e:
        shapes = ", ".join("%s %s" % (k, v.shape) for k, v in zip(arrays, values))
        raise _error(next(iter(arrays)), "shapes %s do not broadcast together; expected shapes that "
                     "NumPy broadcasts" % shapes) from e
    return b[0].shape, [numpy.ascontiguousarray(x).ravel() for x in b]


def _shaped(columns, shape):
    """Flat columns from the compiled module in the shape of the inputs: numbers as arrays (NumPy
    scalars for scalar inputs), texts as str arrays, lists (warnings) as nested lists."""
    out = {}
    for key, col in columns.items():
        if isinstance(col, numpy.ndarray):
            a = col.reshape(shape + col.shape[1:])
            out[key] = a[()] if a.ndim == 0 else a
        elif len(shape) == 0:
            out[key] = col[0]
        elif all(isinstance(v, str) for v in col):
            out[key] = numpy.array(col, dtype=str).reshape(shape)
        else:
            a = numpy.empty(len(col), dtype=object)
            for i, v in enumerate(col):
                a[i] = v
            a = a.reshape(shape)
            out[key] = a.tolist() if any(isinstance(v, list) for v in col) else a
    return out


def _optional_float(value, key):
    if value is None:
        return float("nan")
    try:
        return float(value)
    except (TypeError, ValueError) as e:
        raise _error(key, "%r is not a number" % (value,)) from e


def _check_config(config):
    if not isinstance(config, Config):
        raise TypeError("expected a tipgap.Config (e.g. tipgap.Config.default()), got %s" % type(config).__name__)


# ---------------------------------------------------------------------------------------------

def predict(config, gap_nm, bias_V, *, threads=0, mc_samples=400, seed=1):
    """The forward model at gaps and biases, as ``tipgap predict``.

    config      tipgap.Config: the junction (Config.default(), Config.from_yaml(path), ...).
    gap_nm      gap s, closest tip-sample distance (nm), in (0, 100]; scalar or array.
    bias_V      sample bias (V), |bias_V| <= the config's bias limit (10 V unless configured);
                scalar or array. gap_nm and bias_V broadcast like NumPy.
    threads     worker threads (0 = all cores); the results do not depend on it.
    mc_samples  Monte Carlo draws for the config's input uncertainties, [0, 1000000] (0: linear
                propagation only); used only when the config gives uncertainties ("4.5 ± 0.1 eV").
    seed        seed of the Monte Carlo draws; the same seed gives the same result.

    Returns a dict with the keys of the CLI's JSON points, each an array of the broadcast shape
    (a scalar for scalar inputs): gap_nm, bias_V, temperature_K, current_density_A_per_m2,
    current_A (signed like the bias), conductance_S, conductance_G0,
    differential_conductance_density_S_per_m2, decay_constant_per_nm, nm_per_decade,
    apparent_barrier_eV, barrier_top_eV, barrier_width_nm, regime (str), warnings (lists of str),
    and, with uncertain inputs, <output>_stddev, <output>_ci95 (low, high), ...
    Raises tipgap.Error for a gap or bias out of range.
    """
    _check_config(config)
    shape, (gap, bias) = _broadcast(gap_nm=gap_nm, bias_V=bias_V)
    return _shaped(_tipgap._predict(config, gap, bias, threads, mc_samples, seed), shape)


def plan(config, current_A, bias_V, *, threads=0, mc_samples=400, seed=1):
    """The gap for a current setpoint at a bias, as ``tipgap plan``.

    config      tipgap.Config: the junction.
    current_A   setpoint current (A), non-zero; its magnitude is used and the sign follows the bias;
                scalar or array.
    bias_V      sample bias (V), non-zero, |bias_V| <= the config's bias limit; scalar or array.
                current_A and bias_V broadcast like NumPy.
    threads     worker threads (0 = all cores); the results do not depend on it.
    mc_samples  Monte Carlo draws for the config's input uncertainties, [0, 1000000].
    seed        seed of the Monte Carlo draws.

    The gap is searched in [0.1, 5] nm. Returns a dict with the keys of the CLI's JSON points, each
    an array of the broadcast shape (a scalar for scalar inputs): bias_V, current_A, gap_nm,
    model_current_A, gap_resistance_ohm, conductance_G0, decay_constant_per_nm, nm_per_decade,
    apparent_barrier_eV, regime (None where unreachable), status, evaluations, warnings (lists).
    An unreachable setpoint has NaN values and a warning; when none is reachable tipgap.Error
    ("tipgap: no answer: ...", exit_code 4) is raised, as the CLI does.
    """
    _check_config(config)
    shape, (current, bias) = _broadcast(current_A=current_A, bias_V=bias_V)
    return _shaped(_tipgap._plan(config, current, bias, threads, mc_samples, seed), shape)


def _fit_options(model, noise_floor_A, saturation_A, current_noise_A, calibration_uncertainty, confidence,
                 contact_distance_nm, **more):
    options = dict(model=model, noise_floor_A=noise_floor_A, saturation_A=saturation_A,
                   current_noise_A=current_noise_A, calibration_uncertainty=calibration_uncertainty,
                   confidence=confidence, contact_distance_nm=contact_distance_nm, **more)
    return {k: v for k, v in options.items() if v is not None}


def fit(z_nm, current_A, bias_V=None, *, model="offset", noise_floor_A=None, saturation_A=None,
        current_noise_A=None, window_points=None, window_nm=None, calibration_uncertainty=0.0, confidence=0.95,
        contact_distance_nm=None, config=None, name="<arrays>"):
    """Decay constant and apparent barrier height of one measured I(z) curve, as ``tipgap fit``.

    z_nm        relative tip displacement z (nm), increasing as the tip retracts, zero arbitrary;
                1-D, finite, at least 3 values.
    current_A   current (A), signed as measured; 1-D, same length, finite.
    bias_V      sample bias (V), or None when unknown (then no contact conductance and no model
                comparison).
    model       "offset" (default): I0 exp(-2 kappa z) + c over every point, weighted by the noise
                model sigma^2 = sigma_I^2 + (eps I)^2 estimated with the fit; "linear": weighted fit
                of ln|I| above the noise floor (faster, no offset; the default of map).
    noise_floor_A        current below which points are noise (A), >= 0; None: estimated from the
                         far tail.
    saturation_A         amplifier saturation (A), >= 0, above the noise floor; None: detected.
    current_noise_A      standard deviation of the current noise (A), >= 0; None: estimated.
    window_points        sliding window of the phi_ap(z) profile in points, >= 4; or
    window_nm            the window as a z extent (nm), > 0; neither: max(8, n/5) points.
    calibration_uncertainty  relative piezo calibration uncertainty, [0, 0.5).
    confidence           confidence level of the intervals, (0, 1).
    contact_distance_nm  gap at point contact (nm), > 0, for the absolute gap scale; None: 0.25.
    config               a tipgap.Config: also fit the tunnelling model (mean work function, gap
                         offset, prefactor); needs bias_V.
    name                 stands for the file name in the result and in messages.

    Returns a dict with the keys of one curve of the CLI's JSON output: file, direction, model,
    status, decay_constant_per_nm (+ _stderr_, _ci_low_, _ci_high_), apparent_barrier_eV (+ its
    stderr and interval), nm_per_decade, prefactor_A, offset_A, r_squared, points_used, noise,
    saturation, contact (dict), profile (dict of arrays: z_nm, gap_nm, decay_constant_per_nm,
    apparent_barrier_eV, their stderr, points), metadata, model_fit (with config), warnings.
    When z turns back (approach and retract in one array) the curve is split into sweeps as the CLI
    splits a file, and a list of such dicts is returned, one per sweep in order.
    """
    z = _floats(z_nm, "z_nm")
    current = _floats(current_A, "current_A")
    if z.ndim != 1 or current.shape != z.shape:
        raise _error("current_A" if z.ndim == 1 else "z_nm",
                     "shapes z_nm %s and current_A %s; expected two 1-D arrays of the same length"
                     % (z.shape, current.shape))
    if config is not None:
        _check_config(config)
    options = _fit_options(model, noise_floor_A, saturation_A, current_noise_A, calibration_uncertainty, confidence,
                           contact_distance_nm, window_points=window_points, window_nm=window_nm)
    sweeps = _tipgap._fit(numpy.ascontiguousarray(z), numpy.ascontiguousarray(current),
                          _optional_float(bias_V, "bias_V"), options, config, str(name))
    return sweeps[0] if len(sweeps) == 1 else sweeps


def map(z_nm, current_A, bias_V=None, *, x_nm=None, y_nm=None, model="linear", noise_floor_A=None,
        saturation_A=None, current_noise_A=None, calibration_uncertainty=0.0, confidence=0.95,
        contact_distance_nm=None, min_decades=1.0, max_relative_error=0.1, threads=0, name="<arrays>"):
    """Barrier-height maps of a spectroscopy grid, as ``tipgap map``: one fit per pixel.

    z_nm        z (nm) of the samples: shape (nz,) shared by every pixel, or (ny, nx, nz); finite.
    current_A   current (A), shape (ny, nx, nz): row iy, column ix, sample k; finite.
    bias_V      sample bias (V), or None when unknown.
    x_nm, y_nm  pixel positions (nm), strictly ascending, lengths nx and ny; None: 0, 1, 2, ...
    model, noise_floor_A, saturation_A, current_noise_A, calibration_uncertainty, confidence,
    contact_distance_nm  as for tipgap.fit.
    min_decades          quality poor_fit when the used points span fewer decades of current, > 0.
    max_relative_error   quality poor_fit when the standard error of the barrier exceeds this
                         fraction of it, > 0.
    threads              worker threads (0 = all cores); the results do not depend on it.

    Returns a dict of (ny, nx) arrays: apparent_barrier_eV, decay_constant_per_nm,
    stderr_apparent_barrier_eV, stderr_decay_constant_per_nm, r_squared (NaN without a value),
    quality (uint8 codes 0 ok, 1 too_few_points, 2 saturated, 3 contact, 4 poor_fit), points_used;
    x_nm, y_nm; and summary: the CLI's summary.json as a dict (statistics, quality counts, ...).
    """
    current = _floats(current_A, "current_A")
    if current.ndim != 3 or current.shape[2] < 1:
        raise _error("current_A", "shape %s; expected (ny, nx, nz)" % (current.shape,))
    ny, nx, nz = current.shape
    z = _floats(z_nm, "z_nm")
    if not (z.shape == (nz,) or z.shape == current.shape):
        try:
            z = numpy.broadcast_to(z, current.shape)
        except ValueError as e:
            raise _error("z_nm", "shape %s; expected (%d,) or (%d, %d, %d)" % (z.shape, nz, ny, nx, nz)) from e
    x = numpy.arange(nx, dtype=numpy.float64) if x_nm is None else _floats(x_nm, "x_nm")
    y = numpy.arange(ny, dtype=numpy.float64) if y_nm is None else _floats(y_nm, "y_nm")
    if x.shape != (nx,):
        raise _error("x_nm", "shape %s; expected (%d,), one position per column of current_A" % (x.shape, nx))
    if y.shape != (ny,):
        raise _error("y_nm", "shape %s; expected (%d,), one position per row of current_A" % (y.shape, ny))
    options = _fit_options(model, noise_floor_A, saturation_A, current_noise_A, calibration_uncertainty, confidence,
                           contact_distance_nm, min_decades=min_decades, max_relative_error=max_relative_error)
    flat = numpy.ascontiguousarray
    return _tipgap._map(flat(z).ravel(), flat(current).ravel(), nz, flat(x), flat(y), _optional_float(bias_V, "bias_V"),
                        options, threads, str(name))


def read_curve(path, *, turn_fraction=0.05):
    """Reads a curve file (CSV: '# key: value' metadata, header 'z [nm],current [nA]', rows) with the
    CLI's reader and messages.

    turn_fraction  a sweep ends where z moves back by more than this fraction of the z range,
                   (0, 1) (files without a direction column).

    Returns a dict: file, metadata (dict of the '# key: value' lines as written), bias_V (V or
    None), z_nm, current_A (arrays of every row), sweeps (list of dicts: direction, first_row,
    z_nm, current_A).
    """
    return _tipgap._read_curve(os.fspath(path), float(turn_fraction))


def read_grid(path, *, threads=0, chunk_bytes=1 << 20):
    """Reads a spectroscopy grid (one long CSV 'x [nm],y [nm],z [nm],current [pA]', or a directory of
    curve files with x and y metadata) with the CLI's reader and messages.

    threads      worker threads (0 = all cores).
    chunk_bytes  bytes read per chunk of a long CSV, >= 4096.

    Returns a dict: path, layout ('csv' or 'directory'), metadata, bias_V (V or None), x_nm (nx,),
    y_nm (ny,), z_nm and current_A of shape (ny, nx, nz), warnings; ready for tipgap.map.
    """
    return _tipgap._read_grid(os.fspath(path), int(threads), int(chunk_bytes))


def synth_curve(config=None, *, bias_V=0.1, gap_nm=(0.45, 1.0), points=121, gap_at_z0_nm=None, sweeps="retract",
                noise_A=0.0, baseline_A=0.0, saturation_A=0.0, drift_nm=0.0, jump_gap_nm=0.0,
                contact_conductance_G0=1.0, seed=1):
    """A synthetic I(z) curve from tipgap's model plus an instrument model, as ``tipgap synth``.
    Not a measurement: for tests and demonstrations.

    config        tipgap.Config (None: Config.default()).
    bias_V        sample bias (V), non-zero, within the config's bias limit.
    gap_nm        (closest, farthest) nominal gap (nm): 0 < closest < farthest <= 10.
    points        samples per sweep, [8, 1000000].
    gap_at_z0_nm  absolute gap at z = 0 (nm); None: the closest gap.
    sweeps        "retract", "approach" or "approach_retract".
    noise_A       standard deviation of white current noise (A), >= 0.
    baseline_A    additive current offset (A), finite.
    saturation_A  amplifier clip level (A), >= 0 (0: none).
    drift_nm      piezo drift over the curve (nm), |drift| < 1.
    jump_gap_nm   jump to contact below this true gap (nm), >= 0 (0: none).
    contact_conductance_G0  conductance after the jump (G0), (0, 100].
    seed          seed of the std::mt19937_64 noise generator.

    Returns a dict: z_nm, current_A, true_gap_nm, model_current_A (arrays), direction (list of str),
    in_contact (bool array), bias_V, and truth: the CLI's ground truth (decay_constant_range_per_nm,
    apparent_barrier_range_eV, mean_work_function_eV, ..., and sweeps: per sweep the
    decay_constant_expected_per_nm and apparent_barrier_expected_eV a linear fit should find).
    """
    if config is None:
        config = Config.default()
    _check_config(config)
    options = dict(bias_V=bias_V, gap_nm=gap_nm, points=points, gap_at_z0_nm=gap_at_z0_nm, sweeps=sweeps,
                   noise_A=noise_A, baseline_A=baseline_A, saturation_A=saturation_A, drift_nm=drift_nm,
                   jump_gap_nm=jump_gap_nm, contact_conductance_G0=contact_conductance_G0, seed=seed)
    return _tipgap._synth_curve(config, options)
