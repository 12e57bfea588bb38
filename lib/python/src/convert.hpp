#pragma once
// Library values to Python objects, and NumPy arrays to library inputs. A record (one row of
// declared columns, tipgap/io/columns.hpp) becomes a dict with its keys; many records become one
// dict of columns, numbers as NumPy arrays, so that keys and numbers are the CLI's JSON ones by
// construction.
#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <string>
#include <vector>

#include "tipgap/io/columns.hpp"

namespace tipgap::python {

namespace py = pybind11;

// A C-contiguous float64 array (Python converts and broadcasts before the call).
using double_array = py::array_t<double, py::array::c_style | py::array::forcecast>;

// null -> None; absent -> None (records leave absent fields out); numbers -> float/int/bool;
// text -> str; a list of texts -> list[str]; a list -> list; a record -> dict (rows_as_columns:
// a list of records inside it becomes a dict of columns, see to_columns).
py::object to_python(const cell& c, bool rows_as_columns = false);
py::dict to_dict(const record& r, bool rows_as_columns = false);

// Records as columns, one per key in order of first appearance. Numbers -> a 1-D NumPy array
// (float64, int64 or bool; NaN where a row has no value), equal-length lists of numbers -> a 2-D
// float64 array (one row per record), anything else -> a list (None where a row has no value).
py::dict to_columns(const std::vector<record>& rows);
// The keys of `r` with empty columns: what to_columns gives for no rows of that kind.
py::dict empty_columns(const record& r);
// The same for a list cell of records (JSON rows such as a fit's "profile").
py::dict to_columns(const cell::list& rows);

// One column of cells (nullptr: no value) as to_columns converts it.
py::object column_of_cells(const std::vector<const cell*>& cells);

// rows (non-empty) as columns straight from their declaration, without building records: the same
// dict as to_columns(to_records(columns, rows)) when every row has the same keys.
template <class T>
py::dict declared_columns(const std::vector<column<T>>& columns, const std::vector<T>& rows) {
    py::dict out;
    std::vector<cell> values(rows.size());
    std::vector<const cell*> cells(rows.size());
    for (const column<T>& c : columns) {
        if (!(c.shown & in_json)) continue;
        bool any = false;
        for (std::size_t i = 0; i < rows.size(); ++i) {
            values[i] = scaled(c.get(rows[i]), c.scale);
            cells[i] = values[i].is_absent() ? nullptr : &values[i];
            any = any || cells[i];
        }
        if (any) out[py::str(c.key)] = column_of_cells(cells);
    }
    return out;
}

// The values of an array, copied (the GIL is released only after all inputs are copied).
std::vector<double> to_vector(const double_array& a);
// values * factor, element by element, as the CLI's unit parser converts ("0.6 nm" -> 0.6 * 1e-9).
std::vector<double> scaled_vector(const double_array& a, double factor);

// A 1-D float64 array of `values` (scaled by `s`).
py::array_t<double> to_array(const std::vector<double>& values, const scaling& s = {});

}  // namespace tipgap::python
