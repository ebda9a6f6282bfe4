#include "optimize/driver.h"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <exception>
#include <fstream>
#include <limits>
#include <map>
#include <mutex>
#include <nlopt.hpp>
#include <ostream>
#include <random>
#include <sstream>
#include <thread>
#include <utility>

#include "common/atomic_file.h"
#include "common/error.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using Clock = std::chrono::steady_clock;

constexpr const char* kCheckpointFormat = "fulmar-checkpoint";
// Version 2 added the constraints' ids to the records (and a full record for every evaluation);
// version 1 is still read: upgrade_v1_detail completes its records.
constexpr int kCheckpointVersion = 2;

// A version-1 record made whole: a null one (an analysis that threw) becomes an empty record,
// a design point without results (no analysis ran) one that did not converge, and each
// constraint row gets its id from the problem (same case, the fingerprint guarantees it, so the
// same constraints in the same order).
json upgrade_v1_detail(json d, const std::vector<std::string>& ids) {
  if (d.is_null()) return to_json(EvaluationRecord{});
  PointResult none;
  none.reason = "not analysed";
  const json not_analysed = to_json(none);
  if (d.contains("points"))
    for (auto& p : d["points"])
      if (p.is_object() && !p.contains("converged")) p.update(not_analysed);
  if (d.contains("constraints") && d["constraints"].is_array())
    for (size_t k = 0; k < d["constraints"].size(); ++k)
      if (!d["constraints"][k].contains("id") && k < ids.size()) d["constraints"][k]["id"] = ids[k];
  return d;
}

// Thrown inside the NLopt callbacks to end the search (NLopt turns it into a forced stop).
struct StopSearch {};

std::string clock_text(double seconds) {
  const long s = std::max(0L, long(std::lround(seconds)));
  char buf[32];
  std::snprintf(buf, sizeof buf, "%02ld:%02ld:%02ld", s / 3600, (s / 60) % 60, s % 60);
  return buf;
}

std::string num(double v, int precision = 6) {
  if (!std::isfinite(v)) return "-";
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*g", precision, v);
  return buf;
}

template <class F>
void parallel_for(int n, int threads, F&& f) {
  threads = std::max(1, std::min(threads, n));
  if (threads == 1) {
    for (int i = 0; i < n; ++i) f(i);
    return;
  }
  // An exception of a worker (an input or program error of the analysis) ends the other workers
  // after their current item and is thrown again here, in the calling thread.
  std::atomic<int> next{0};
  std::exception_ptr first_error;
  std::mutex error_mutex;
  std::vector<std::thread> pool;
  for (int t = 0; t < threads; ++t)
    pool.emplace_back([&] {
      try {
        for (int i = next++; i < n; i = next++) f(i);
      } catch (...) {  // carried to the calling thread, not swallowed
        const std::lock_guard<std::mutex> lock(error_mutex);
        if (!first_error) first_error = std::current_exception();
        next = n;
      }
    });
  for (auto& th : pool) th.join();
  if (first_error) std::rethrow_exception(first_error);
}

class Search {
 public:
  Search(const SearchProblem& problem, const SearchSettings& settings)
      : p_(problem), s_(settings), n_(problem.start.size()) {
    threads_ = s_.threads > 0 ? s_.threads : int(std::max(1u, std::thread::hardware_concurrency()));
    if (s_.resume) load_checkpoint();
    started_ = Clock::now();
  }

  SearchResult run() {
    SearchResult r;
    try {
      if (s_.options.algorithm == Algorithm::multistart) {
        run_multistart(r);
      } else {
        const int searches = 1 + int(p_.extra_starts.size());
        for (int k = 0; k < searches; ++k) {
          current_search_ = k;
          // This search's share of the budget ends here (the last one's at the budget itself).
          share_end_ = k + 1 < searches ? s_.options.max_evaluations * (k + 1) / searches
                                        : std::numeric_limits<int>::max();
          SearchResult part;
          part.converged =
              run_local(s_.options.algorithm, k == 0 ? p_.start : p_.extra_starts[size_t(k - 1)],
                        part.stop_reason);
          restart_local(part);
          r.converged = k == 0 ? part.converged : r.converged && part.converged;
          finished_searches_ += (k == 0 ? "" : "; ") + search_label(k) + part.stop_reason;
        }
        r.stop_reason = finished_searches_;
      }
    } catch (const StopSearch&) {
      r.converged = false;
    }
    if (!stop_reason_.empty()) {
      // With several starts, what the finished local searches ended on comes first.
      r.stop_reason = finished_searches_ + (finished_searches_.empty() ? "" : "; ") +
                      search_label(current_search_) + stop_reason_;
      r.converged = false;
    }
    // The start design is always analysed, even when a limit stops the search at once.
    if (history_.empty()) {
      try {
        batch({p_.start});
      } catch (const StopSearch&) {
      }
    }
    write_checkpoint();
    r.history = history_;
    r.interrupted = interrupted_;
    r.iterations = iterations_;
    r.elapsed_s = elapsed();
    r.replayed = replayed_;
    r.best = best_feasible(history_, s_.options.constraint_tol);
    r.best_any = r.best;
    if (r.best_any < 0) {
      double least = std::numeric_limits<double>::infinity();
      for (size_t i = 0; i < history_.size(); ++i) {
        const double w = history_[i].ok ? worst_constraint(history_[i]) : 1e300;
        if (w < least) least = w, r.best_any = int(i);
      }
    }
    return r;
  }

