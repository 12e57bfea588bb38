#pragma once
// Parallel execution over an index range, used by plan, figures and demo (and by tests). Internal:
// not part of the installed headers.
#include <cstddef>
#include <functional>

namespace tipgap::detail {

// Runs f(i) for i in [0, n) on `threads` workers (0 = hardware concurrency), each taking the next
// index from a shared counter. The first exception stops the remaining work and is rethrown here.
// Callers write results by index, so the outcome does not depend on the number of workers.
void parallel_for(std::size_t n, int threads, const std::function<void(std::size_t)>& f);

}  // namespace tipgap::detail
