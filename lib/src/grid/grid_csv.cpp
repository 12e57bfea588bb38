// Streaming reader of a grid held in one long CSV file.
//
// The calling thread reads the file in chunks that end at a line end (read(2) into a few
// recycled buffers, so that the resident memory stays at a few chunks whatever the file size),
// counts their lines and queues them. Workers parse a chunk, visit every pixel that lies wholly
// inside it and return the chunk's first and last pixel, which may continue in the neighbouring
// chunks; the calling thread joins those in chunk order and visits them. Errors are rethrown in
// chunk order, so the message is that of the first bad line in the file whatever the thread count.
#include <algorithm>
#include <atomic>
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

#include "io/detail/csv_errors.hpp"
#include "io/detail/csv_header.hpp"
#include "io/detail/csv_scan.hpp"
#include "grid/detail/fast_rows.hpp"
#include "grid/detail/grid_internal.hpp"
#include "tipgap/core/units.hpp"
#include "tipgap/io/orientation.hpp"

namespace tipgap::detail {
namespace {

constexpr std::size_t min_chunk_bytes = 4096;

// The columns of a grid file, in the order of `role`.
enum class role : unsigned char { x, y, z, current, ignored };
constexpr column_rule grid_columns[] = {
    {"x", "", dimension::length, "x [nm]", true},
    {"y", "", dimension::length, "y [nm]", true},
    {"z", "", dimension::length, "z [nm]", true},
    {"current", "I", dimension::current, "current [pA]", true},
};
constexpr csv_format grid_format{grid_columns, "'x [nm],y [nm],z [nm],current [pA]'",
                                 "--columns 1,2,3,4 --xy-unit nm --z-unit nm --current-unit pA"};
// x, y, z and current: the roles reader_options::columns names.
constexpr std::size_t grid_roles = 4;

struct csv_columns {
    std::vector<role> roles;
    std::vector<std::string> names;
    double x_factor = 1.0, y_factor = 1.0, z_factor = 1.0, current_factor = 1.0;
    std::string header;  // "the header on line 3", for messages about cell counts
    csv_dialect dialect;
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

// The header as the chunk parser uses it: a role per column, names for messages, unit scales
// (z negated for flip_z).
csv_columns columns_of(const csv_header& header, csv_dialect dialect, bool flip_z) {
    csv_columns cols;
    cols.header = header.describe();
    cols.dialect = dialect;
    for (const column_descriptor& d : header.columns) {
        const role r = d.rule < 0 ? role::ignored : static_cast<role>(d.rule);
        if (r != role::ignored) {
            (r == role::x ? cols.x_factor : r == role::y ? cols.y_factor : r == role::z ? cols.z_factor : cols.current_factor) = d.scale;
        }
        cols.roles.push_back(r);
        cols.names.push_back(d.name);
    }
    if (flip_z) cols.z_factor = -cols.z_factor;
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

// The cells of one data row that the grid needs (x and y as text: they mostly repeat).
struct grid_row {
    std::string_view x_text, y_text;
    double z = 0.0, current = 0.0;
};

// The pixel being gathered while a chunk is parsed.
struct run_state {
    std::string_view prev_x, prev_y;  // text of the previous row's x and y cells
    bool have_run = false, first_run = true;
    double x = 0.0, y = 0.0;
    std::int64_t line = 0;
};

// Pixels whose |I| clearly rises or falls with z (io/orientation.hpp), counted as they go by.
struct orientation_tally {
    std::atomic<std::uint64_t> rising{0}, falling{0};
};

// Where complete pixels go: the visitor, called with the file's bias and the pixel's first line,
// the orientation tally, and the list of runs for the grid check.
struct pixel_sink {
    const std::string& file;
    double bias_V;
    const grid_visitor& visit;
    orientation_tally& orientation;

    void deliver(unsigned slot, double x_m, double y_m, std::int64_t line, std::span<const double> z_m,
                 std::span<const double> current_A, std::vector<pixel_run>& runs) const {
        grid_pixel_view v;
        v.x_m = x_m;
        v.y_m = y_m;
        v.z_m = z_m;
        v.current_A = current_A;
        v.bias_V = bias_V;
        v.where = at(file, line, 1);
        const z_orientation o = check_orientation(z_m, current_A).orientation;
        if (o != z_orientation::unclear) ++(o == z_orientation::current_rises ? orientation.rising : orientation.falling);
        visit(v, slot);
        runs.push_back(pixel_run{x_m, y_m, line, z_m.size(), 0});
    }
};

inline bool is_space_or_cr(char c) { return c == ' ' || c == '\t' || c == '\r'; }

// Blank and '#' lines (rare): the position after the line, or nullptr when it is a data row.
inline const char* skip_blank_or_comment(const char* p, const char* end) {
    const char* q = p;
    while (q < end && is_space_or_cr(*q)) ++q;
    if (q != end && *q != '\n' && *q != '#') return nullptr;
    const void* nl = std::memchr(q, '\n', static_cast<std::size_t>(end - q));
    return nl ? static_cast<const char*>(nl) + 1 : end;
}

// An x, y or ignored cell from p: stores x and y as text and returns the position after the cell.
// x and y mostly repeat the previous row's text: that is checked first.
inline const char* scan_text_cell(const char* p, const char* end, role r, const run_state& run, grid_row& row,
                                  csv_dialect d) {
    const char* const cell_start = p;
    if (r != role::ignored) {
        const std::string_view prev = r == role::x ? run.prev_x : run.prev_y;
        const std::size_t len = prev.size();
        if (len > 0 && static_cast<std::size_t>(end - p) >= len && same_text(std::string_view(p, len), prev)) {
            const char* q = p + len;
            if (q == end || d.ends_cell(*q) || d.is_pad(*q)) {
                (r == role::x ? row.x_text : row.y_text) = prev;
                return q;
            }
        }
    }
    while (p < end && !d.ends_cell(*p)) ++p;
    if (r != role::ignored) {
        (r == role::x ? row.x_text : row.y_text) = trim_cell(std::string_view(cell_start, static_cast<std::size_t>(p - cell_start)));
    }
    return p;
}

class chunk_parser {
public:
    chunk_parser(const csv_columns& cols, const pixel_sink& sink)
        : cols_(cols), file_(sink.file), sink_(sink), plain_(plain_layout(cols)) {}

    // Parses the whole lines [begin, end) (the first is line first_line), visits the pixels wholly
    // inside and returns the first and last in `out` (they may continue in the next chunks).
    void parse(const char* begin, const char* end, std::int64_t first_line, unsigned slot, run_buffer& buf,
               chunk_result& out) const {
        run_state run;
        buf.z.clear();
        buf.current.clear();
        const char* p = begin;
        std::int64_t line = first_line - 1;
        while (p < end) {
            ++line;
            const char* const line_start = p;
            plain_row fast;  // most rows of a plain file: one pass (fast_rows.hpp)
            if (plain_ && (p = scan_plain_row(line_start, end, run.prev_x, run.prev_y, fast))) {
                add_row(grid_row{fast.x_text, fast.y_text, fast.z, fast.current}, line_start, line, slot, run, buf, out);
                continue;
            }
            p = line_start;
            if (const char* next = skip_blank_or_comment(p, end)) {
                p = next;
                continue;
            }
            grid_row row;
            p = scan_row(p, end, line_start, line, run, row);
            if (p < end) ++p;  // the line feed
            add_row(row, line_start, line, slot, run, buf, out);
        }
        // A chunk with one pixel has it as head only.
        if (run.have_run) finish_run(true, slot, run, buf, out);
    }

private:
    // Comma-delimited x, y, z, current in this order: rows may take the fast path.
    static bool plain_layout(const csv_columns& cols) {
        return fast_rows_enabled().load() && cols.dialect.delimiter == ',' && !cols.dialect.decimal_comma &&
               cols.roles == std::vector<role>{role::x, role::y, role::z, role::current};
    }

    // The cells of the data row at p; returns the position of its line feed (or end).
    const char* scan_row(const char* p, const char* end, const char* line_start, std::int64_t line, const run_state& run,
                         grid_row& row) const {
        const csv_dialect d = cols_.dialect;
        const std::size_t n_cols = cols_.roles.size();
        for (std::size_t c = 0; c < n_cols; ++c) {
            while (p < end && d.is_pad(*p)) ++p;
            const char* const cell_start = p;
            const role r = cols_.roles[c];
            if (r == role::z || r == role::current) {
                double v;
                const char* q = scan_number(p, end, v, d.decimal_comma ? ',' : '.');
                // A number the fast scan cannot take whole (an exponent with a decimal comma, a
                // second comma): the slow path reads the cell or finds it bad.
                if (!q || (d.decimal_comma && q < end && *q == ',')) q = slow_number(p, end, v);
                if (!q) cell_error(line_start, cell_start, end, line, c);
                p = q;
                (r == role::z ? row.z : row.current) = v;
            } else {
                p = scan_text_cell(p, end, r, run, row, d);
            }
            p = after_cell(p, end, c + 1 < n_cols, line_start, cell_start, line, c);
        }
        return p;
    }

    // The number cell at p read with the dialect (a decimal comma); the position after it, or
    // nullptr when it is no number.
    const char* slow_number(const char* p, const char* end, double& v) const {
        const char* e = p;
        while (e < end && !cols_.dialect.ends_cell(*e)) ++e;
        const std::string_view cell = trim_cell(std::string_view(p, static_cast<std::size_t>(e - p)));
        return parse_cell(cell, cols_.dialect, v) == number_status::ok ? e : nullptr;
    }

    // After cell c: past its delimiter when more cells follow, else at the line end (past any
    // trailing delimiters); anything else is a wrong cell count or a bad cell.
    const char* after_cell(const char* p, const char* end, bool more, const char* line_start, const char* cell_start,
                           std::int64_t line, std::size_t c) const {
        const csv_dialect d = cols_.dialect;
        const char* const cell_end = p;
        while (p < end && d.is_pad(*p)) ++p;
        const bool at_line_end = p == end || *p == '\n';
        if (d.runs()) {
            // Cells are separated by the whitespace just skipped.
            if (more ? at_line_end : !at_line_end && p != cell_end) wrong_cells(line_start, end, line);
            if (!at_line_end && p == cell_end) cell_error(line_start, cell_start, end, line, c);
            return p;
        }
        if (more) {
            if (!at_line_end && *p == d.delimiter) return p + 1;
            if (at_line_end) wrong_cells(line_start, end, line);
            cell_error(line_start, cell_start, end, line, c);
        }
        if (at_line_end) return p;
        if (*p != d.delimiter) cell_error(line_start, cell_start, end, line, c);
        while (p < end && (*p == d.delimiter || d.is_pad(*p))) ++p;  // trailing delimiters
        if (p < end && *p != '\n') wrong_cells(line_start, end, line);
        return p;
    }

    // Adds a row to the pixel being gathered, or finishes that pixel and starts the row's.
    void add_row(const grid_row& row, const char* line_start, std::int64_t line, unsigned slot, run_state& run,
                 run_buffer& buf, chunk_result& out) const {
        if (!run.have_run || !same_text(row.x_text, run.prev_x) || !same_text(row.y_text, run.prev_y)) {
            const double x = position(row.x_text, line_start, line, role::x) * cols_.x_factor;
            const double y = position(row.y_text, line_start, line, role::y) * cols_.y_factor;
            if (!run.have_run || x != run.x || y != run.y) {
                if (run.have_run) finish_run(false, slot, run, buf, out);
                run.have_run = true;
                run.x = x;
                run.y = y;
                run.line = line;
            }
            run.prev_x = row.x_text;
            run.prev_y = row.y_text;
        }
        buf.z.push_back(row.z * cols_.z_factor);
        buf.current.push_back(row.current * cols_.current_factor);
    }

    // The chunk's first pixel and (at_end) its last go to `out` for joining; the others are
    // complete and visited here.
    void finish_run(bool at_end, unsigned slot, run_state& run, run_buffer& buf, chunk_result& out) const {
        if (run.first_run || at_end) {
            edge_run& e = run.first_run ? out.head : out.tail;
            e.valid = true;
            e.x_m = run.x;
            e.y_m = run.y;
            e.line = run.line;
            e.z_m.assign(buf.z.begin(), buf.z.end());
            e.current_A.assign(buf.current.begin(), buf.current.end());
            run.first_run = false;
        } else {
            sink_.deliver(slot, run.x, run.y, run.line, buf.z, buf.current, out.runs);
        }
        out.samples += buf.z.size();
        buf.z.clear();
        buf.current.clear();
    }

    double position(std::string_view text, const char* line_start, std::int64_t line, role r) const {
        double v = 0.0;
        const number_status st = parse_cell(text, cols_.dialect, v);
        if (st != number_status::ok) {
            const std::size_t c = static_cast<std::size_t>(std::find(cols_.roles.begin(), cols_.roles.end(), r) - cols_.roles.begin());
            throw_bad_number(at(file_, line, text.data() - line_start + 1), cols_.names[c], text, st);
        }
        return v;
    }

    [[noreturn]] void cell_error(const char* line_start, const char* cell_start, const char* end, std::int64_t line,
                                 std::size_t c) const {
        const char* e = cell_start;
        while (e < end && !cols_.dialect.ends_cell(*e)) ++e;
        const std::string_view cell = trim_cell(std::string_view(cell_start, static_cast<std::size_t>(e - cell_start)));
        double v = 0.0;
        throw_bad_number(at(file_, line, cell_start - line_start + 1), cols_.names[c], cell, parse_cell(cell, cols_.dialect, v));
    }

    [[noreturn]] void wrong_cells(const char* line_start, const char* end, std::int64_t line) const {
        const void* nl = std::memchr(line_start, '\n', static_cast<std::size_t>(end - line_start));
        const char* e = nl ? static_cast<const char*>(nl) : end;
        const std::string_view text(line_start, static_cast<std::size_t>(e - line_start));
        throw_cell_count(at(file_, line, 1), reported_cell_count(text, cols_.dialect, cols_.roles.size()), cols_.header,
                         cols_.roles.size());
    }

    const csv_columns& cols_;
    const std::string& file_;
    const pixel_sink& sink_;
    const bool plain_;
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

// Worker threads that parse queued chunks; the calling thread takes the results back in chunk
// order. The destructor stops and joins the workers (also when the reading fails).
class chunk_pipeline {
public:
    chunk_pipeline(const chunk_parser& parser, unsigned workers) : parser_(parser) {
        for (unsigned w = 0; w < workers; ++w) pool_.emplace_back([this, w] { work(w); });
    }
    ~chunk_pipeline() {
        {
            std::lock_guard lock(m_);
            stop_ = true;
        }
        job_ready_.notify_all();
        for (auto& t : pool_) t.join();
    }
    chunk_pipeline(const chunk_pipeline&) = delete;
    chunk_pipeline& operator=(const chunk_pipeline&) = delete;

    void push(chunk_job job) {
        {
            std::lock_guard lock(m_);
            jobs_.push_back(std::move(job));
        }
        job_ready_.notify_one();
    }
    // Waits for the result of chunk `index`.
    chunk_result take_result(std::size_t index) {
        std::unique_lock lock(m_);
        result_ready_.wait(lock, [&] { return results_.count(index) > 0; });
        auto it = results_.find(index);
        chunk_result res = std::move(it->second);
        results_.erase(it);
        return res;
    }
    // A buffer of a parsed chunk, for reuse, or null.
    std::unique_ptr<char[]> take_free_buffer() {
        std::lock_guard lock(m_);
        if (free_buffers_.empty()) return nullptr;
        std::unique_ptr<char[]> buf = std::move(free_buffers_.back());
        free_buffers_.pop_back();
        return buf;
    }
    void recycle(std::unique_ptr<char[]> buf) {
        std::lock_guard lock(m_);
        free_buffers_.push_back(std::move(buf));
    }

private:
    void work(unsigned slot) {
        run_buffer buf;
        for (;;) {
            chunk_job job;
            {
                std::unique_lock lock(m_);
                job_ready_.wait(lock, [&] { return stop_ || !jobs_.empty(); });
                if (stop_) return;
                job = std::move(jobs_.front());
                jobs_.pop_front();
            }
            chunk_result res;
            try {
                parser_.parse(job.buffer.get() + job.begin, job.buffer.get() + job.end, job.first_line, slot, buf, res);
            } catch (...) {
                res.failure = std::current_exception();
            }
            {
                std::lock_guard lock(m_);
                results_.emplace(job.index, std::move(res));
                free_buffers_.push_back(std::move(job.buffer));
            }
            result_ready_.notify_all();
        }
    }

    const chunk_parser& parser_;
    std::mutex m_;
    std::condition_variable job_ready_, result_ready_;
    std::deque<chunk_job> jobs_;
    std::map<std::size_t, chunk_result> results_;
    std::vector<std::unique_ptr<char[]>> free_buffers_;
    bool stop_ = false;
    std::vector<std::thread> pool_;
};

// Joins the pixels that straddle chunks, in chunk order, visits them on the calling thread and
// keeps every pixel's run for the grid check.
class pixel_joiner {
public:
    pixel_joiner(const pixel_sink& sink, unsigned slot) : sink_(sink), slot_(slot) {}

    void add(chunk_result& res) {
        if (!res.head.valid) return;
        if (carry_.valid && carry_.x_m == res.head.x_m && carry_.y_m == res.head.y_m) {
            carry_.z_m.insert(carry_.z_m.end(), res.head.z_m.begin(), res.head.z_m.end());
            carry_.current_A.insert(carry_.current_A.end(), res.head.current_A.begin(), res.head.current_A.end());
        } else {
            finish();
            carry_ = std::move(res.head);
        }
        if (res.tail.valid) {
            finish();
            runs_.insert(runs_.end(), res.runs.begin(), res.runs.end());
            carry_ = std::move(res.tail);
        }
    }
    // Visits the pixel carried over, if any.
    void finish() {
        if (!carry_.valid) return;
        sink_.deliver(slot_, carry_.x_m, carry_.y_m, carry_.line, carry_.z_m, carry_.current_A, runs_);
        carry_.valid = false;
    }
    const std::vector<pixel_run>& runs() const { return runs_; }

private:
    const pixel_sink& sink_;
    unsigned slot_;
    edge_run carry_;
    std::vector<pixel_run> runs_;
};

// The grid file opened for reading in chunks of chunk_bytes.
struct grid_file {
    file_handle handle;
    std::uint64_t total = 0;     // file size, bytes
    std::size_t chunk_bytes = 0;

    grid_file(const std::string& path, std::size_t requested_chunk_bytes) : handle(path) {
        if (handle.fd() < 0) {
            throw_input(location{path, 0, 0, ""}, fmt::format("cannot open the grid for reading: {}", std::strerror(errno)));
        }
        struct stat st {};
        if (::fstat(handle.fd(), &st) != 0 || !S_ISREG(st.st_mode)) {
            throw_input(location{path, 0, 0, ""}, "not a regular file; expected a grid CSV file or a directory of curve files");
        }
        total = static_cast<std::uint64_t>(st.st_size);
        // A small file needs no big buffers (and uninitialised ones: zeroing 8 MB costs more than
        // reading a small grid).
        chunk_bytes = std::max(requested_chunk_bytes, min_chunk_bytes);
        chunk_bytes = static_cast<std::size_t>(std::min<std::uint64_t>(chunk_bytes, std::max<std::uint64_t>(total + 1, min_chunk_bytes)));
        ::posix_fadvise(handle.fd(), 0, 0, POSIX_FADV_SEQUENTIAL);
    }
};

// The calling thread's side of the streaming read: reads chunks of whole lines, counts their
// lines, queues them, and joins the results in order.
class grid_csv_stream {
public:
    grid_csv_stream(grid_file& file, const std::string& path, const grid_read_options& options, unsigned workers,
                    const chunk_parser& parser, pixel_joiner& joiner)
        : file_(file), path_(path), options_(options), max_in_flight_(workers + 2), pipeline_(parser, workers),
          joiner_(joiner) {}

    // Streams the file from the first chunk `first` (got bytes, eof after it), whose data rows
    // start at data_begin on line first_data_line. Returns the samples read.
    std::uint64_t run(std::unique_ptr<char[]> first, std::size_t data_begin, std::size_t got, bool eof,
                      std::int64_t first_data_line) {
        eof_ = eof;
        next_line_ = first_data_line;
        consumed_bytes_ = data_begin;
        split_and_queue(std::move(first), data_begin, got);
        std::uint64_t samples = 0;
        for (;;) {
            read_ahead();
            if (in_flight_ == 0) break;
            chunk_result res = pipeline_.take_result(next_consume_);
            --in_flight_;
            consumed_bytes_ += chunk_sizes_[next_consume_];
            ++next_consume_;
            if (res.failure) std::rethrow_exception(res.failure);
            samples += res.samples;
            joiner_.add(res);
            if (options_.progress) options_.progress(std::min(consumed_bytes_, file_.total), file_.total);
        }
        joiner_.finish();
        return samples;
    }
    bool ends_with_newline() const { return ends_with_newline_; }

private:
    // Reads and queues chunks until enough are in flight or the file ends.
    void read_ahead() {
        while (!eof_ && in_flight_ < max_in_flight_) {
            std::unique_ptr<char[]> buf = pipeline_.take_free_buffer();
            if (!buf) buf.reset(new char[file_.chunk_bytes]);
            std::copy(remainder_.begin(), remainder_.end(), buf.get());
            const std::size_t n = read_fully(file_.handle.fd(), buf.get(), file_.chunk_bytes, remainder_.size(), path_);
            const std::size_t filled = remainder_.size() + n;
            eof_ = filled < file_.chunk_bytes;
            if (filled == 0) {
                pipeline_.recycle(std::move(buf));
                break;
            }
            split_and_queue(std::move(buf), 0, filled);
        }
    }

    // Splits a filled buffer at its last line end, keeping the rest for the next chunk.
    void split_and_queue(std::unique_ptr<char[]> buf, std::size_t begin, std::size_t filled) {
        std::size_t end = filled;
        if (!eof_) {
            const char* data = buf.get();
            const void* last_nl = ::memrchr(data + begin, '\n', filled - begin);
            if (!last_nl) {
                throw_input(at(path_, next_line_, 0),
                            fmt::format("the line is longer than the read chunk of {} bytes; not a grid CSV?", file_.chunk_bytes));
            }
            end = static_cast<std::size_t>(static_cast<const char*>(last_nl) - data) + 1;
            remainder_.assign(data + end, data + filled);
        } else {
            remainder_.clear();
            if (filled > begin && buf[filled - 1] != '\n') {
                ends_with_newline_ = false;
                // An aborted acquisition may stop inside a row: leave that row out.
                const void* last_nl = options_.partial ? ::memrchr(buf.get() + begin, '\n', filled - begin) : nullptr;
                if (last_nl) end = static_cast<std::size_t>(static_cast<const char*>(last_nl) - buf.get()) + 1;
            }
        }
        queue(std::move(buf), begin, end);
    }

    // Queues the bytes [begin, end) of `buf` (whole lines) as the next chunk.
    void queue(std::unique_ptr<char[]> buf, std::size_t begin, std::size_t end) {
        chunk_job job;
        job.index = next_index_++;
        job.begin = begin;
        job.end = end;
        job.first_line = next_line_;
        next_line_ += count_newlines(buf.get() + begin, end - begin);
        job.buffer = std::move(buf);
        chunk_sizes_.push_back(end - begin);
        pipeline_.push(std::move(job));
        ++in_flight_;
    }

    grid_file& file_;
    const std::string& path_;
    const grid_read_options& options_;
    const std::size_t max_in_flight_;
    std::vector<char> remainder_;  // partial line at the end of the last chunk read
    std::size_t next_index_ = 0, next_consume_ = 0, in_flight_ = 0;
    std::int64_t next_line_ = 0;
    std::uint64_t consumed_bytes_ = 0;
    std::vector<std::uint64_t> chunk_sizes_;
    bool eof_ = false;
    bool ends_with_newline_ = true;
    chunk_pipeline pipeline_;  // after the state its workers' results feed
    pixel_joiner& joiner_;
};

}  // namespace

namespace {

// Most pixels' |I| rising with z: the grid's z grows as the tip approaches.
void refuse_rising_current(const orientation_tally& t, const grid_layout& layout, bool flipped) {
    if (t.rising.load() * 2 <= layout.pixels) return;
    throw_rising_current(location{layout.path, 0, 0, ""},
                         fmt::format("in {} of {} pixels, by the median |I| of each pixel's quarters of largest and "
                                     "smallest z",
                                     t.rising.load(), layout.pixels),
                         flipped);
}

}  // namespace

grid_layout read_grid_csv(const std::string& path, const grid_read_options& options, const grid_visitor& visit) {
    const reader_options& ro = options.reader;
    ro.validate(grid_roles);
    grid_layout layout;
    layout.path = path;
    const unsigned workers = resolved_threads(options);
    grid_file file(path, options.chunk_bytes);

    // First chunk: metadata and header, then the first rows.
    std::unique_ptr<char[]> first(new char[file.chunk_bytes]);
    const std::size_t got = read_fully(file.handle.fd(), first.get(), file.chunk_bytes, 0, path);
    const bool eof = got < file.chunk_bytes;
    const column_choice choice = choice_of(ro, {ro.xy_unit, ro.xy_unit, ro.z_unit, ro.current_unit});
    csv_preamble pre = read_preamble(std::string_view(first.get(), got), eof, path, grid_format, choice);
    layout.metadata = std::move(pre.metadata);
    layout.notes = std::move(pre.header.notes);
    apply_overrides(ro, layout.metadata, layout.notes);
    const csv_columns cols = columns_of(pre.header, pre.dialect, ro.flip_z);
    const double bias_V = layout.metadata.bias_V ? *layout.metadata.bias_V : std::numeric_limits<double>::quiet_NaN();

    orientation_tally orientation;
    const pixel_sink sink{path, bias_V, visit, orientation};
    const chunk_parser parser(cols, sink);
    pixel_joiner joiner(sink, workers);
    grid_csv_stream stream(file, path, options, workers, parser, joiner);
    layout.samples = stream.run(std::move(first), pre.data_offset, got, eof, pre.header.line + 1);
    layout.bytes = file.total;
    if (!stream.ends_with_newline()) {
        layout.warnings.push_back(options.partial ? "the file does not end with a line end: its last, unfinished row is left out"
                                                  : "the file does not end with a line end; if it was cut short, its "
                                                    "last value may be incomplete");
    }
    const std::vector<std::string> files{path};
    check_grid(joiner.runs(), files, true, layout, options.partial);
    refuse_rising_current(orientation, layout, ro.flip_z);
    return layout;
}

}  // namespace tipgap::detail
