"""The type stub (__init__.pyi) describes the package as it is: every public function with the
same parameters, defaults and keyword-only markers, and Config.replace with every keyword the
module accepts."""
import ast
import inspect
import pathlib

import tipgap
from tipgap import _tipgap

STUB = pathlib.Path(tipgap.__file__).with_name("__init__.pyi")


def stub_functions():
    tree = ast.parse(STUB.read_text())
    out = {}
    for node in tree.body:
        if isinstance(node, ast.FunctionDef):
            out[node.name] = node
        if isinstance(node, ast.ClassDef):
            for item in node.body:
                if isinstance(item, ast.FunctionDef):
                    out["%s.%s" % (node.name, item.name)] = item
    return out


def parameters(node):
    a = node.args
    positional = [x.arg for x in a.args]
    defaults = [None] * (len(a.args) - len(a.defaults)) + [ast.literal_eval(d) for d in a.defaults]
    keyword = [x.arg for x in a.kwonlyargs]
    kw_defaults = [None if d is None else ast.literal_eval(d) for d in a.kw_defaults]
    return list(zip(positional, defaults)), list(zip(keyword, kw_defaults))


def test_stub_lists_every_public_function_with_its_signature():
    stub = stub_functions()
    for name in ("predict", "plan", "fit", "map", "read_curve", "read_grid", "synth_curve"):
        assert name in stub, name
        positional, keyword = parameters(stub[name])
        sig = inspect.signature(getattr(tipgap, name))
        real_positional = [(p.name, None if p.default is inspect.Parameter.empty else p.default)
                           for p in sig.parameters.values() if p.kind == p.POSITIONAL_OR_KEYWORD]
        real_keyword = [(p.name, p.default) for p in sig.parameters.values() if p.kind == p.KEYWORD_ONLY]
        assert positional == real_positional, name
        assert keyword == real_keyword, name


def test_stub_lists_every_replace_keyword():
    node = stub_functions()["Config.replace"]
    assert [x.arg for x in node.args.kwonlyargs] == _tipgap._config_keywords()


def test_public_names():
    assert set(tipgap.__all__) <= set(dir(tipgap))
    for name in ("Config.default", "Config.from_yaml", "Config.from_text", "Config.to_dict"):
        assert name in stub_functions(), name
