"""Error mapping: bad input raises tipgap.Error (a ValueError) whose message is the CLI's one-line
message, word for word: the same text for a bad file, and for a bad value the same text naming the
keyword where the CLI names its flag. Nothing brings the interpreter down."""
import pathlib

import numpy
import pytest

import tipgap
from conftest import SOURCE_DIR, cli_error, cli_outcome

BAD = SOURCE_DIR / "tests" / "bad_inputs"


def message_of(call):
    with pytest.raises(tipgap.Error) as info:
        call()
    return info.value


def test_error_is_a_value_error_with_the_cli_fields():
    assert issubclass(tipgap.Error, ValueError)
    e = message_of(lambda: tipgap.predict(tipgap.Config.default(), 0.5, 20.0))
    assert e.kind == "error" and e.exit_code == 3 and e.key == "bias_V" and e.file == "" and e.line == 0
    assert str(e) == "tipgap: error: bias_V: " + e.detail


@pytest.mark.parametrize("path", sorted((BAD / "config").glob("*.yaml")), ids=lambda p: p.name)
def test_config_file_errors_are_the_cli_messages(path):
    rc, line = cli_outcome("predict", "--gap", "0.6nm", "--bias", "0.1V", "--config", path)

    def load_and_predict():
        tipgap.predict(tipgap.Config.from_yaml(str(path)), 0.6, 0.1)
    if rc == 0:  # bad for another command: the module takes it too
        load_and_predict()
        return
    e = message_of(load_and_predict)
    # A config that loads but refuses the operating point names the flag in the CLI, the keyword here.
    assert str(e) == line.replace("--gap", "gap_nm").replace("--bias", "bias_V")
    assert e.exit_code == rc


def test_config_text_errors_name_the_given_name():
    e = message_of(lambda: tipgap.Config.from_text("tip: {material: unobtainium}\nsample: {material: gold}\n", "mine.yaml"))
    assert str(e).startswith("tipgap: error: mine.yaml:1:") and "unobtainium" in str(e)
    assert e.file == "mine.yaml" and e.line == 1 and e.key == "tip.material"


@pytest.mark.parametrize("path", sorted((BAD / "csv").glob("*.csv")), ids=lambda p: p.name)
def test_curve_file_errors_are_the_cli_messages(path):
    rc, line = cli_outcome("fit", path)
    try:
        curve = tipgap.read_curve(path)
    except tipgap.Error as e:
        assert str(e) == line and e.exit_code == rc
        return
    if rc == 0:  # bad for another command: the module fits it too
        tipgap.fit(curve["z_nm"], curve["current_A"], curve["bias_V"], name=str(path))
        return
    # The file reads, and the fit refuses it: the same message when the module fits its arrays.
    if len(curve["sweeps"]) > 1 or "direction" in line:
        pytest.skip("sweeps from a direction column: tipgap.fit splits arrays at turns instead")
    e = message_of(lambda: tipgap.fit(curve["z_nm"], curve["current_A"], curve["bias_V"], name=str(path)))
    assert str(e) == line


@pytest.mark.parametrize("path", sorted((BAD / "grid").glob("*.csv")), ids=lambda p: p.name)
def test_grid_file_errors_are_the_cli_messages(path, tmp_path):
    line, rc = cli_error("map", path, "--output-dir", tmp_path / "out", "--quiet")
    e = message_of(lambda: tipgap.read_grid(path))
    assert str(e) == line and e.exit_code == rc


@pytest.mark.parametrize("call, cli", [
    (lambda c: tipgap.predict(c, -1, 0.1), ["predict", "--gap", "-1nm", "--bias", "0.1V"]),
    (lambda c: tipgap.predict(c, 150, 0.1), ["predict", "--gap", "150nm", "--bias", "0.1V"]),
    (lambda c: tipgap.predict(c, 0.6, 11), ["predict", "--gap", "0.6nm", "--bias", "11V"]),
    (lambda c: tipgap.plan(c, 1e-10, 0.0), ["plan", "--current", "1e-10A", "--bias", "0V"]),
    (lambda c: tipgap.plan(c, 0.0, 0.1), ["plan", "--current", "0A", "--bias", "0.1V"]),
])
def test_operating_point_errors_name_the_keyword(default_config, call, cli):
    line, rc = cli_error(*cli)
    e = message_of(lambda: call(default_config))
    assert str(e) == line.replace("--gap", "gap_nm").replace("--bias", "bias_V").replace("--current", "current_A")
    assert e.exit_code == rc


def test_unreachable_setpoint_is_the_cli_no_answer(default_config):
    line, rc = cli_error("plan", "--current", "1A", "--bias", "0.1V")
    e = message_of(lambda: tipgap.plan(default_config, 1.0, 0.1))
    assert str(e) == line and line.startswith("tipgap: no answer: ")
    assert e.exit_code == rc == 4 and e.kind == "no answer"


CURVE = tipgap.synth_curve(noise_A=1e-12)