 private:
  double elapsed() const {
    return prior_elapsed_ + std::chrono::duration<double>(Clock::now() - started_).count();
  }

  void check_limits() {
    if (s_.stop && s_.stop->load()) {
      interrupted_ = true;
      stop_reason_ = "interrupted by a signal";
      throw nlopt::forced_stop();
    }
    if (int(history_.size()) >= share_end_) {
      share_spent_ = true;
      throw nlopt::forced_stop();
    }
    if (int(history_.size()) >= s_.options.max_evaluations) {
      stop_reason_ =
          "evaluation budget of " + std::to_string(s_.options.max_evaluations) + " analyses spent";
      throw nlopt::forced_stop();
    }
    if (elapsed() >= s_.options.time_limit_s) {
      stop_reason_ = "time limit of " + num(s_.options.time_limit_s) + " s reached";
      throw nlopt::forced_stop();
    }
  }

  Evaluation safe_evaluate(const std::vector<double>& x) const {
    // A numerical failure is a status of the evaluation (AnalysisFailure, or ok = false from the
    // evaluator); anything else thrown (InputError, a program error) ends the search.
    Evaluation e;
    try {
      e = p_.evaluate(x);
    } catch (const AnalysisFailure& ex) {
      e = Evaluation{};
      e.ok = false;
      e.status = std::string("analysis failed: ") + ex.what();
      e.objective = std::numeric_limits<double>::quiet_NaN();
    }
    e.x = x;
    // A failed analysis must still give NLopt finite numbers that steer away from it.
    if (!std::isfinite(e.objective)) {
      e.ok = false;
      e.objective = 1e3;
    }
    e.constraints.resize(p_.constraint_names.size(), 1.0);
    for (double& c : e.constraints)
      if (!std::isfinite(c)) c = 1.0, e.ok = false;
    if (!e.ok && e.status.empty()) e.status = "failed";
    return e;
  }

  // Indices in history of the evaluations of `xs`, analysing the missing ones in parallel and
  // appending them in the order of `xs` (so history does not depend on thread timing).
  std::vector<size_t> batch(const std::vector<std::vector<double>>& xs) {
    std::vector<std::vector<double>> missing;
    for (const auto& x : xs)
      if (!cache_.count(x) && std::find(missing.begin(), missing.end(), x) == missing.end())
        missing.push_back(x);
    std::vector<Evaluation> fresh(missing.size());
    std::vector<int> to_compute;
    for (size_t i = 0; i < missing.size(); ++i) {
      auto it = replay_.find(missing[i]);
      if (it != replay_.end()) {
        fresh[i] = it->second;
        replay_.erase(it);
        ++replayed_;
      } else {
        to_compute.push_back(int(i));
      }
    }
    parallel_for(int(to_compute.size()), threads_,
                 [&](int k) { fresh[to_compute[k]] = safe_evaluate(missing[to_compute[k]]); });
    for (auto& e : fresh) {
      if (!e.ok && s_.progress)
        *s_.progress << "  analysis failed (kept out of the search): " << e.status << "\n";
      cache_[e.x] = history_.size();
      history_.push_back(std::move(e));
    }
    std::vector<size_t> idx;
    for (const auto& x : xs) idx.push_back(cache_.at(x));
    return idx;
  }

