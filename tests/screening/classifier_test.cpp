// The sift classifier (liblinear through lode/screening.h) against
// scikit-learn's LogisticRegression (Debian python3-sklearn) on the same
// TF-IDF features, read from a real index's forward index.
#include "explore/fixture.h"
#include "lode/screening.h"

using namespace lode;
using namespace lode::test;

namespace {

struct Features {
  std::vector<SparseVector> rows;
  std::vector<bool> labels;
};

// Every document of the harbour notes, labelled relevant when it mentions storms or gales.
Features harbour_features(const TempDir& dir) {
  auto reader = open_built(dir, "f.sqlite", bodies(kHarbourNotes), kPlainWords);
  auto scope = reader->begin();
  REQUIRE(scope.ok());
  VectorSource source(*reader, VectorOptions{});
  Features f;
  for (DocId d : live_documents(*reader)) {
    auto v = source.document(d);
    REQUIRE(v.ok());
    f.rows.push_back(*v);
    const std::string& text = kHarbourNotes[d - 1];
    f.labels.push_back(text.find("storm") != std::string::npos || text.find("gale") != std::string::npos);
  }
  return f;
}

nlohmann::json reference(const TempDir& dir, const Features& f, double c) {
  nlohmann::json in = {{"C", c}, {"labels", nlohmann::json::array()}, {"rows", nlohmann::json::array()}};
  for (std::size_t i = 0; i < f.rows.size(); ++i) {
    nlohmann::json row = nlohmann::json::object();
    for (auto& e : f.rows[i]) row[std::to_string(e.term)] = e.weight;
    in["rows"].push_back(row);
    in["labels"].push_back(f.labels[i] ? 1 : 0);
  }
  return python_reference("tests/scripts/sklearn_logistic.py", dir, in);
}

void compare(const LinearModel& m, const nlohmann::json& ref, const Features& f, double tol) {
  for (auto& [col, w] : ref["coef"].items()) {
    auto it = m.weights.find(std::stoll(col));
    double mine = it == m.weights.end() ? 0.0 : it->second;
    CHECK_MESSAGE(mine == doctest::Approx(w.get<double>()).epsilon(tol).scale(1.0), "term " << col);
  }
  CHECK(m.intercept == doctest::Approx(ref["intercept"].get<double>()).epsilon(tol).scale(1.0));
  for (std::size_t i = 0; i < f.rows.size(); ++i)
    CHECK(m.score(f.rows[i]) == doctest::Approx(ref["decision"][i].get<double>()).epsilon(tol).scale(1.0));
}

}  // namespace

TEST_CASE("classifier: weights and decision values equal scikit-learn's lbfgs fit without intercept") {
  TempDir dir;
  Features f = harbour_features(dir);
  std::vector<const SparseVector*> x;
  for (auto& r : f.rows) x.push_back(&r);
  for (double c : {1.0, 10.0}) {
    ClassifierOptions o;
    o.cost = c;
    o.intercept = false;
    o.tolerance = 1e-8;
    auto m = train_logistic(x, f.labels, o);
    REQUIRE_MESSAGE(m.ok(), m.status().to_string());
    // Same convex objective, two optimisers: agreement to 1e-5 (absolute).
    compare(*m, reference(dir, f, c)["plain"], f, 1e-5);
  }
}

TEST_CASE("classifier: with an intercept it equals scikit-learn's liblinear fit") {
  TempDir dir;
  Features f = harbour_features(dir);
  std::vector<const SparseVector*> x;
  for (auto& r : f.rows) x.push_back(&r);
  ClassifierOptions o;
  o.tolerance = 1e-8;
  auto m = train_logistic(x, f.labels, o);
  REQUIRE(m.ok());
  compare(*m, reference(dir, f, 1.0)["intercept"], f, 1e-4);
  // The storm notes score above the others (the point of the classifier).
  double worst_relevant = 1e9, best_other = -1e9;
  for (std::size_t i = 0; i < f.rows.size(); ++i)
    (f.labels[i] ? worst_relevant : best_other) =
        f.labels[i] ? std::min(worst_relevant, m->score(f.rows[i])) : std::max(best_other, m->score(f.rows[i]));
  CHECK(worst_relevant > best_other);
}

TEST_CASE("classifier: one class only or mismatched sizes are refused") {
  SparseVector a = {{1, 1.0}};
  auto one = train_logistic({&a, &a}, {true, true}, {});
  CHECK(one.status().code() == Code::kInvalidArgument);
  auto sizes = train_logistic({&a}, {true, false}, {});
  CHECK(sizes.status().code() == Code::kInvalidArgument);
}
