#pragma once
// Many variants at once — the variants of one case or of a whole fleet of cases — on all cores.
#include <atomic>
#include <cstddef>
#include <vector>

#include "acidload/studies/whatif.hpp"

namespace acidload {

//! The summaries of `variants`, in their order, computed on `threads` threads (0: one per core).
//! Equal, figure for figure, to calling summarize() on each in turn: each variant is independent and
//! runs on one thread. The first refusal in input order is rethrown (later variants may have run).
//! `done`, when given, counts finished variants (for a progress line).
std::vector<VariantSummary> summarize_many(const std::vector<const EngineCase*>& variants, int threads = 0,
                                           std::atomic<std::size_t>* done = nullptr);

}  // namespace acidload