@pytest.mark.parametrize("keywords, flags, keyword", [
    ({"confidence": 1.5}, ["--confidence", "1.5"], "confidence"),
    ({"noise_floor_A": -1e-12}, ["--noise-floor", "-1e-12A"], "noise_floor_A"),
    ({"calibration_uncertainty": 0.7}, ["--calibration-uncertainty", "0.7"], "calibration_uncertainty"),
    ({"window_points": 2}, ["--window", "2"], "window_points"),
    ({"model": "cubic"}, ["--model", "cubic"], "model"),
    ({"contact_distance_nm": -0.1}, ["--contact-distance", "-0.1nm"], "contact_distance_nm"),
    ({"noise_floor_A": 1e-9, "saturation_A": 1e-10}, ["--noise-floor", "1e-9A", "--saturation", "1e-10A"], "saturation_A"),
])
def test_fit_option_errors_say_what_the_cli_says(tmp_path, keywords, flags, keyword):
    path = tmp_path / "c.csv"
    path.write_text("z [nm],current [A]\n0,1e-9\n0.1,1e-10\n0.2,1e-11\n0.3,1e-12\n")
    line, rc = cli_error("fit", path, *flags)
    e = message_of(lambda: tipgap.fit(CURVE["z_nm"], CURVE["current_A"], **keywords))
    # The CLI names the flag (a usage error); the module names the keyword, with the same words.
    prefix = "tipgap: usage error: "
    assert line.startswith(prefix) and rc == 2
    flag, cli_detail = line[len(prefix):].split(": ", 1)
    assert e.detail == cli_detail and e.key == keyword
    assert str(e) == "tipgap: error: %s: %s" % (keyword, cli_detail)


def test_too_few_points_and_bad_arrays():
    assert str(message_of(lambda: tipgap.fit([0, 0.1], [1e-9, 1e-10]))) == \
        "tipgap: error: z_nm: 2 points; a curve needs at least 3 points"
    assert str(message_of(lambda: tipgap.fit([0, 0.1, numpy.nan], [1e-9, 1e-10, 1e-11]))) == \
        "tipgap: error: z_nm: value 2 is not finite; expected finite values"
    assert message_of(lambda: tipgap.fit([0, 0.1, 0.2], [1e-9, 1e-10])).key == "current_A"
    assert message_of(lambda: tipgap.map(CURVE["z_nm"], CURVE["current_A"])).key == "current_A"
    e = message_of(lambda: tipgap.map(CURVE["z_nm"], numpy.tile(CURVE["current_A"], (2, 2, 1)), x_nm=[1, 0]))
    assert str(e) == ("tipgap: error: x_nm: positions 0 and 1 are not strictly ascending; expected distinct "
                      "positions in ascending order")
    assert message_of(lambda: tipgap.predict(tipgap.Config.default(), [0.5, 0.6, 0.7], [0.1, 0.2])).key == "gap_nm"


def test_config_replace_errors():
    cfg = tipgap.Config.default()
    e = message_of(lambda: cfg.replace(temperature_K=-3))
    assert str(e) == "tipgap: error: temperature_K: -3 K is out of range; expected a temperature in [0, 2000] K"
    e = message_of(lambda: cfg.replace(sample_work_function_eV=25))
    assert e.key == "sample_work_function_eV" and e.detail == "25 eV is out of range; expected a work function in (0, 20] eV"
    line, _ = cli_error("synth", "--out", "/nonexistent/x.csv", "--tip-material", "unobtainium")
    e = message_of(lambda: cfg.replace(tip_material="unobtainium"))
    assert e.detail == line.split("--tip: ", 1)[1]
    with pytest.raises(TypeError, match="unexpected keyword argument 'temperature'"):
        cfg.replace(temperature=300)
    # Since issue 12 `exact` is a method; an unknown one gets the configuration file's wording.
    assert cfg.replace(method="exact").to_dict()["method"] == "exact"
    e = message_of(lambda: cfg.replace(method="airy"))
    assert e.key == "method" and e.detail == "'airy' is not a method; expected wkb, simmons or exact"


@pytest.mark.parametrize("call", [
    lambda c: tipgap.predict(c, numpy.nan, 0.1),
    lambda c: tipgap.predict(c, numpy.inf, 0.1),
    lambda c: tipgap.predict(c, 0.5, -numpy.inf),
    lambda c: tipgap.predict(c, "half a nanometre", 0.1),
    lambda c: tipgap.predict(c, 0.5, 0.1, mc_samples=-1),
    lambda c: tipgap.predict(c, 0.5, 0.1, threads=-2),
    lambda c: tipgap.plan(c, numpy.nan, 0.1),
    lambda c: tipgap.fit([], []),
    lambda c: tipgap.fit(numpy.zeros((3, 3)), numpy.zeros((3, 3))),
    lambda c: tipgap.fit([0, 1, 2], [0, 0, 0]),
    lambda c: tipgap.fit([0, 1, 2, 3], [1e-9, 1e-10, 1e-11, 1e-12], window_points=4, window_nm=0.1),
    lambda c: tipgap.map([0, 1], numpy.zeros((0, 2, 2))),
    lambda c: tipgap.map([0, 1], numpy.ones((1, 1, 2)), x_nm=[numpy.nan]),
    lambda c: tipgap.read_curve("/nonexistent/curve.csv"),
    lambda c: tipgap.read_curve(BAD / "csv" / "empty.csv", turn_fraction=2),
    lambda c: tipgap.read_grid("/nonexistent/grid.csv"),
    lambda c: tipgap.synth_curve(c, points=3),
    lambda c: tipgap.synth_curve(c, gap_nm=(1.0, 0.5)),
    lambda c: tipgap.synth_curve(c, gap_nm=(1.0,)),
    lambda c: tipgap.synth_curve(c, sweeps="sideways"),
    lambda c: tipgap.Config.from_yaml("/nonexistent.yaml"),
    lambda c: tipgap.Config.from_text("\x00\x01 binary"),
])
def test_bad_calls_raise_and_do_not_crash(default_config, call):
    with pytest.raises((tipgap.Error, TypeError)):
        call(default_config)
