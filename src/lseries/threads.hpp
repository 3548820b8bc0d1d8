// Runs a body inside a TBB arena of the requested size (0: TBB decides), returning its result:
// the one place where the lseries layer turns a thread count into parallelism.
#pragma once

#include <tbb/task_arena.h>

namespace arcsieve::lseries {

template <class F>
auto run_with_threads(unsigned threads, F&& body) {
    if (threads == 0) return body();
    tbb::task_arena arena(static_cast<int>(threads));
    return arena.execute(body);
}

}  // namespace arcsieve::lseries
