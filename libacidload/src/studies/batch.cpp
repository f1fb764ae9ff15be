#include "acidload/studies/batch.hpp"

#include <algorithm>
#include <exception>
#include <thread>

namespace acidload {

std::vector<VariantSummary> summarize_many(const std::vector<const EngineCase*>& variants, int threads,
                                           std::atomic<std::size_t>* done) {
  const std::size_t n = variants.size();
  std::vector<VariantSummary> out(n);
  std::vector<std::exception_ptr> errors(n);
  std::size_t workers = threads > 0 ? static_cast<std::size_t>(threads) : std::max(1u, std::thread::hardware_concurrency());
  workers = std::max<std::size_t>(1, std::min(workers, n));
  std::atomic<std::size_t> next{0};
  const auto work = [&] {
    for (std::size_t i; (i = next.fetch_add(1)) < n;) {
      try {
        out[i] = summarize(*variants[i]);
      } catch (...) {
        errors[i] = std::current_exception();
      }
      if (done) done->fetch_add(1);
    }
  };
  if (workers == 1) {
    work();
  } else {
    std::vector<std::thread> pool;
    for (std::size_t t = 0; t < workers; ++t) pool.emplace_back(work);
    for (auto& th : pool) th.join();
  }
  for (const auto& e : errors)
    if (e) std::rethrow_exception(e);
  return out;
}

}  // namespace acidload