  // The design and its forward-difference neighbours (backward at an upper bound).
  std::vector<std::vector<double>> stencil(const double* x, bool with_gradient,
                                           std::vector<double>& steps) const {
    std::vector<std::vector<double>> xs{std::vector<double>(x, x + n_)};
    steps.assign(n_, 0.0);
    if (!with_gradient) return xs;
    for (size_t i = 0; i < n_; ++i) {
      std::vector<double> xi = xs[0];
      double h = s_.options.fd_step;
      if (xi[i] + h > p_.upper[i]) h = -h;
      xi[i] += h;
      // Round the step to what the design vector can hold, so the quotient uses the true step.
      steps[i] = xi[i] - xs[0][i];
      xs.push_back(std::move(xi));
    }
    return xs;
  }

  // The stencil's evaluations; a forward neighbour whose analysis failed is replaced by the
  // backward one, and when that fails too its step is set to 0 (that gradient component is then
  // taken as 0): a failed neighbour's penalty value would otherwise give the search a gradient
  // that points nowhere.
  std::vector<size_t> evaluated_stencil(const double* x, bool with_gradient,
                                        std::vector<double>& steps) {
    std::vector<size_t> idx = batch(stencil(x, with_gradient, steps));
    if (!with_gradient || !history_[idx[0]].ok) return idx;
    const std::vector<double> centre(x, x + n_);
    std::vector<std::vector<double>> back;
    std::vector<size_t> which;
    for (size_t i = 0; i < n_; ++i) {
      if (history_[idx[i + 1]].ok) continue;
      std::vector<double> xi = centre;
      xi[i] -= steps[i];
      if (xi[i] < p_.lower[i] || xi[i] > p_.upper[i]) {
        steps[i] = 0.0;
        continue;
      }
      back.push_back(std::move(xi));
      which.push_back(i);
    }
    if (back.empty()) return idx;
    const std::vector<size_t> b = batch(back);
    for (size_t k = 0; k < which.size(); ++k) {
      const size_t i = which[k];
      if (history_[b[k]].ok) {
        idx[i + 1] = b[k];
        steps[i] = back[k][i] - centre[i];
      } else {
        steps[i] = 0.0;
      }
    }
    return idx;
  }

  double objective(unsigned n, const double* x, double* grad) {
    check_limits();
    ++iterations_;
    std::vector<double> steps;
    const auto idx = evaluated_stencil(x, grad != nullptr, steps);
    const Evaluation& e = history_[idx[0]];
    if (grad)
      for (unsigned i = 0; i < n; ++i)
        grad[i] = steps[i] != 0.0 ? (history_[idx[i + 1]].objective - e.objective) / steps[i] : 0.0;
    progress_line(e);
    write_checkpoint();
    return e.objective;
  }

  void constraints(unsigned m, double* result, unsigned n, const double* x, double* grad) {
    std::vector<double> steps;
    const auto idx = evaluated_stencil(x, grad != nullptr, steps);
    const Evaluation& e = history_[idx[0]];
    for (unsigned k = 0; k < m; ++k) result[k] = e.constraints[k];
    if (grad)
      for (unsigned k = 0; k < m; ++k)
        for (unsigned i = 0; i < n; ++i)
          grad[k * n + i] =
              steps[i] != 0.0 ? (history_[idx[i + 1]].constraints[k] - e.constraints[k]) / steps[i]
                              : 0.0;
  }

  void progress_line(const Evaluation& e) {
    if (!s_.progress) return;
    const int best = best_feasible(history_, s_.options.constraint_tol);
    double worst = -std::numeric_limits<double>::infinity();
    std::string worst_name = "-";
    for (size_t k = 0; k < e.constraints.size(); ++k)
      if (e.constraints[k] > worst) worst = e.constraints[k], worst_name = p_.constraint_names[k];
    const double t = elapsed();
    std::ostringstream line;
    line << "iteration " << iterations_ << "  evaluations " << history_.size() << "/"
         << s_.options.max_evaluations << "  objective " << num(e.objective)
         << "  worst constraint " << num(worst, 3) << " (" << worst_name << ")"
         << "  best feasible " << (best >= 0 ? num(history_[best].objective) : std::string("none"))
         << "  elapsed " << clock_text(t) << "  left "
         << std::max(0, s_.options.max_evaluations - int(history_.size())) << " evaluations, "
         << clock_text(std::max(0.0, s_.options.time_limit_s - t))
         << (replay_.empty() ? "" : "  (replaying the checkpoint)");
    *s_.progress << line.str() << "\n" << std::flush;
  }

