"""The module gives the CLI's numbers: predict, plan, fit and map against `tipgap ... --format json`
(and map's matrix files), key for key, to SAME_AS_CLI relative."""
import json

import numpy
import pytest

import tipgap
from conftest import SAME_AS_CLI, assert_same, cli_json, row, run_cli

# A config with input uncertainties, so that the uncertainty columns are compared too.
UNCERTAIN_YAML = """\
tip:    { material: tungsten, work_function: 4.5 ± 0.1 eV }
sample: { material: gold, work_function: 5.3 ± 0.05 eV }
temperature: 77 K
geometry: { kind: planar, area: 2 nm^2 }
"""


def listing(values, unit):
    """A CLI value list that reads back to exactly these doubles (repr is the shortest exact text)."""
    return ",".join("%r%s" % (float(v), unit) for v in values)


@pytest.fixture
def uncertain_config(tmp_path):
    path = tmp_path / "uncertain.yaml"
    path.write_text(UNCERTAIN_YAML)
    return path


def test_predict_matches_cli(default_config):
    gaps = numpy.linspace(0.3, 1.5, 9)
    doc = cli_json("predict", "--gap", listing(gaps, "nm"), "--bias", "0.5V")
    res = tipgap.predict(default_config, gaps, 0.5)
    assert len(doc["points"]) == len(gaps)
    for i, point in enumerate(doc["points"]):
        assert_same(row(res, i), point, "point %d" % i)


def test_predict_matches_cli_with_uncertain_inputs(uncertain_config):
    cfg = tipgap.Config.from_yaml(str(uncertain_config))
    gaps, biases = [0.5, 0.8], [-0.2, 0.3]
    doc = cli_json("predict", "--config", uncertain_config, "--gap", listing(gaps, "nm"), "--bias", listing(biases, "V"),
                   "--mc-samples", "40", "--seed", "7", "--threads", "2")
    # The CLI's points: bias outer, gap inner.
    g, b = numpy.meshgrid(gaps, biases)
    res = tipgap.predict(cfg, g.ravel(), b.ravel(), mc_samples=40, seed=7, threads=2)
    assert "current_A_stddev" in res
    for i, point in enumerate(doc["points"]):
        assert_same(row(res, i), point, "point %d" % i)


def test_plan_matches_cli(default_config):
    currents = [1e-11, 1e-10, 1e-9, 1e-3]  # 1 mA at 0.1 V is out of reach: NaN, null, a warning
    biases = [0.1, -0.5]
    doc = cli_json("plan", "--current", listing(currents, "A"), "--bias", listing(biases, "V"))
    res = tipgap.plan(default_config, numpy.repeat(currents, 2), numpy.tile(biases, 4))
    assert len(doc["points"]) == len(currents) * len(biases)
    for point in doc["points"]:
        # The CLI lists the setpoints in its own order: find each by its current and bias.
        i = next(i for i in range(8) if res["bias_V"][i] == point["bias_V"] and res["current_A"][i] == point["current_A"])
        assert_same(row(res, i), point, "setpoint %g A at %g V" % (point["current_A"], point["bias_V"]))


def test_plan_matches_cli_with_uncertain_inputs(uncertain_config):
    cfg = tipgap.Config.from_yaml(str(uncertain_config))
    doc = cli_json("plan", "--config", uncertain_config, "--current", "1e-10A", "--bias", "0.3V", "--mc-samples", "30")
    res = tipgap.plan(cfg, 1e-10, 0.3, mc_samples=30)
    assert_same(row({k: [v] for k, v in res.items()}, 0), doc["points"][0], "setpoint")


def write_curve(path, z_nm, current_A, bias_V):
    with open(path, "w") as f:
        f.write("# synthetic, for the test\n# bias: %r V\nz [nm],current [A]\n" % bias_V)
        for z, i in zip(z_nm, current_A):
            f.write("%r,%r\n" % (float(z), float(i)))


@pytest.mark.parametrize("options, flags", [
    ({}, []),
    ({"model": "offset", "confidence": 0.9}, ["--model", "offset", "--confidence", "0.9"]),
    ({"noise_floor_A": 5e-12, "window_nm": 0.1, "calibration_uncertainty": 0.02, "contact_distance_nm": 0.3},
     ["--noise-floor", "5e-12A", "--window", "0.1nm", "--calibration-uncertainty", "0.02", "--contact-distance", "0.3nm"]),
    ({"window_points": 12, "current_noise_A": 1e-12, "saturation_A": 1e-7},
     ["--window", "12", "--current-noise", "1e-12A", "--saturation", "1e-7A"]),
])
def test_fit_matches_cli(tmp_path, options, flags):
    s = tipgap.synth_curve(noise_A=1e-12, seed=11, saturation_A=1.5e-7)
    path = tmp_path / "curve.csv"
    write_curve(path, s["z_nm"], s["current_A"], s["bias_V"])
    doc = cli_json("fit", path, *flags)
    res = tipgap.fit(s["z_nm"], s["current_A"], s["bias_V"], name=str(path), **options)
    assert len(doc["curves"]) == 1
    assert_same(res, doc["curves"][0] | {"profile": columns_of(doc["curves"][0]["profile"])}, "curve")


