// Streaming reader of a grid held in one long CSV file.
//
// The calling thread reads the file in chunks that end at a line end (read(2) into a few
// recycled buffers, so that the resident memory stays at a few chunks whatever the file size),
// counts their lines and queues them. Workers parse a chunk, visit every pixel that lies wholly
// inside it and return the chunk's first and last pixel, which may continue in the neighbouring
// chunks; the calling thread joins those in chunk order and visits them. Errors are rethrown in
// chunk order, so the message is that of the first bad line in the file whatever the thread count.
#include <algorithm>
#include <cerrno>
#include <cmath>
#include <condition_variable>
#include <cstring>
#include <deque>
#include <exception>
#include <fcntl.h>
#include <fmt/format.h>
#include <limits>
#include <map>
#include <memory>
#include <mutex>
#include <sys/stat.h>
#include <thread>
#include <unistd.h>
#if defined(__SSE2__)
#include <emmintrin.h>
#endif

#include "io/detail/csv_header.hpp"
#include "io/detail/csv_scan.hpp"
#include "grid/detail/grid_internal.hpp"
#include "tipgap/core/units.hpp"

namespace tipgap::detail {
namespace {

constexpr const char* grid_header_example = "'x [nm],y [nm],z [nm],current [pA]'";
constexpr std::size_t min_chunk_bytes = 4096;

enum class role : unsigned char { x, y, z, current, ignored };

struct csv_columns {
    std::vector<role> roles;
    std::vector<std::string> names;
    double x_factor = 1.0, y_factor = 1.0, z_factor = 1.0, current_factor = 1.0;
    int header_line = 0;
};

// Number of '\n' bytes. With SSE2 (every x86-64): compare 16 bytes at a time, subtract the
// 0/-1 masks into byte counters and fold them with a sum of absolute differences every 255 rounds.
// Elsewhere a plain loop, which compilers vectorise on their own.
std::int64_t count_newlines(const char* p, std::size_t n) {
    std::int64_t count = 0;
    std::size_t i = 0;
#if defined(__SSE2__)
    const __m128i lf = _mm_set1_epi8('\n');
    while (i + 16 <= n) {
        __m128i acc = _mm_setzero_si128();
        for (int k = 0; k < 255 && i + 16 <= n; ++k, i += 16) {
            const __m128i v = _mm_loadu_si128(reinterpret_cast<const __m128i*>(p + i));
            acc = _mm_sub_epi8(acc, _mm_cmpeq_epi8(v, lf));
        }
        const __m128i sums = _mm_sad_epu8(acc, _mm_setzero_si128());
        count += _mm_cvtsi128_si64(sums) + _mm_cvtsi128_si64(_mm_unpackhi_epi64(sums, sums));
    }
#endif
    for (; i < n; ++i) count += p[i] == '\n';
    return count;
}

// Equal texts; the cells compared are a few bytes long, where a library memcmp call costs more
// than the comparison.
inline bool same_text(std::string_view a, std::string_view b) {
    if (a.size() != b.size()) return false;
    if (a.data() == b.data()) return true;
    for (std::size_t i = 0; i < a.size(); ++i) {
        if (a[i] != b[i]) return false;
    }
    return true;
}

location at(const std::string& file, std::int64_t line, std::ptrdiff_t column) {
    return location{file, line > std::numeric_limits<int>::max() ? 0 : static_cast<int>(line),
                    static_cast<int>(column), ""};
}

[[noreturn]] void throw_cell(const std::string& file, std::int64_t line, std::ptrdiff_t column,
                             const std::string& column_name, std::string_view cell) {
    double v = 0.0;
    const location where = at(file, line, column);
    switch (parse_double(cell, v)) {
        case number_status::empty:
            throw_input(where, fmt::format("empty cell in column '{}'; expected a number", column_name));
        case number_status::not_finite:
            throw_input(where, fmt::format("{} in column '{}' is not a finite number; expected a finite value", quote_input(cell), column_name));
        case number_status::out_of_range:
            throw_input(where, fmt::format("{} in column '{}' is outside the range of a double; expected a magnitude of 0 or "
                                    "between about 1e-308 and 1e308",
                                    quote_input(cell), column_name));
        default:
            throw_input(where, fmt::format("{} in column '{}' is not a number; expected a plain number such as 0.25 (the unit "
                                           "goes in the header)",
                                           quote_input(cell), column_name));
    }
}

csv_columns parse_header(std::string_view line, int header_line, const std::string& file) {
    csv_columns cols;
    cols.header_line = header_line;
    cell_cursor cells(line);
    std::string_view cell;
    int column = 0;
    bool first = true;
    bool seen[4] = {false, false, false, false};
    while (cells.next(cell, column)) {
        const location where{file, header_line, column, ""};
        double probe = 0.0;
        if (first && parse_double(cell, probe) == number_status::ok) {
            throw_input(where, fmt::format("no header row: the first row holds numbers; expected a header such as {} "
                                           "before the data",
                                           grid_header_example));
        }
        first = false;
        std::string_view name, unit;
        bool brackets = false;
        split_header_cell(cell, name, unit, brackets);
        role r = role::ignored;
        if (iequals(name, "x")) r = role::x;
        else if (iequals(name, "y")) r = role::y;
        else if (iequals(name, "z")) r = role::z;
        else if (iequals(name, "current")) r = role::current;
        if (r != role::ignored) {
            const int k = static_cast<int>(r);
            static const char* const examples[] = {"x [nm]", "y [nm]", "z [nm]", "current [pA]"};
            if (!brackets || unit.empty())
                throw_input(where, fmt::format("column '{}' has no unit; write it in brackets, e.g. '{}'", name, examples[k]));
            if (seen[k]) throw_input(where, fmt::format("column '{}' appears twice in the header", name));
            seen[k] = true;
            const double f = unit_factor(unit, r == role::current ? dimension::current : dimension::length, cell, where);
            (r == role::x ? cols.x_factor : r == role::y ? cols.y_factor : r == role::z ? cols.z_factor : cols.current_factor) = f;
        }
        cols.roles.push_back(r);
        cols.names.emplace_back(name);
    }
    static const char* const missing[] = {"x [<length unit>]", "y [<length unit>]", "z [<length unit>]",
                                          "current [<current unit>]"};
    for (int k = 0; k < 4; ++k) {
        if (!seen[k]) {
            throw_input(location{file, header_line, 1, ""},
                        fmt::format("the header has no '{}' column; expected a header such as {}", missing[k],
                                    grid_header_example));
        }
    }
    return cols;
}

// A pixel cut by a chunk boundary (or the chunk's first/last pixel, which may be).
struct edge_run {
    bool valid = false;
    double x_m = 0.0, y_m = 0.0;
    std::int64_t line = 0;
    std::vector<double> z_m, current_A;
};

struct chunk_result {
    edge_run head;                 // the chunk's first pixel (valid when the chunk has rows)
    edge_run tail;                 // its last pixel when it differs from the first
    std::vector<pixel_run> runs;   // pixels wholly inside (already visited), in file order
    std::uint64_t samples = 0;
    std::exception_ptr failure;
};

struct chunk_job {
    std::size_t index = 0;
    std::unique_ptr<char[]> buffer;
    std::size_t begin = 0, end = 0;  // bytes of the buffer that hold whole lines
    std::int64_t first_line = 0;
};

// Per-worker scratch for the pixel being parsed.
struct run_buffer {
    std::vector<double> z, current;
};

class chunk_parser {
public:
    chunk_parser(const csv_columns& cols, const std::string& file, double bias_V, const grid_visitor& visit)
        : cols_(cols), file_(file), bias_V_(bias_V), visit_(visit) {}

