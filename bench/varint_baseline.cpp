#include "varint_baseline.h"

#include <algorithm>

#include "lode/ranking.h"

namespace lode::bench {
namespace {

void put_varint(std::string& out, std::uint32_t v) {
  while (v >= 0x80) {
    out.push_back(static_cast<char>((v & 0x7f) | 0x80));
    v >>= 7;
  }
  out.push_back(static_cast<char>(v));
}

inline const unsigned char* get_varint(const unsigned char* p, std::uint32_t& v) {
  std::uint32_t x = 0;
  for (int shift = 0;; shift += 7) {
    const unsigned char b = *p++;
    x |= static_cast<std::uint32_t>(b & 0x7f) << shift;
    if (!(b & 0x80)) break;
  }
  v = x;
  return p;
}

}  // namespace

std::vector<std::string> VarintBaseline::terms_of(const std::string& query) const {
  std::string words = query;
  for (char& c : words)
    if (c == '"' || c == '+' || c == '-') c = ' ';
  std::vector<std::string> out;
  for (auto& t : analyzer_->analyze(words).tokens)
    if (std::find(out.begin(), out.end(), t.term) == out.end()) out.push_back(t.term);
  return out;
}

Result<VarintBaseline> VarintBaseline::build(IndexReader& reader, Analyzer& analyzer,
                                             const std::vector<std::string>& queries) {
  VarintBaseline b;
  b.analyzer_ = &analyzer;
  auto norms = reader.norms();
  if (!norms) return norms.status();
  const DocId limit = (*norms)->limit();
  b.length_.resize(limit);
  for (DocId d = 0; d < limit; ++d) b.length_[d] = (*norms)->live(d) ? (*norms)->length(d, Field::kBody) : 0;
  const CollectionStats stats = reader.stats();
  b.average_ = stats.average_length(Field::kBody);
  b.acc_.assign(limit, 0.0f);
  for (const std::string& q : queries)
    for (const std::string& word : b.terms_of(q)) {
      if (b.terms_.count(word)) continue;
      Term t;
      auto info = reader.term(Field::kBody, word);
      if (!info) return info.status();
      if (info->has_value() && (*info)->df > 0) {
        t.idf = bm25_idf(static_cast<double>(stats.documents), static_cast<double>((*info)->df));
        auto c = reader.postings(**info);
        DocId prev = 0;
        for (; c->valid(); c->next()) {
          if (!(*norms)->live(c->doc())) continue;
          put_varint(t.blob, c->doc() - prev);
          put_varint(t.blob, c->tf());
          prev = c->doc();
        }
        LODE_RETURN_IF_ERROR(c->status());
      }
      b.terms_.emplace(word, std::move(t));
    }
  return b;
}

long long VarintBaseline::run(const std::string& query, std::size_t k) {
  constexpr double k1 = 1.2, bp = 0.75;
  touched_.clear();
  for (const std::string& word : terms_of(query)) {
    auto it = terms_.find(word);
    if (it == terms_.end() || it->second.blob.empty()) continue;
    const Term& t = it->second;
    const auto* p = reinterpret_cast<const unsigned char*>(t.blob.data());
    const auto* end = p + t.blob.size();
    DocId doc = 0;
    while (p < end) {
      std::uint32_t gap = 0, tf = 0;
      p = get_varint(p, gap);
      p = get_varint(p, tf);
      doc += gap;
      const double norm = k1 * (1 - bp + bp * length_[doc] / average_);
      if (acc_[doc] == 0.0f) touched_.push_back(doc);
      acc_[doc] += static_cast<float>(t.idf * tf * (k1 + 1) / (tf + norm));
    }
  }
  const std::size_t keep = std::min(k, touched_.size());
  std::partial_sort(touched_.begin(), touched_.begin() + static_cast<std::ptrdiff_t>(keep), touched_.end(),
                    [&](DocId a, DocId c) { return acc_[a] != acc_[c] ? acc_[a] > acc_[c] : a < c; });
  const auto scored = static_cast<long long>(touched_.size());
  for (DocId d : touched_) acc_[d] = 0.0f;
  return scored;
}

std::size_t VarintBaseline::bytes() const {
  std::size_t total = length_.size() * 4 + acc_.size() * 4;
  for (auto& [w, t] : terms_) total += t.blob.size();
  return total;
}

}  // namespace lode::bench