def test_fit_with_model_comparison_matches_cli(tmp_path, default_config):
    s = tipgap.synth_curve(noise_A=2e-12, seed=5, sweeps="approach_retract")
    path = tmp_path / "pair.csv"
    write_curve(path, s["z_nm"], s["current_A"], s["bias_V"])
    doc = cli_json("fit", path, "--config", "default")
    res = tipgap.fit(s["z_nm"], s["current_A"], s["bias_V"], name=str(path), config=default_config)
    assert isinstance(res, list) and len(res) == len(doc["curves"]) == 2
    for r, c in zip(res, doc["curves"]):
        assert_same(r, c | {"profile": columns_of(c["profile"])}, c["direction"])


def columns_of(rows):
    return {k: [r[k] for r in rows] for k in rows[0]} if rows else {}


def write_grid(path, x_nm, y_nm, z_nm, current_A, bias_V):
    with open(path, "w") as f:
        f.write("# synthetic grid, for the test\n# bias: %r V\nx [nm],y [nm],z [nm],current [A]\n" % bias_V)
        for iy, y in enumerate(y_nm):
            for ix, x in enumerate(x_nm):
                for z, i in zip(z_nm[iy, ix], current_A[iy, ix]):
                    f.write("%r,%r,%r,%r\n" % (float(x), float(y), float(z), float(i)))


def synthetic_grid():
    """A 5 x 4 grid of synthetic curves: a disc of another sample work function, one pixel
    too noisy to fit, one pixel clipped."""
    cfg = tipgap.Config.default()
    ny, nx, nz = 4, 5, 64
    z = numpy.empty((ny, nx, nz))
    current = numpy.empty((ny, nx, nz))
    for iy in range(ny):
        for ix in range(nx):
            inside = (ix - 2) ** 2 + (iy - 1.5) ** 2 < 2
            c = cfg.replace(sample_work_function_eV=4.3) if inside else cfg
            s = tipgap.synth_curve(c, points=nz, noise_A=(1e-8 if (ix, iy) == (4, 3) else 1e-12),
                                   saturation_A=(1e-7 if (ix, iy) == (0, 0) else 0.0), seed=1 + ix + nx * iy)
            z[iy, ix], current[iy, ix] = s["z_nm"], s["current_A"]
    return numpy.array([0.0, 0.5, 1.0, 1.5, 2.0]), numpy.array([10.0, 10.5, 11.0, 11.5]), z, current


def test_map_matches_cli(tmp_path):
    x, y, z, current = synthetic_grid()
    grid = tmp_path / "grid.csv"
    write_grid(grid, x, y, z, current, 0.1)
    out = tmp_path / "map"
    run_cli("map", grid, "--output-dir", out, "--quiet", "--threads", "2")
    res = tipgap.map(z, current, 0.1, x_nm=x, y_nm=y, threads=2)
    for key in ("apparent_barrier_eV", "decay_constant_per_nm", "stderr_apparent_barrier_eV", "quality"):
        cli = numpy.loadtxt(out / (key + ".csv"), delimiter=",", comments="#", ndmin=2)
        assert res[key].shape == cli.shape == (4, 5)
        same = (res[key] == cli) | (numpy.isnan(cli) & numpy.isnan(res[key].astype(float)))
        close = numpy.abs(res[key] - cli) <= SAME_AS_CLI * numpy.abs(cli)
        assert numpy.all(same | close), key
    assert set(res["quality"].ravel()) >= {0, 2}, "the clipped pixel and clean pixels"
    summary = json.loads((out / "summary.json").read_text())
    # Where the grid came from and the run's own figures differ; everything computed is the same.
    for key in ("generator", "grid", "timings", "threads"):
        summary.pop(key), res["summary"].pop(key)
    assert_same(res["summary"], summary, "summary")


def test_map_of_read_grid_matches_cli(tmp_path):
    x, y, z, current = synthetic_grid()
    grid = tmp_path / "grid.csv"
    write_grid(grid, x, y, z, current, 0.1)
    g = tipgap.read_grid(grid)
    assert g["current_A"].shape == (4, 5, 64) and g["bias_V"] == 0.1
    numpy.testing.assert_array_equal(g["current_A"], current)  # amperes, read back exactly
    numpy.testing.assert_allclose(g["z_nm"], z, rtol=SAME_AS_CLI)  # nm -> m -> nm
    res = tipgap.map(g["z_nm"], g["current_A"], g["bias_V"], x_nm=g["x_nm"], y_nm=g["y_nm"])
    out = tmp_path / "map"
    run_cli("map", grid, "--output-dir", out, "--quiet")
    cli = numpy.loadtxt(out / "apparent_barrier_eV.csv", delimiter=",", comments="#")
    numpy.testing.assert_allclose(res["apparent_barrier_eV"], cli, rtol=SAME_AS_CLI)
