// The seeded query set of bench_query (see query_set.h).
#include "query_set.h"

#include <algorithm>
#include <cmath>

namespace lode::bench {
namespace {

struct Candidate {
  std::string surface;
  std::uint64_t df;
};

// A random live document's stored body, or "" after a few misses.
Result<std::string> random_body(IndexReader& reader, Rng& rng) {
  const DocId limit = reader.doc_id_limit();
  for (int attempt = 0; attempt < 64 && limit > 1; ++attempt) {
    const auto doc = static_cast<DocId>(1 + rng.below(limit - 1));
    if (!reader.live(doc)) continue;
    auto body = reader.stored_text(doc, Field::kBody);
    if (!body) return body.status();
    if (!body->empty()) return body;
  }
  return std::string();
}

// 2-3 adjacent words of one sentence of a random document, or "".
Result<std::string> random_phrase(IndexReader& reader, Analyzer& analyzer, Rng& rng) {
  for (int attempt = 0; attempt < 32; ++attempt) {
    auto body = random_body(reader, rng);
    if (!body) return body.status();
    std::vector<Token> words = analyzer.words(*body);
    const std::size_t len = rng.between(2, 3);
    if (words.size() < len) continue;
    const std::size_t i = rng.below(words.size() - len + 1);
    std::string text = body->substr(words[i].begin, words[i + len - 1].end - words[i].begin);
    if (text.find_first_of(".,;:!?\"()\xE2") != std::string::npos) continue;  // crosses punctuation
    std::replace(text.begin(), text.end(), '\n', ' ');
    text.insert(text.begin(), '"');
    text += '"';
    return text;
  }
  return std::string();
}

Result<std::string> candidate_word(IndexReader& reader, Analyzer& analyzer, const Vocabulary* vocab, Rng& rng) {
  if (vocab) {  // log-uniform rank: as many draws from ranks 10-100 as from 1000-10000
    const double top = std::log(static_cast<double>(vocab->lemma_count()));
    const auto rank = static_cast<std::size_t>(std::exp(rng.uniform() * top));
    return std::string(vocab->sample_form(std::min(rank, vocab->lemma_count() - 1), rng));
  }
  auto body = random_body(reader, rng);
  if (!body) return body.status();
  std::vector<Token> words = analyzer.words(*body);
  if (words.empty()) return std::string();
  const Token& t = words[rng.below(words.size())];
  return body->substr(t.begin, t.end - t.begin);
}

}  // namespace

Result<std::vector<BenchQuery>> make_query_set(IndexReader& reader, Analyzer& analyzer,
                                               const QuerySetOptions& options) {
  auto scope = reader.begin();
  if (!scope) return scope.status();
  if (reader.stats().documents == 0) return Status::InvalidArgument(reader.path() + ": the index is empty");
  Rng rng(options.seed);

  std::vector<Candidate> pool;
  for (std::size_t i = 0; i < options.candidates; ++i) {
    auto word = candidate_word(reader, analyzer, options.vocabulary, rng);
    if (!word) return word.status();
    Analyzer::Analyzed a = analyzer.analyze(*word);
    if (a.tokens.size() != 1) continue;  // stopwords and words that split
    auto info = reader.term(Field::kBody, a.tokens[0].term);
    if (!info) return info.status();
    if (!info->has_value() || (*info)->df == 0) continue;
    pool.push_back({std::move(word.value()), (*info)->df});
  }
  if (pool.size() < 3) return Status::InvalidArgument(reader.path() + ": too few indexed words to build queries");
  std::stable_sort(pool.begin(), pool.end(), [](const Candidate& x, const Candidate& y) { return x.df > y.df; });
  const std::size_t third = pool.size() / 3;
  // Each pick is its own statement: the order of operands of + is unspecified,
  // and the set must be the same with every compiler.
  auto frequent = [&] { return pool[rng.below(third)].surface; };
  auto rare = [&] { return pool[pool.size() - 1 - rng.below(third)].surface; };
  auto add = [](std::string& q, std::string_view prefix, const std::string& word) {
    if (!q.empty()) q += ' ';
    q += prefix;
    q += word;
  };
  auto words = [&](std::string& q, std::size_t n, auto pick) {
    for (std::size_t i = 0; i < n; ++i) add(q, "", pick());
  };

  std::vector<BenchQuery> out;
  for (std::size_t i = 0; i < options.count; ++i) {
    const double r = static_cast<double>(i) / static_cast<double>(options.count);  // fixed shares
    BenchQuery q;
    if (r < 0.30) {
      q.kind = "frequent";
      words(q.text, rng.between(1, 4), frequent);
    } else if (r < 0.55) {
      q.kind = "rare";
      words(q.text, rng.between(1, 4), rare);
    } else if (r < 0.80) {
      q.kind = "mixed";
      words(q.text, rng.between(1, 2), frequent);
      words(q.text, rng.between(1, 2), rare);
    } else if (r < 0.85) {
      q.kind = "required";
      add(q.text, "+", frequent());
      add(q.text, "", rare());
    } else if (r < 0.90) {
      q.kind = "excluded";
      words(q.text, 2, frequent);
      add(q.text, "-", frequent());
    }
    else {
      auto phrase = random_phrase(reader, analyzer, rng);
      if (!phrase) return phrase.status();
      q.kind = phrase->empty() ? "frequent" : "phrase";
      if (phrase->empty()) words(q.text, 2, frequent);
      else q.text = std::move(phrase.value());
    }
    out.push_back(std::move(q));
  }
  // Interleave the kinds so a cache warmed by one kind does not favour the next.
  for (std::size_t i = out.size(); i > 1; --i) std::swap(out[i - 1], out[rng.below(i)]);
  return out;
}

}  // namespace lode::bench
