"""Thread safety: two Python threads calling the module at once get the results of one thread
alone (the GIL is released during the computation, so the calls really overlap)."""
import threading
import time

import numpy

import tipgap


def run_in_threads(functions):
    results = [None] * len(functions)
    errors = []

    def work(i):
        try:
            results[i] = functions[i]()
        except BaseException as e:  # noqa: B902 - reported below
            errors.append(e)

    threads = [threading.Thread(target=work, args=(i,)) for i in range(len(functions))]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert not errors, errors
    return results


def test_two_threads_predict_identical_results(default_config):
    gaps = numpy.linspace(0.3, 1.5, 400)
    alone = tipgap.predict(default_config, gaps, 0.2, threads=1)
    a, b = run_in_threads([lambda: tipgap.predict(default_config, gaps, 0.2, threads=1)] * 2)
    for r in (a, b):
        for key in ("current_A", "apparent_barrier_eV", "decay_constant_per_nm", "barrier_top_eV"):
            numpy.testing.assert_array_equal(r[key], alone[key])
        assert r["warnings"] == alone["warnings"]


def test_two_threads_different_work(default_config):
    warm = default_config.replace(temperature_K=300)
    gaps = numpy.linspace(0.4, 1.0, 200)
    expected = [tipgap.predict(default_config, gaps, 0.1, threads=1), tipgap.plan(warm, 1e-10, numpy.linspace(0.1, 1, 30))]
    got = run_in_threads([lambda: tipgap.predict(default_config, gaps, 0.1, threads=1),
                          lambda: tipgap.plan(warm, 1e-10, numpy.linspace(0.1, 1, 30), threads=1)])
    numpy.testing.assert_array_equal(got[0]["current_A"], expected[0]["current_A"])
    numpy.testing.assert_array_equal(got[1]["gap_nm"], expected[1]["gap_nm"])


def test_errors_in_threads_are_errors(default_config):
    def bad():
        try:
            tipgap.predict(default_config, -1.0, 0.1)
        except tipgap.Error as e:
            return str(e)
    a, b = run_in_threads([bad, bad])
    assert a == b == "tipgap: error: gap_nm: gap -1 nm is not positive; expected a gap in (0, 100] nm"


def test_gil_is_released_during_the_computation(default_config):
    """While one thread is inside predict, another runs Python code: the interpreter is not locked.
    (Not a timing test: it checks that the main thread ran at all in the middle of the call, which
    it cannot while the GIL is held.)"""
    gaps = numpy.linspace(0.3, 1.5, 1500)
    window = {}

    def work():
        window["start"] = time.perf_counter()
        tipgap.predict(default_config, gaps, 0.2, threads=1)
        window["end"] = time.perf_counter()

    t = threading.Thread(target=work)
    ticks = []
    t.start()
    while t.is_alive():
        ticks.append(time.perf_counter())
    t.join()
    start, end = window["start"], window["end"]
    middle = [x for x in ticks if start + 0.25 * (end - start) < x < start + 0.75 * (end - start)]
    assert middle, "the main thread did not run during the middle half of the call (%d ticks in all)" % len(ticks)
