"""tipgap.Config: the built-in config, loading, replace() and to_dict() (the CLI's `config` block)."""
import copy

import pytest

import tipgap
from conftest import SOURCE_DIR, assert_same, cli_json


def test_to_dict_is_the_cli_config_block(default_config):
    doc = cli_json("predict", "--gap", "1nm", "--bias", "0.1V")
    assert_same(default_config.to_dict(), doc["config"], "config", rel=0)


def test_from_yaml_is_the_cli_config_block():
    path = SOURCE_DIR / "configs" / "default.yaml"
    cfg = tipgap.Config.from_yaml(str(path))
    doc = cli_json("predict", "--gap", "1nm", "--bias", "0.1V", "--config", path)
    assert_same(cfg.to_dict(), doc["config"], "config", rel=0)
    assert cfg.source == str(path)


def test_from_text_equals_from_yaml(tmp_path):
    text = "tip: {material: platinum}\nsample: {work_function: 4.6 eV}\ntemperature: 300 K\n"
    (tmp_path / "c.yaml").write_text(text)
    a = tipgap.Config.from_text(text).to_dict()
    b = tipgap.Config.from_yaml(str(tmp_path / "c.yaml")).to_dict()
    assert a.pop("source") == "<text>" and b.pop("source") == str(tmp_path / "c.yaml")
    assert a == b


def test_replace_returns_a_modified_copy(default_config):
    warm = default_config.replace(temperature_K=300, sample_work_function_eV=4.7, geometry="paraboloid",
                                  apex_radius_nm=20, tip_work_function_stddev_eV=0.1)
    d = warm.to_dict()
    assert d["temperature_K"] == 300 and d["sample"]["work_function_eV"] == 4.7
    assert d["geometry"] == {"kind": "paraboloid", "apex_radius_nm": 20.0}
    assert d["tip"]["work_function_stddev_eV"] == pytest.approx(0.1, rel=1e-15)
    assert default_config.to_dict()["temperature_K"] == 4.2, "the original is unchanged"


def test_replace_equals_the_same_yaml(default_config):
    # The same junction written as YAML and as replace(): the same predictions, to the last bit.
    text = ("tip: {material: tungsten, work_function: 4.4 eV, fermi_energy: 9.0 eV}\n"
            "sample: {material: gold, work_function: 5.1 eV, fermi_energy: 5.5 eV}\n"
            "barrier: {image_potential: approximate}\ntemperature: 77 K\nmethod: simmons\n"
            "geometry: {kind: planar, area: 2 nm^2}\n")
    a = tipgap.predict(tipgap.Config.from_text(text), [0.5, 0.9], 0.3)
    b = tipgap.predict(default_config.replace(tip_work_function_eV=4.4, sample_work_function_eV=5.1,
                                              image_potential="approximate", temperature_K=77, method="simmons",
                                              area_nm2=2), [0.5, 0.9], 0.3)
    assert (a["current_A"] == b["current_A"]).all() and (a["apparent_barrier_eV"] == b["apparent_barrier_eV"]).all()


def test_material_keywords(default_config):
    d = default_config.replace(tip_material="platinum").to_dict()
    assert d["tip"]["material"] == "platinum" and d["tip"]["work_function_eV"] != 4.5


def test_copies_and_repr(default_config):
    assert copy.copy(default_config).to_dict() == copy.deepcopy(default_config).to_dict() == default_config.to_dict()
    assert repr(default_config).startswith("tipgap.Config(<default>: tip tungsten 4.55 eV, sample gold 5.31 eV")


def test_help_shows_units_and_ranges():
    for f, words in [(tipgap.predict, ["gap_nm", "(nm)", "(0, 100]", "bias_V", "(V)"]),
                     (tipgap.plan, ["current_A", "(A)", "[0.1, 5] nm"]),
                     (tipgap.fit, ["noise_floor_A", "[0, 0.5)", "(0, 1)"]),
                     (tipgap.map, ["(ny, nx, nz)", "quality"]),
                     (tipgap.Config.replace, ["temperature_K", "[0, 2000] K", "(0, 20] eV"])]:
        for w in words:
            assert w in f.__doc__, (f.__name__, w)
