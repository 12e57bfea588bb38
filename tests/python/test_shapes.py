"""Shapes and broadcasting: arrays broadcast like NumPy, scalars give scalars, every key has the
broadcast shape, and a broadcast call gives the numbers of the point-by-point calls."""
import numpy
import pytest

import tipgap


def test_scalars_give_scalars(default_config):
    r = tipgap.predict(default_config, 0.6, 0.1)
    assert isinstance(r["current_A"], numpy.float64)
    assert isinstance(r["regime"], str)
    assert isinstance(r["warnings"], list)
    p = tipgap.plan(default_config, 1e-10, 0.5)
    assert isinstance(p["gap_nm"], numpy.float64) and isinstance(p["evaluations"], numpy.int64)
    assert isinstance(p["status"], str)


@pytest.mark.parametrize("gap_shape, bias_shape, shape", [
    ((3,), (), (3,)),
    ((), (2,), (2,)),
    ((3, 1), (2,), (3, 2)),
    ((2, 1, 3), (1, 4, 1), (2, 4, 3)),
])
def test_predict_broadcasts(default_config, gap_shape, bias_shape, shape):
    gaps = numpy.linspace(0.4, 1.2, int(numpy.prod(gap_shape))).reshape(gap_shape)
    biases = numpy.linspace(-0.3, 0.5, int(numpy.prod(bias_shape))).reshape(bias_shape)
    r = tipgap.predict(default_config, gaps, biases, threads=1)
    for key, value in r.items():
        if key == "warnings":
            assert numpy.shape(numpy.empty(shape, dtype=object)) == shape and len(value) == shape[0]
        else:
            assert numpy.shape(value) == shape, key
    g, b = numpy.broadcast_arrays(gaps, biases)
    # Point by point: the same doubles (each point is computed on its own).
    for idx in numpy.ndindex(shape):
        one = tipgap.predict(default_config, g[idx], b[idx], threads=1)
        assert r["current_A"][idx] == one["current_A"]
        assert r["apparent_barrier_eV"][idx] == one["apparent_barrier_eV"]
        assert r["regime"][idx] == one["regime"]
    # gap_nm comes back as (gap_nm * 1e-9) * 1e9, as in the CLI's JSON: equal to the last bit or two.
    numpy.testing.assert_allclose(r["gap_nm"], g, rtol=1e-15)


def test_warnings_are_nested_lists(default_config):
    # 0.2 nm is inside the point-contact distance: the model warns there.
    r = tipgap.predict(default_config, [[0.2, 1.0]], 0.1)
    assert isinstance(r["warnings"], list) and isinstance(r["warnings"][0], list)
    assert len(r["warnings"][0][0]) >= 1 and all(isinstance(w, str) for w in r["warnings"][0][0])
    assert r["warnings"][0][1] == []


def test_plan_broadcasts_and_keeps_unreachable_points(default_config):
    p = tipgap.plan(default_config, [[1e-10], [1e-3]], [0.1, 0.5])
    assert p["gap_nm"].shape == (2, 2)
    assert numpy.all(numpy.isfinite(p["gap_nm"][0])) and numpy.all(numpy.isnan(p["gap_nm"][1]))
    assert list(p["regime"][1]) == [None, None] and list(p["regime"][0]) == ["direct_tunnelling"] * 2
    assert all(s == "current_too_high" for s in p["status"][1])


def test_empty_arrays_give_empty_columns(default_config):
    r = tipgap.predict(default_config, numpy.zeros((0, 3)), 0.1)
    assert r["current_A"].shape == (0, 3) and "apparent_barrier_eV" in r
    p = tipgap.plan(default_config, [], 0.1)
    assert p["gap_nm"].shape == (0,)


def test_lists_and_integers_are_accepted(default_config):
    r = tipgap.predict(default_config, [1, 2], [1, 1])
    assert r["gap_nm"].tolist() == [1.0, 2.0]


def test_map_shapes_and_shared_z():
    s = tipgap.synth_curve(points=40, noise_A=1e-12)
    current = numpy.tile(s["current_A"], (2, 3, 1))
    shared = tipgap.map(s["z_nm"], current, 0.1, threads=1)
    full = tipgap.map(numpy.tile(s["z_nm"], (2, 3, 1)), current, 0.1, threads=1)
    for key in ("apparent_barrier_eV", "decay_constant_per_nm", "stderr_apparent_barrier_eV",
                "stderr_decay_constant_per_nm", "r_squared", "quality", "points_used"):
        assert shared[key].shape == (2, 3), key
        numpy.testing.assert_array_equal(shared[key], full[key])
    assert shared["quality"].dtype == numpy.uint8
    numpy.testing.assert_array_equal(shared["x_nm"], [0, 1, 2])
    numpy.testing.assert_array_equal(shared["y_nm"], [0, 1])
    # Every pixel holds the same curve: one fit, the same everywhere, and that of tipgap.fit.
    one = tipgap.fit(s["z_nm"], s["current_A"], 0.1, model="linear", window_points=8)  # map's default model
    assert numpy.all(shared["apparent_barrier_eV"] == shared["apparent_barrier_eV"][0, 0])
    assert abs(shared["apparent_barrier_eV"][0, 0] - one["apparent_barrier_eV"]) <= 1e-12 * one["apparent_barrier_eV"]


def test_map_results_do_not_depend_on_threads():
    s = tipgap.synth_curve(points=40, noise_A=3e-12)
    current = numpy.stack([[tipgap.synth_curve(points=40, noise_A=3e-12, seed=k + 10 * j)["current_A"]
                            for k in range(4)] for j in range(3)])
    a = tipgap.map(s["z_nm"], current, 0.1, threads=1)
    b = tipgap.map(s["z_nm"], current, 0.1, threads=3)
    numpy.testing.assert_array_equal(a["apparent_barrier_eV"], b["apparent_barrier_eV"])
    numpy.testing.assert_array_equal(a["quality"], b["quality"])


def test_fit_profile_is_columns():
    s = tipgap.synth_curve(noise_A=1e-12)
    f = tipgap.fit(s["z_nm"], s["current_A"], s["bias_V"])
    prof = f["profile"]
    n = len(prof["z_nm"])
    assert n > 0 and all(len(v) == n for v in prof.values())
    assert isinstance(prof["apparent_barrier_eV"], numpy.ndarray) and prof["points"].dtype == numpy.int64


def test_synth_curve_arrays():
    s = tipgap.synth_curve(points=50, sweeps="approach_retract")
    assert s["z_nm"].shape == s["current_A"].shape == s["true_gap_nm"].shape == (100,)
    assert s["direction"][:50] == ["approach"] * 50 and s["direction"][50:] == ["retract"] * 50
    assert s["in_contact"].dtype == bool and not s["in_contact"].any()
    assert [w["direction"] for w in s["truth"]["sweeps"]] == ["approach", "retract"]
