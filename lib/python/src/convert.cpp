#include "convert.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace tipgap::python {

py::object column_of_cells(const std::vector<const cell*>& cells);

namespace {

template <class... F>
struct overloaded : F... {
    using F::operator()...;
};

bool is_record_list(const cell::list& l) {
    for (const cell& c : l)
        if (!std::holds_alternative<record>(c.value)) return false;
    return !l.empty();
}

// How a column of cells is stored in Python.
enum class column_kind { floats, integers, booleans, float_rows, objects };

bool number(const cell& c) {
    return std::holds_alternative<double>(c.value) || std::holds_alternative<std::int64_t>(c.value) ||
           std::holds_alternative<std::uint64_t>(c.value);
}

double as_double(const cell& c) {
    return std::visit(overloaded{[](double v) { return v; }, [](std::int64_t v) { return static_cast<double>(v); },
                                 [](std::uint64_t v) { return static_cast<double>(v); },
                                 [](const auto&) { return std::numeric_limits<double>::quiet_NaN(); }},
                      c.value);
}

// The length of a list of numbers, or -1.
long number_list_length(const cell& c) {
    const auto* l = std::get_if<cell::list>(&c.value);
    if (!l) return -1;
    for (const cell& x : *l)
        if (!number(x)) return -1;
    return static_cast<long>(l->size());
}

column_kind kind_of(const std::vector<const cell*>& cells) {
    bool all_int = true, all_bool = true, all_float = true, any_value = false;
    long row_length = -2;
    for (const cell* c : cells) {
        if (!c || std::holds_alternative<std::monostate>(c->value)) {
            all_int = all_bool = false;
            continue;
        }
        any_value = true;
        const bool i = std::holds_alternative<std::int64_t>(c->value) || std::holds_alternative<std::uint64_t>(c->value);
        all_int = all_int && i;
        all_bool = all_bool && std::holds_alternative<bool>(c->value);
        all_float = all_float && (i || std::holds_alternative<double>(c->value));
        const long n = number_list_length(*c);
        row_length = (row_length == -2 || row_length == n) ? n : -1;
    }
    if (!any_value) return column_kind::objects;
    if (all_int) return column_kind::integers;
    if (all_bool) return column_kind::booleans;
    if (all_float) return column_kind::floats;
    if (row_length >= 0) return column_kind::float_rows;
    return column_kind::objects;
}


// The rows' keys in order of first appearance, and each row's cell of each key (nullptr: absent).
py::dict columns_of(const std::vector<const record*>& rows) {
    std::vector<std::string> keys;
    for (const record* r : rows)
        for (std::size_t j = 0; j < r->fields.size(); ++j) {
            const auto& [k, v] = r->fields[j];
            if (v.is_absent() || (j < keys.size() && keys[j] == k)) continue;
            if (std::find(keys.begin(), keys.end(), k) == keys.end()) keys.push_back(k);
        }
    // Rows written from one column declaration hold the same keys in the same place: look there
    // first, and search the row only when it differs (O(keys x rows) instead of O(keys² x rows)).
    auto cell_of = [](const record& r, std::size_t hint, const std::string& k) -> const cell* {
        if (hint < r.fields.size() && r.fields[hint].first == k)
            return r.fields[hint].second.is_absent() ? nullptr : &r.fields[hint].second;
        const cell* found = nullptr;
        for (const auto& [key, v] : r.fields)
            if (key == k && !v.is_absent()) found = &v;
        return found;
    };
    py::dict out;
    std::vector<const cell*> cells(rows.size());
    for (std::size_t j = 0; j < keys.size(); ++j) {
        for (std::size_t i = 0; i < rows.size(); ++i) cells[i] = cell_of(*rows[i], j, keys[j]);
        out[py::str(keys[j])] = column_of_cells(cells);
    }
    return out;
}

}  // namespace