    void parse(const char* begin, const char* end, std::int64_t first_line, unsigned slot, run_buffer& buf,
               chunk_result& out) const {
        const std::size_t n_cols = cols_.roles.size();
        const role* roles = cols_.roles.data();
        std::string_view prev_x, prev_y;  // text of the previous row's x and y cells
        bool have_run = false, first_run = true;
        double run_x = 0.0, run_y = 0.0;
        std::int64_t run_line = 0;
        buf.z.clear();
        buf.current.clear();

        auto finish_run = [&](bool at_end) {
            if (first_run || at_end) {
                edge_run& e = first_run ? out.head : out.tail;
                e.valid = true;
                e.x_m = run_x;
                e.y_m = run_y;
                e.line = run_line;
                e.z_m.assign(buf.z.begin(), buf.z.end());
                e.current_A.assign(buf.current.begin(), buf.current.end());
                first_run = false;
            } else {
                grid_pixel_view v;
                v.x_m = run_x;
                v.y_m = run_y;
                v.z_m = buf.z;
                v.current_A = buf.current;
                v.bias_V = bias_V_;
                v.where = at(file_, run_line, 1);
                visit_(v, slot);
                out.runs.push_back(pixel_run{run_x, run_y, run_line, buf.z.size(), 0});
            }
            out.samples += buf.z.size();
            buf.z.clear();
            buf.current.clear();
        };

        const char* p = begin;
        std::int64_t line = first_line - 1;
        while (p < end) {
            ++line;
            const char* const line_start = p;
            // Blank and '#' lines (rare): skip them whole.
            {
                const char* q = p;
                while (q < end && (*q == ' ' || *q == '\t' || *q == '\r')) ++q;
                if (q == end || *q == '\n' || *q == '#') {
                    const void* nl = std::memchr(q, '\n', static_cast<std::size_t>(end - q));
                    p = nl ? static_cast<const char*>(nl) + 1 : end;
                    continue;
                }
            }
            std::string_view x_text, y_text;
            double z = 0.0, current = 0.0;
            for (std::size_t c = 0; c < n_cols; ++c) {
                while (p < end && (*p == ' ' || *p == '\t')) ++p;
                const char* const cell_start = p;
                const role r = roles[c];
                if (r == role::z || r == role::current) {
                    double v;
                    const char* q = scan_number(p, end, v);
                    if (!q) cell_error(line_start, cell_start, end, line, c);
                    p = q;
                    (r == role::z ? z : current) = v;
                } else {
                    // x and y mostly repeat the previous row's text: check that first.
                    if (r != role::ignored) {
                        const std::string_view prev = r == role::x ? prev_x : prev_y;
                        const std::size_t len = prev.size();
                        if (len > 0 && static_cast<std::size_t>(end - p) >= len && same_text(std::string_view(p, len), prev)) {
                            const char* q = p + len;
                            while (q < end && (*q == ' ' || *q == '\t' || *q == '\r')) ++q;
                            if (q == end || *q == ',' || *q == '\n') {
                                (r == role::x ? x_text : y_text) = prev;
                                p = q;
                                goto cell_done;
                            }
                        }
                    }
                    while (p < end && *p != ',' && *p != '\n') ++p;
                    if (r != role::ignored) {
                        std::string_view t = trim_cell(std::string_view(cell_start, static_cast<std::size_t>(p - cell_start)));
                        (r == role::x ? x_text : y_text) = t;
                    }
                }
            cell_done:
                while (p < end && (*p == ' ' || *p == '\t' || *p == '\r')) ++p;
                if (c + 1 < n_cols) {
                    if (p < end && *p == ',') {
                        ++p;
                    } else if (p == end || *p == '\n') {
                        wrong_cells(line_start, end, line);
                    } else {
                        cell_error(line_start, cell_start, end, line, c);
                    }
                } else if (p < end && *p != '\n') {
                    if (*p == ',') wrong_cells(line_start, end, line);
                    cell_error(line_start, cell_start, end, line, c);
                }
            }
            if (p < end) ++p;  // the line feed

            if (!have_run || !same_text(x_text, prev_x) || !same_text(y_text, prev_y)) {
                const double x = position(x_text, line_start, line, role::x) * cols_.x_factor;
                const double y = position(y_text, line_start, line, role::y) * cols_.y_factor;
                if (!have_run || x != run_x || y != run_y) {
                    if (have_run) finish_run(false);
                    have_run = true;
                    run_x = x;
                    run_y = y;
                    run_line = line;
                }
                prev_x = x_text;
                prev_y = y_text;
            }
            buf.z.push_back(z * cols_.z_factor);
            buf.current.push_back(current * cols_.current_factor);
        }
        if (have_run) finish_run(true);
        // A chunk with one pixel has it as head only; finish_run(true) put it in head.
    }

private:
    double position(std::string_view text, const char* line_start, std::int64_t line, role r) const {
        double v = 0.0;
        if (parse_double(text, v) != number_status::ok) {
            const std::size_t c = static_cast<std::size_t>(std::find(cols_.roles.begin(), cols_.roles.end(), r) - cols_.roles.begin());
            throw_cell(file_, line, text.data() - line_start + 1, cols_.names[c], text);
        }
        return v;
    }

