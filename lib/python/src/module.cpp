// _tipgap: the compiled part of the tipgap package. Turns tipgap::error into tipgap.Error (a
// ValueError) with the CLI's one-line message, and registers the bindings.
#include <pybind11/pybind11.h>

#include "bindings.hpp"
#include "tipgap/core/error_line.hpp"

namespace py = pybind11;

namespace {

// The exception type, created once at import and kept for the life of the interpreter.
PyObject* error_type = nullptr;

void raise_error(const tipgap::error& e) {
    py::object type = py::reinterpret_borrow<py::object>(error_type);
    py::object exc = type(py::str(tipgap::error_line(e)));
    const tipgap::location& w = e.where();
    exc.attr("kind") = tipgap::error_label(e.kind());
    exc.attr("exit_code") = static_cast<int>(e.kind());
    exc.attr("detail") = e.detail();
    exc.attr("key") = w.key;
    exc.attr("file") = w.file;
    exc.attr("line") = w.line;
    exc.attr("column") = w.column;
    PyErr_SetObject(error_type, exc.ptr());
}

}  // namespace

PYBIND11_MODULE(_tipgap, m) {
    m.doc() = "tipgap's compiled core; use the tipgap package";
    error_type = PyErr_NewExceptionWithDoc(
        "tipgap.Error",
        "Bad input: the message is the tipgap CLI's one-line message, e.g. 'tipgap: error: gap_nm: ...'.\n"
        "Attributes: kind ('error', 'usage error' or 'no answer'), exit_code (the CLI's: 3, 2 or 4),\n"
        "detail (the message without its location), key, file, line, column (where; empty or 0 when unknown).",
        PyExc_ValueError, nullptr);
    if (!error_type) throw py::error_already_set();
    m.attr("Error") = py::reinterpret_borrow<py::object>(error_type);
    py::register_exception_translator([](std::exception_ptr p) {
        try {
            if (p) std::rethrow_exception(p);
        } catch (const tipgap::error& e) {
            raise_error(e);
        }
    });
    m.attr("__version__") = TIPGAP_VERSION;
    tipgap::python::bind_config(m);
    tipgap::python::bind_plan(m);
    tipgap::python::bind_fit(m);
    tipgap::python::bind_map(m);
    tipgap::python::bind_synth(m);
}
