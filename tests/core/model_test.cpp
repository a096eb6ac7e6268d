// Model-based check: an index built through random adds, replacements and
// removals must score every query exactly as a brute-force BM25, BM25F
// (joint fields) and TF-IDF computed from a plain std::map model of the live
// documents.
#include <algorithm>
#include <cmath>
#include <random>
#include <set>

#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {

using Tokens = std::vector<std::string>;

struct BruteForce {
  std::map<std::string, Tokens> docs;    // external id -> body tokens
  std::map<std::string, Tokens> titles;  // external id -> title tokens (may be empty)

  // BM25F (Robertson, Zaragoza & Taylor 2004), one b for both fields: per word,
  // x = wt*tf_title/B_title + wb*tf_body/B_body, one saturation, idf from the
  // documents having the word in either field.
  std::map<std::string, double> bm25f(const Tokens& query, double k1, double b, double wt, double wb) const {
    double n = static_cast<double>(docs.size()), total_b = 0, total_t = 0;
    for (auto& [id, t] : docs) total_b += static_cast<double>(t.size());
    for (auto& [id, t] : titles) total_t += static_cast<double>(t.size());
    const double avg_b = total_b / n, avg_t = total_t / n;
    auto norm = [&](double len, double avg) { return avg > 0 ? 1 - b + b * len / avg : 1.0; };
    auto count = [](const Tokens& t, const std::string& w) { return static_cast<double>(std::count(t.begin(), t.end(), w)); };
    std::map<std::string, int> qtf;
    for (auto& w : query) ++qtf[w];
    std::map<std::string, double> out;
    for (auto& [id, body] : docs) {
      const Tokens& title = titles.at(id);
      double s = 0;
      bool any = false;
      for (auto& [w, q] : qtf) {
        double tf_t = count(title, w), tf_b = count(body, w);
        if (tf_t + tf_b == 0) continue;
        double df = 0;
        for (auto& [id2, b2] : docs) df += count(b2, w) + count(titles.at(id2), w) > 0;
        double idf = std::log(1 + (n - df + 0.5) / (df + 0.5));
        double x = 0;  // a field without the word adds nothing (its norm may be 0 when b = 1)
        if (tf_t > 0) x += wt * tf_t / norm(static_cast<double>(title.size()), avg_t);
        if (tf_b > 0) x += wb * tf_b / norm(static_cast<double>(body.size()), avg_b);
        s += q * idf * x * (k1 + 1) / (x + k1);
        any = true;
      }
      if (any) out[id] = s;
    }
    return out;
  }

  std::map<std::string, double> bm25(const Tokens& query, double k1, double b) const {
    double n = static_cast<double>(docs.size()), total = 0;
    for (auto& [id, t] : docs) total += static_cast<double>(t.size());
    double avg = total / n;
    std::map<std::string, int> qtf;
    for (auto& w : query) ++qtf[w];
    std::map<std::string, double> out;
    for (auto& [id, toks] : docs) {
      double s = 0;
      bool any = false;
      for (auto& [w, q] : qtf) {
        double tf = static_cast<double>(std::count(toks.begin(), toks.end(), w));
        if (tf == 0) continue;
        double df = 0;
        for (auto& [id2, t2] : docs) df += std::count(t2.begin(), t2.end(), w) > 0;
        double idf = std::log(1 + (n - df + 0.5) / (df + 0.5));
        double dl = static_cast<double>(toks.size());
        s += q * idf * tf * (k1 + 1) / (tf + k1 * (1 - b + b * dl / avg));
        any = true;
      }
      if (any) out[id] = s;
    }
    return out;
  }

  // ntc.ntc: raw tf times log10(N/df), cosine-normalised on both sides.
  std::map<std::string, double> ntc(const Tokens& query) const {
    double n = static_cast<double>(docs.size());
    std::map<std::string, double> df;
    for (auto& [id, t] : docs) {
      std::set<std::string> u(t.begin(), t.end());
      for (auto& w : u) df[w] += 1;
    }
    std::map<std::string, double> qv;
    for (auto& w : query)
      if (df.count(w)) qv[w] += 1;
    double qn = 0;
    for (auto& [w, tf] : qv) {
      tf *= std::log10(n / df[w]);
      qn += tf * tf;
    }
    std::map<std::string, double> out;
    for (auto& [id, toks] : docs) {
      std::map<std::string, double> dv;
      for (auto& w : toks) dv[w] += 1;
      double dn = 0, dot = 0;
      bool any = false;
      for (auto& [w, tf] : dv) {
        tf *= std::log10(n / df[w]);
        dn += tf * tf;
      }
      for (auto& [w, q] : qv)
        if (dv.count(w)) {
          any = true;
          if (qn > 0 && dn > 0) dot += q / std::sqrt(qn) * dv[w] / std::sqrt(dn);
        }
      if (any) out[id] = dot;
    }
    return out;
  }
};

