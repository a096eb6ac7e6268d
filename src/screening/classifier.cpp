// Logistic regression through liblinear (lode/screening.h). liblinear wants
// dense 1-based feature numbers; TermIds are sparse and 64-bit, so each
// training run numbers the terms it sees.
#include <linear.h>

#include <algorithm>
#include <mutex>

#include "lode/screening.h"

namespace lode {
namespace {

// liblinear prints progress through one process-wide function pointer; it is
// set once to a no-op (the library's only global, and ours never changes it).
void quiet(const char*) {}
void silence_liblinear() {
  static std::once_flag once;
  std::call_once(once, [] { set_print_string_function(quiet); });
}

struct ModelDeleter {
  void operator()(model* m) const { free_and_destroy_model(&m); }
};

}  // namespace

double LinearModel::score(const SparseVector& x) const {
  double s = intercept;
  for (const TermWeight& e : x) {
    auto it = weights.find(e.term);
    if (it != weights.end()) s += it->second * e.weight;
  }
  return s;
}

Result<LinearModel> train_logistic(const std::vector<const SparseVector*>& examples,
                                   const std::vector<bool>& relevant, const ClassifierOptions& options) {
  if (examples.size() != relevant.size())
    return Status::InvalidArgument("classifier: " + std::to_string(examples.size()) + " examples but " +
                                   std::to_string(relevant.size()) + " labels");
  std::size_t positives = 0;
  for (bool r : relevant) positives += r ? 1 : 0;
  if (positives == 0 || positives == relevant.size())
    return Status::InvalidArgument("classifier: training needs both relevant and not relevant examples");
  if (!(options.cost > 0) || !(options.tolerance > 0))
    return Status::InvalidArgument("classifier: cost and tolerance must be above 0");
  silence_liblinear();

  std::unordered_map<TermId, int> column;
  std::vector<TermId> term_of;  // column - 1 -> term
  std::vector<std::vector<feature_node>> rows(examples.size());
  std::vector<feature_node*> row_ptr(examples.size());
  std::vector<double> y(examples.size());
  for (std::size_t i = 0; i < examples.size(); ++i) {
    auto& row = rows[i];
    for (const TermWeight& e : *examples[i]) {
      auto [it, fresh] = column.emplace(e.term, static_cast<int>(term_of.size()) + 1);
      if (fresh) term_of.push_back(e.term);
      row.push_back({it->second, e.weight});
    }
    std::sort(row.begin(), row.end(), [](const feature_node& a, const feature_node& b) { return a.index < b.index; });
    y[i] = relevant[i] ? 1.0 : -1.0;
  }
  int n = static_cast<int>(term_of.size());
  for (auto& row : rows) {
    if (options.intercept) row.push_back({n + 1, 1.0});
    row.push_back({-1, 0.0});
  }
  for (std::size_t i = 0; i < rows.size(); ++i) row_ptr[i] = rows[i].data();

  problem prob{};
  prob.l = static_cast<int>(examples.size());
  prob.n = options.intercept ? n + 1 : n;
  prob.y = y.data();
  prob.x = row_ptr.data();
  prob.bias = options.intercept ? 1.0 : -1.0;
  parameter param{};
  param.solver_type = L2R_LR;
  param.eps = options.tolerance;
  param.C = options.cost;
  if (const char* bad = check_parameter(&prob, &param)) return Status::InvalidArgument(std::string("liblinear: ") + bad);
  std::unique_ptr<model, ModelDeleter> m(train(&prob, &param));
  if (!m) return Status::IOError("liblinear: training failed");

  // Decision values are positive for the model's first label.
  double sign = m->label[0] == 1 ? 1.0 : -1.0;
  LinearModel out;
  for (int c = 0; c < n; ++c) {
    double w = sign * get_decfun_coef(m.get(), c + 1, 0);
    if (w != 0) out.weights.emplace(term_of[static_cast<std::size_t>(c)], w);
  }
  if (options.intercept) out.intercept = sign * get_decfun_bias(m.get(), 0);
  return out;
}

}  // namespace lode