    [[noreturn]] void cell_error(const char* line_start, const char* cell_start, const char* end, std::int64_t line,
                                 std::size_t c) const {
        const char* e = cell_start;
        while (e < end && *e != ',' && *e != '\n') ++e;
        const std::string_view cell = trim_cell(std::string_view(cell_start, static_cast<std::size_t>(e - cell_start)));
        throw_cell(file_, line, cell_start - line_start + 1, cols_.names[c], cell);
    }

    [[noreturn]] void wrong_cells(const char* line_start, const char* end, std::int64_t line) const {
        const void* nl = std::memchr(line_start, '\n', static_cast<std::size_t>(end - line_start));
        const char* e = nl ? static_cast<const char*>(nl) : end;
        const int n = count_cells(std::string_view(line_start, static_cast<std::size_t>(e - line_start)));
        throw_input(at(file_, line, 1), fmt::format("the row has {} cell{}; the header on line {} has {} columns", n,
                                                    n == 1 ? "" : "s", cols_.header_line, cols_.roles.size()));
    }

    const csv_columns& cols_;
    const std::string& file_;
    double bias_V_;
    const grid_visitor& visit_;
};

class file_handle {
public:
    explicit file_handle(const std::string& path) : fd_(::open(path.c_str(), O_RDONLY | O_CLOEXEC)) {}
    ~file_handle() {
        if (fd_ >= 0) ::close(fd_);
    }
    file_handle(const file_handle&) = delete;
    file_handle& operator=(const file_handle&) = delete;
    int fd() const { return fd_; }

private:
    int fd_;
};

// Fills buf[from, size) from fd; returns the bytes read (fewer at the end of the file).
std::size_t read_fully(int fd, char* buf, std::size_t size, std::size_t from, const std::string& path) {
    std::size_t got = from;
    while (got < size) {
        const ssize_t r = ::read(fd, buf + got, size - got);
        if (r < 0) {
            if (errno == EINTR) continue;
            throw_input(location{path, 0, 0, ""}, fmt::format("cannot read the file: {}", std::strerror(errno)));
        }
        if (r == 0) break;
        got += static_cast<std::size_t>(r);
    }
    return got - from;
}

}  // namespace

grid_layout read_grid_csv(const std::string& path, const grid_read_options& options, const grid_visitor& visit) {
    grid_layout layout;
    layout.path = path;
    std::size_t chunk_bytes = std::max(options.chunk_bytes, min_chunk_bytes);
    const unsigned workers = resolved_threads(options);

    file_handle file(path);
    if (file.fd() < 0) {
        throw_input(location{path, 0, 0, ""}, fmt::format("cannot open the grid for reading: {}", std::strerror(errno)));
    }
    struct stat st {};
    if (::fstat(file.fd(), &st) != 0 || !S_ISREG(st.st_mode)) {
        throw_input(location{path, 0, 0, ""}, "not a regular file; expected a grid CSV file or a directory of curve files");
    }
    const auto total = static_cast<std::uint64_t>(st.st_size);
    // A small file needs no big buffers (and uninitialised ones: zeroing 8 MB costs more than
    // reading a small grid).
    chunk_bytes = static_cast<std::size_t>(std::min<std::uint64_t>(chunk_bytes, std::max<std::uint64_t>(total + 1, min_chunk_bytes)));
    ::posix_fadvise(file.fd(), 0, 0, POSIX_FADV_SEQUENTIAL);

    // First chunk: metadata and header, then the first rows.
    std::unique_ptr<char[]> first(new char[chunk_bytes]);
    std::size_t got = read_fully(file.fd(), first.get(), chunk_bytes, 0, path);
    bool eof = got < chunk_bytes;
    std::string_view text(first.get(), got);
    if (text.find_first_not_of(" \t\r\n") == std::string_view::npos) {
        throw_input(location{path, 0, 0, ""},
                    fmt::format("the file is empty; expected a header row such as {} followed by data rows",
                                grid_header_example));
    }
    std::size_t pos = 0;
    std::int64_t line_no = 0;
    csv_columns cols;
    bool have_header = false;
    while (pos < text.size()) {
        const std::size_t nl = text.find('\n', pos);
        if (nl == std::string_view::npos && !eof) {
            throw_input(location{path, static_cast<int>(line_no + 1), 0, ""},
                        fmt::format("no header within the first {} bytes; expected a header such as {}", chunk_bytes,
                                    grid_header_example));
        }
        const std::size_t stop = nl == std::string_view::npos ? text.size() : nl;
        const std::string_view line = text.substr(pos, stop - pos);
        pos = nl == std::string_view::npos ? text.size() : nl + 1;
        ++line_no;
        const std::string_view t = trim_cell(line);
        if (t.empty()) continue;
        if (t.front() == '#') {
            parse_metadata_line(line, static_cast<int>(line_no), path, layout.metadata);
            continue;
        }
        cols = parse_header(line, static_cast<int>(line_no), path);
        have_header = true;
        break;
    }
    if (!have_header) {
        throw_input(location{path, 0, 0, ""},
                    fmt::format("no header row: the file holds only '#' lines; expected a header such as {} followed "
                                "by data rows",
                                grid_header_example));
    }
    const double bias_V = layout.metadata.bias_V ? *layout.metadata.bias_V : std::numeric_limits<double>::quiet_NaN();
    std::vector<std::string> files{path};

    // The pipeline.
    const chunk_parser parser(cols, path, bias_V, visit);
    std::mutex m;
    std::condition_variable job_ready, result_ready;
    std::deque<chunk_job> jobs;
    std::map<std::size_t, chunk_result> results;
    std::vector<std::unique_ptr<char[]>> free_buffers;
    bool stop = false;

    auto worker = [&](unsigned slot) {
        run_buffer buf;
        for (;;) {
            chunk_job job;
            {
                std::unique_lock lock(m);
                job_ready.wait(lock, [&] { return stop || !jobs.empty(); });
                if (stop) return;
                job = std::move(jobs.front());
                jobs.pop_front();
            }
            chunk_result res;
            try {
                parser.parse(job.buffer.get() + job.begin, job.buffer.get() + job.end, job.first_line, slot, buf, res);
            } catch (...) {
                res.failure = std::current_exception();
            }
            {
                std::lock_guard lock(m);
                results.emplace(job.index, std::move(res));
                free_buffers.push_back(std::move(job.buffer));
            }
            result_ready.notify_all();
        }
    };
    std::vector<std::thread> pool;
    struct joiner {
        std::vector<std::thread>& pool;
        std::mutex& m;
        bool& stop;
        std::condition_variable& cv;
        ~joiner() {
            {
                std::lock_guard lock(m);
                stop = true;
            }
            cv.notify_all();
            for (auto& t : pool) t.join();
        }
    } join_all{pool, m, stop, job_ready};
    for (unsigned w = 0; w < workers; ++w) pool.emplace_back(worker, w);

    std::vector<pixel_run> runs;
    edge_run carry;
    std::vector<char> remainder;  // partial line at the end of the last chunk read
    std::size_t next_index = 0, next_consume = 0, in_flight = 0;
    const std::size_t max_in_flight = workers + 2;
    std::int64_t next_line = line_no + 1;
    std::uint64_t consumed_bytes = pos;
    std::vector<std::uint64_t> chunk_sizes;
    bool ends_with_newline = true;

    auto finish_carry = [&] {
        if (!carry.valid) return;
        grid_pixel_view v;
        v.x_m = carry.x_m;
        v.y_m = carry.y_m;
        v.z_m = carry.z_m;
        v.current_A = carry.current_A;
        v.bias_V = bias_V;
        v.where = at(path, carry.line, 1);
        visit(v, workers);
        runs.push_back(pixel_run{carry.x_m, carry.y_m, carry.line, carry.z_m.size(), 0});
        carry.valid = false;
    };

    // Queues the bytes [begin, end) of `buf` (whole lines) as the next chunk.
    auto queue = [&](std::unique_ptr<char[]> buf, std::size_t begin, std::size_t end) {
        chunk_job job;
        job.index = next_index++;
        job.begin = begin;
        job.end = end;
        job.first_line = next_line;
        next_line += count_newlines(buf.get() + begin, end - begin);
        job.buffer = std::move(buf);
        chunk_sizes.push_back(end - begin);
        {
            std::lock_guard lock(m);
            jobs.push_back(std::move(job));
        }
        job_ready.notify_one();
        ++in_flight;
    };

    // Splits a filled buffer at its last line end, keeping the rest for the next chunk.
    auto split_and_queue = [&](std::unique_ptr<char[]> buf, std::size_t begin, std::size_t filled) {
        std::size_t end = filled;
        if (!eof) {
            const char* data = buf.get();
            const void* last_nl = ::memrchr(data + begin, '\n', filled - begin);
            if (!last_nl) {
                throw_input(at(path, next_line, 0),
                            fmt::format("the line is longer than the read chunk of {} bytes; not a grid CSV?", chunk_bytes));
            }
            end = static_cast<std::size_t>(static_cast<const char*>(last_nl) - data) + 1;
            remainder.assign(data + end, data + filled);
        } else {
            remainder.clear();
            if (filled > begin && buf[filled - 1] != '\n') ends_with_newline = false;
        }
        queue(std::move(buf), begin, end);
    };

    split_and_queue(std::move(first), pos, got);

    for (;;) {
        while (!eof && in_flight < max_in_flight) {
            std::unique_ptr<char[]> buf;
            {
                std::lock_guard lock(m);
                if (!free_buffers.empty()) {
                    buf = std::move(free_buffers.back());
                    free_buffers.pop_back();
                }
            }
            if (!buf) buf.reset(new char[chunk_bytes]);
            std::copy(remainder.begin(), remainder.end(), buf.get());
            const std::size_t n = read_fully(file.fd(), buf.get(), chunk_bytes, remainder.size(), path);
            const std::size_t filled = remainder.size() + n;
            eof = filled < chunk_bytes;
            if (filled == 0) {
                std::lock_guard lock(m);
                free_buffers.push_back(std::move(buf));
                break;
            }
            split_and_queue(std::move(buf), 0, filled);
        }
        if (in_flight == 0) break;

        chunk_result res;
        {
            std::unique_lock lock(m);
            result_ready.wait(lock, [&] { return results.count(next_consume) > 0; });
            auto it = results.find(next_consume);
            res = std::move(it->second);
            results.erase(it);
        }
        --in_flight;
        consumed_bytes += chunk_sizes[next_consume];
        ++next_consume;
        if (res.failure) std::rethrow_exception(res.failure);

        layout.samples += res.samples;
        if (res.head.valid) {
            if (carry.valid && carry.x_m == res.head.x_m && carry.y_m == res.head.y_m) {
                carry.z_m.insert(carry.z_m.end(), res.head.z_m.begin(), res.head.z_m.end());
                carry.current_A.insert(carry.current_A.end(), res.head.current_A.begin(), res.head.current_A.end());
            } else {
                finish_carry();
                carry = std::move(res.head);
            }
            if (res.tail.valid) {
                finish_carry();
                runs.insert(runs.end(), res.runs.begin(), res.runs.end());
                carry = std::move(res.tail);
            }
        }
        if (options.progress) options.progress(std::min(consumed_bytes, total), total);
    }
    finish_carry();
    layout.bytes = total;
    if (!ends_with_newline) {
        layout.warnings.push_back("the file does not end with a line end; if it was cut short, its last value may be "
                                  "incomplete");
    }
    check_grid(runs, files, true, layout);
    return layout;
}

}  // namespace tipgap::detail