py::object column_of_cells(const std::vector<const cell*>& cells) {
    const std::size_t n = cells.size();
    switch (kind_of(cells)) {
        case column_kind::integers: {
            py::array_t<std::int64_t> a(static_cast<py::ssize_t>(n));
            auto v = a.mutable_unchecked<1>();
            for (std::size_t i = 0; i < n; ++i)
                v(static_cast<py::ssize_t>(i)) = std::visit(
                    overloaded{[](std::int64_t x) { return x; }, [](std::uint64_t x) { return static_cast<std::int64_t>(x); },
                               [](const auto&) { return std::int64_t{0}; }},
                    cells[i]->value);
            return a;
        }
        case column_kind::booleans: {
            py::array_t<bool> a(static_cast<py::ssize_t>(n));
            auto v = a.mutable_unchecked<1>();
            for (std::size_t i = 0; i < n; ++i) v(static_cast<py::ssize_t>(i)) = std::get<bool>(cells[i]->value);
            return a;
        }
        case column_kind::floats: {
            py::array_t<double> a(static_cast<py::ssize_t>(n));
            auto v = a.mutable_unchecked<1>();
            for (std::size_t i = 0; i < n; ++i)
                v(static_cast<py::ssize_t>(i)) = cells[i] ? as_double(*cells[i]) : std::numeric_limits<double>::quiet_NaN();
            return a;
        }
        case column_kind::float_rows: {
            long k = 0;
            for (const cell* c : cells)
                if (c && number_list_length(*c) >= 0) k = number_list_length(*c);
            py::array_t<double> a({static_cast<py::ssize_t>(n), static_cast<py::ssize_t>(k)});
            auto v = a.mutable_unchecked<2>();
            for (std::size_t i = 0; i < n; ++i) {
                const auto* l = cells[i] ? std::get_if<cell::list>(&cells[i]->value) : nullptr;
                for (long j = 0; j < k; ++j)
                    v(static_cast<py::ssize_t>(i), j) = l ? as_double((*l)[static_cast<std::size_t>(j)])
                                                          : std::numeric_limits<double>::quiet_NaN();
            }
            return a;
        }
        case column_kind::objects: break;
    }
    py::list out;
    for (const cell* c : cells) out.append(c ? to_python(*c) : py::none());
    return out;
}

py::object to_python(const cell& c, bool rows_as_columns) {
    return std::visit(
        overloaded{[](std::monostate) -> py::object { return py::none(); },
                   [](absent) -> py::object { return py::none(); },
                   [](double v) -> py::object { return py::float_(v); },
                   [](std::int64_t v) -> py::object { return py::int_(v); },
                   [](std::uint64_t v) -> py::object { return py::int_(v); },
                   [](bool v) -> py::object { return py::bool_(v); },
                   [](const std::string& v) -> py::object { return py::str(v); },
                   [](const std::vector<std::string>& v) -> py::object {
                       py::list l;
                       for (const auto& s : v) l.append(py::str(s));
                       return l;
                   },
                   [&](const cell::list& v) -> py::object {
                       if (rows_as_columns && is_record_list(v)) return to_columns(v);
                       py::list l;
                       for (const cell& x : v) l.append(to_python(x, rows_as_columns));
                       return l;
                   },
                   [&](const record& r) -> py::object { return to_dict(r, rows_as_columns); }},
        c.value);
}

py::dict to_dict(const record& r, bool rows_as_columns) {
    py::dict d;
    for (const auto& [k, v] : r.fields)
        if (!v.is_absent()) d[py::str(k)] = to_python(v, rows_as_columns);
    return d;
}

py::dict to_columns(const std::vector<record>& rows) {
    std::vector<const record*> p;
    for (const record& r : rows) p.push_back(&r);
    return columns_of(p);
}

py::dict empty_columns(const record& r) {
    py::dict out;
    for (const auto& [k, v] : r.fields)
        if (!v.is_absent()) out[py::str(k)] = py::array_t<double>(0);
    return out;
}

py::dict to_columns(const cell::list& rows) {
    std::vector<const record*> p;
    for (const cell& c : rows)
        if (const auto* r = std::get_if<record>(&c.value)) p.push_back(r);
    return columns_of(p);
}

std::vector<double> to_vector(const double_array& a) { return std::vector<double>(a.data(), a.data() + a.size()); }

std::vector<double> scaled_vector(const double_array& a, double factor) {
    std::vector<double> out(static_cast<std::size_t>(a.size()));
    const double* p = a.data();
    for (std::size_t i = 0; i < out.size(); ++i) out[i] = p[i] * factor;
    return out;
}

py::array_t<double> to_array(const std::vector<double>& values, const scaling& s) {
    py::array_t<double> a(static_cast<py::ssize_t>(values.size()));
    double* p = a.mutable_data();
    for (std::size_t i = 0; i < values.size(); ++i) p[i] = s(values[i]);
    return a;
}

}  // namespace tipgap::python