  // NLopt's variables: the design itself, or for the gradient-based methods the design scaled
  // about the start, x = origin + kGradientScale z. Their first step is the negative gradient
  // in these variables (identity Hessian), kGradientScale^2 times the gradient in coefficient
  // units: about 0.01 per coefficient instead of a jump to the bounds, which threw the search
  // into wavy, constraint-violating shapes it could not climb back from.
  static constexpr double kGradientScale = 0.1;
  const double* design_of(unsigned n, const double* z) {
    if (!scaled_) return z;
    design_.resize(n);
    for (unsigned i = 0; i < n; ++i) design_[i] = origin_[i] + kGradientScale * z[i];
    return design_.data();
  }

  // NLopt turns an exception thrown in a callback into a bare "nlopt failure"; so an error of the
  // analysis is kept here, NLopt is stopped, and run_local throws it again.
  template <class F>
  void guarded(F&& f) {
    try {
      f();
    } catch (const nlopt::forced_stop&) {
      throw;
    } catch (...) {  // carried past NLopt and thrown again by run_local, not swallowed
      pending_error_ = std::current_exception();
      throw nlopt::forced_stop();
    }
  }
  static double objective_cb(unsigned n, const double* z, double* grad, void* data) {
    Search* s = static_cast<Search*>(data);
    double f = 0;
    s->guarded([&] { f = s->objective(n, s->design_of(n, z), grad); });
    if (grad && s->scaled_)
      for (unsigned i = 0; i < n; ++i) grad[i] *= kGradientScale;
    return f;
  }
  static void constraints_cb(unsigned m, double* result, unsigned n, const double* z, double* grad,
                             void* data) {
    Search* s = static_cast<Search*>(data);
    s->guarded([&] { s->constraints(m, result, n, s->design_of(n, z), grad); });
    if (grad && s->scaled_)
      for (unsigned k = 0; k < m * n; ++k) grad[k] *= kGradientScale;
  }

  // Returns whether NLopt ended on its own tolerance.
  bool run_local(Algorithm algorithm, const std::vector<double>& x0, std::string& reason) {
    nlopt::algorithm a = nlopt::LD_SLSQP;
    switch (algorithm) {
      case Algorithm::slsqp:
      case Algorithm::multistart:
        a = nlopt::LD_SLSQP;
        break;
      case Algorithm::mma:
        a = nlopt::LD_MMA;
        break;
      case Algorithm::cobyla:
        a = nlopt::LN_COBYLA;
        break;
      case Algorithm::isres:
        a = nlopt::GN_ISRES;
        break;
    }
    nlopt::srand(s_.options.seed);
    nlopt::opt opt(a, unsigned(n_));
    scaled_ = a == nlopt::LD_SLSQP || a == nlopt::LD_MMA;
    origin_ = x0;
    std::vector<double> lower = p_.lower, upper = p_.upper, z0 = x0;
    if (scaled_)
      for (size_t i = 0; i < n_; ++i) {
        lower[i] = (p_.lower[i] - x0[i]) / kGradientScale;
        upper[i] = (p_.upper[i] - x0[i]) / kGradientScale;
        z0[i] = 0.0;
      }
    opt.set_lower_bounds(lower);
    opt.set_upper_bounds(upper);
    opt.set_min_objective(&Search::objective_cb, this);
    if (!p_.constraint_names.empty())
      opt.add_inequality_mconstraint(
          &Search::constraints_cb, this,
          std::vector<double>(p_.constraint_names.size(), s_.options.constraint_tol));
    opt.set_xtol_rel(s_.options.xtol_rel);
    opt.set_ftol_rel(s_.options.ftol_rel);
    if (a == nlopt::LN_COBYLA) {
      std::vector<double> step(n_);
      for (size_t i = 0; i < n_; ++i) step[i] = 0.1 * (p_.upper[i] - p_.lower[i]);
      opt.set_initial_step(step);
    }
    std::vector<double> x = z0;
    double f = 0;
    try {
      const nlopt::result res = opt.optimize(x, f);
      switch (res) {
        case nlopt::XTOL_REACHED:
          reason = "converged: design change below xtol_rel";
          return true;
        case nlopt::FTOL_REACHED:
          reason = "converged: objective change below ftol_rel";
          return true;
        case nlopt::SUCCESS:
          reason = "converged";
          return true;
        default:
          reason = "NLopt stopped with code " + std::to_string(int(res));
          return false;
      }
    } catch (const nlopt::forced_stop&) {
      if (pending_error_) std::rethrow_exception(std::exchange(pending_error_, nullptr));
      if (share_spent_ && stop_reason_.empty()) {
        share_spent_ = false;
        reason = "its share of the evaluation budget spent";
        return false;
      }
      if (stop_reason_.empty()) reason = "stopped";
      throw StopSearch{};
    } catch (const nlopt::roundoff_limited&) {
      reason = "NLopt stopped: roundoff limited (no further progress possible)";
      return false;
    } catch (const std::invalid_argument& ex) {  // NLopt's NLOPT_INVALID_ARGS
      if (!stop_reason_.empty()) throw StopSearch{};
      reason = std::string("NLopt stopped: ") + ex.what();
      return false;
    } catch (const std::runtime_error& ex) {  // NLopt's NLOPT_FAILURE (callbacks' errors: above)
      if (pending_error_) std::rethrow_exception(std::exchange(pending_error_, nullptr));
      if (!stop_reason_.empty()) throw StopSearch{};
      reason = std::string("NLopt stopped: ") + ex.what();
      return false;
    }
  }

