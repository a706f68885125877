// How many OpenMP threads a loop over n items (elements, matrix rows) should use.
#pragma once

#include <cstdint>
#include <omp.h>

namespace hearth {

// Loops over fewer than this many items run on the calling thread.
inline constexpr std::int64_t serial_loop_items = 50000;

// All threads for a large loop, one for a small one. A small loop (a re-assembly of
// 30 000 tetrahedra, a product with a 6 000-row matrix) takes a millisecond or less on
// one core. Handing it to the team costs a wake-up, and afterwards the idle team spins
// for the cores while the next phase runs: in a small Newton solve that phase is the
// direct solver's BLAS threads, and the furnace-wall demo's kept-factor GMRES
// iterations took 5-8 ms each with the team spinning against 1-2 ms without it
// (hearth's own measurement, 2 cores).
inline int loop_threads(std::int64_t items) { return items < serial_loop_items ? 1 : omp_get_max_threads(); }

}  // namespace hearth