std::string join(const Tokens& t) {
  std::string s;
  for (auto& w : t) (s += w) += ' ';
  return s;
}

}  // namespace

TEST_CASE("random adds, replacements and removals score exactly like a brute-force model") {
  std::mt19937 rng(20261202);
  std::vector<std::string> vocab;
  for (int i = 0; i < 40; ++i) vocab.push_back("w" + std::to_string(i) + "x");
  // Skewed word choice, so some terms span several 128-document blocks.
  std::vector<double> weights;
  for (int i = 0; i < 40; ++i) weights.push_back(1.0 / (i + 1));
  std::discrete_distribution<int> pick(weights.begin(), weights.end());
  auto random_doc = [&] {
    Tokens t(1 + rng() % 25);
    for (auto& w : t) w = vocab[static_cast<std::size_t>(pick(rng))];
    return t;
  };
  TempDir dir;
  std::string index = dir.str("m.sqlite");
  BruteForce model;
  WriterOptions wo;
  wo.batch_documents = 37;  // many commits, partial blocks refilled
  {
    auto w = IndexWriter::open(index, IndexSettings{AnalyzerOptions{"none", false}}, wo);
    REQUIRE(w.ok());
    for (int step = 0; step < 900; ++step) {
      std::string id = "f" + std::to_string(rng() % 400);
      FileRecord f{"/m/" + id, "/m", step, step, std::to_string(step), "text"};
      if (rng() % 10 == 0 && model.docs.count(id)) {
        REQUIRE((*w)->remove_file(f.path).ok());
        model.docs.erase(id);
        model.titles.erase(id);
      } else {
        Tokens t = random_doc();
        Tokens title;  // a third of the documents have no title
        if (rng() % 3 != 0) title = random_doc();
        title.resize(std::min<std::size_t>(title.size(), 1 + rng() % 5));
        REQUIRE((*w)->put_file(f, {doc_input(id, join(title), join(t))}).ok());
        model.docs[id] = t;
        model.titles[id] = title;
      }
    }
    REQUIRE((*w)->commit().ok());
    CHECK((*w)->stats().documents == model.docs.size());
  }
  auto reader = IndexReader::open(index);
  REQUIRE(reader.ok());
  for (int qi = 0; qi < 40; ++qi) {
    Tokens q(1 + rng() % 4);
    for (auto& w : q) w = vocab[rng() % vocab.size()];
    CAPTURE(join(q));
    SearchOptions o;
    o.field_weight = {0.0, 1.0};
    o.bm25 = {0.5 + static_cast<double>(rng() % 20) / 10.0, static_cast<double>(rng() % 11) / 10.0};
    auto want = model.bm25(q, o.bm25.k1, o.bm25.b);
    auto got = scores_of(**reader, join(q), o);
    REQUIRE(got.size() == want.size());
    for (auto& [id, s] : want) CHECK(std::abs(got[id] - s) < 1e-9);

    SearchOptions joint;  // BM25F with both fields, random weights
    joint.fields = FieldScoring::kJoint;
    joint.bm25 = o.bm25;
    joint.field_weight = {0.25 + static_cast<double>(rng() % 16) / 4.0, 0.5 + static_cast<double>(rng() % 4) / 2.0};
    auto want_f = model.bm25f(q, joint.bm25.k1, joint.bm25.b, joint.field_weight[0], joint.field_weight[1]);
    auto got_f = scores_of(**reader, join(q), joint);
    REQUIRE(got_f.size() == want_f.size());
    for (auto& [id, s] : want_f) CHECK(std::abs(got_f[id] - s) < 1e-9);

    o.model = Model::kTfIdf;
    o.smart = SmartWeighting::parse("ntc.ntc").value();
    auto want_t = model.ntc(q);
    auto got_t = scores_of(**reader, join(q), o);
    REQUIRE(got_t.size() == want_t.size());
    for (auto& [id, s] : want_t) CHECK(std::abs(got_t[id] - s) < 1e-9);
  }
}