  // SLSQP and MMA on finite-difference gradients of a flow solver often end early: a line
  // search that finds no descent along a direction spoilt by a noisy gradient component counts as
  // "objective change below ftol_rel" (seen on the demo: stuck at an infeasible point 0.6 % from
  // the cl_max limit with half the budget left). So a local search that ends on its tolerance is
  // restarted from the best feasible design (a fresh quasi-Newton model), up to kMaxRestarts
  // times, while the previous restart improved the best feasible objective by more than
  // kRestartGain (relative). Budget, time limit and signals still end it at any moment.
  static constexpr int kMaxRestarts = 4;
  static constexpr double kRestartGain = 1e-3;
  void restart_local(SearchResult& r) {
    if (s_.options.algorithm != Algorithm::slsqp && s_.options.algorithm != Algorithm::mma) return;
    double previous = std::numeric_limits<double>::infinity();
    for (int k = 1; k <= kMaxRestarts && r.converged; ++k) {
      const int best = best_feasible(history_, s_.options.constraint_tol);
      if (best < 0) return;
      const double f = history_[size_t(best)].objective;
      if (k > 1 && !(f < previous - kRestartGain * std::abs(previous))) return;
      previous = f;
      std::string reason;
      r.converged = run_local(s_.options.algorithm, history_[size_t(best)].x, reason);
      r.stop_reason = reason + " (after " + std::to_string(k) +
                      (k == 1 ? " restart" : " restarts") + " from the best feasible design)";
    }
  }

  void run_multistart(SearchResult& r) {
    std::mt19937_64 rng(s_.options.seed);
    bool all = true;
    std::string reasons;
    for (int k = 0; k < s_.options.starts; ++k) {
      std::vector<double> x0 = p_.start;
      if (k > 0) {
        // Starts scattered around the baseline over half the bound range: far enough to find
        // another basin, near enough to stay mostly among valid sections.
        for (size_t i = 0; i < n_; ++i) {
          const double u = double(rng() >> 11) * 0x1.0p-53 - 0.5;
          x0[i] = std::clamp(p_.start[i] + 0.5 * u * (p_.upper[i] - p_.lower[i]), p_.lower[i],
                             p_.upper[i]);
        }
      }
      std::string reason;
      all = run_local(Algorithm::slsqp, x0, reason) && all;
      reasons += (reasons.empty() ? "" : "; ") + ("start " + std::to_string(k + 1) + ": " + reason);
    }
    r.converged = all;
    r.stop_reason = reasons;
  }

  void write_checkpoint() const {
    if (s_.checkpoint.empty()) return;
    json evals = json::array();
    for (const auto& e : history_) evals.push_back(to_json(e));
    // Not yet replayed evaluations stay in the checkpoint so an interrupted replay loses nothing.
    for (const auto& [x, e] : replay_) evals.push_back(to_json(e));
    json j{{"format", kCheckpointFormat},   {"version", kCheckpointVersion},
           {"fingerprint", s_.fingerprint}, {"elapsed_s", elapsed()},
           {"iterations", iterations_},     {"evaluations", std::move(evals)}};
    write_file_atomically(s_.checkpoint, j.dump() + "\n");
  }

  void load_checkpoint() {
    std::ifstream in(s_.checkpoint, std::ios::binary);
    if (!in)
      throw InputError(s_.checkpoint.string() +
                       ": no checkpoint to resume from (run without --resume first)");
    json j;
    try {
      j = json::parse(in);
      const bool v1 = j.at("version") == 1;
      if (j.at("format") != kCheckpointFormat || (j.at("version") != kCheckpointVersion && !v1))
        throw InputError(s_.checkpoint.string() + ": not a fulmar checkpoint of version " +
                         std::to_string(kCheckpointVersion));
      if (j.at("fingerprint").get<std::string>() != s_.fingerprint)
        throw InputError(s_.checkpoint.string() +
                         ": the checkpoint belongs to another case (or the case file changed); "
                         "run without --resume to start afresh");
      prior_elapsed_ = j.at("elapsed_s").get<double>();
      const json& evals = j.at("evaluations");
      for (size_t i = 0; i < evals.size(); ++i) {
        json e = evals[i];
        if (v1 && e.is_object() && e.contains("detail"))
          e["detail"] = upgrade_v1_detail(e["detail"], p_.constraint_ids);
        Evaluation ev =
            evaluation_from_json(e, s_.checkpoint.string() + ": /evaluations/" + std::to_string(i));
        replay_[ev.x] = std::move(ev);
      }
    } catch (const json::exception& e) {
      throw InputError(s_.checkpoint.string() + ": damaged checkpoint (" + e.what() + ")");
    }
  }

  const SearchProblem& p_;
  const SearchSettings& s_;
  size_t n_;
  int threads_ = 1;
  std::vector<Evaluation> history_;
  bool scaled_ = false;                  // see kGradientScale
  std::vector<double> origin_, design_;  // start of the scaled variables; the current design
  std::map<std::vector<double>, size_t> cache_;
  std::map<std::vector<double>, Evaluation> replay_;
  Clock::time_point started_;
  double prior_elapsed_ = 0;
  int iterations_ = 0;
  int share_end_ = std::numeric_limits<int>::max();  // history size that ends this local search
  bool share_spent_ = false;
  int current_search_ = 0;
  // "from start k: " before a stop reason when there are several starts, "" otherwise.
  std::string search_label(int k) const {
    return p_.extra_starts.empty() ? std::string() : "from start " + std::to_string(k + 1) + ": ";
  }
  std::string finished_searches_;  // stop reasons of the finished local searches (several starts)
  int replayed_ = 0;
  std::string stop_reason_;
  bool interrupted_ = false;
  std::exception_ptr pending_error_;  // see guarded()
};

}  // namespace

json to_json(const Evaluation& e) {
  return json{{"x", e.x},   {"objective", e.objective}, {"constraints", e.constraints},
              {"ok", e.ok}, {"status", e.status},       {"detail", to_json(e.detail)}};
}

Evaluation evaluation_from_json(const json& j, const std::string& where) {
  using namespace json_read;
  Evaluation e;
  e.x = member(j, "x", where).get<std::vector<double>>();
  e.objective = number(j, "objective", where);
  e.constraints = member(j, "constraints", where).get<std::vector<double>>();
  e.ok = boolean(j, "ok", where);
  e.status = text(j, "status", where);
  e.detail = evaluation_record_from_json(member(j, "detail", where), where + "/detail");
  return e;
}

double worst_constraint(const Evaluation& e) {
  double w = -std::numeric_limits<double>::infinity();
  for (double c : e.constraints) w = std::max(w, c);
  return w;
}

int best_feasible(const std::vector<Evaluation>& history, double tolerance) {
  int best = -1;
  for (size_t i = 0; i < history.size(); ++i) {
    const Evaluation& e = history[i];
    if (!e.ok || worst_constraint(e) > tolerance) continue;
    if (best < 0 || e.objective < history[best].objective) best = int(i);
  }
  return best;
}

SearchResult run_search(const SearchProblem& problem, const SearchSettings& settings) {
  settings.options.Validate();
  const size_t n = problem.start.size();
  if (n == 0 || problem.lower.size() != n || problem.upper.size() != n)
    throw InputError("search: the bounds and the start design must have the same, non-zero size");
  for (size_t i = 0; i < n; ++i)
    if (!(problem.lower[i] < problem.upper[i]) || problem.start[i] < problem.lower[i] ||
        problem.start[i] > problem.upper[i])
      throw InputError("search: design variable " + std::to_string(i) + " = " +
                       num(problem.start[i]) + " lies outside its bounds [" +
                       num(problem.lower[i]) + ", " + num(problem.upper[i]) + "]");
  Search search(problem, settings);
  return search.run();
}

}  // namespace fulmar::optimize
