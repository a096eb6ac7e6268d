// The writer's posting batch against a plain std::map model: every term's
// run must list exactly its documents in order, with their tf and positions,
// and new terms must get ids by first use, then alphabetically within one
// document field (so ids do not depend on where batches end).
#include <doctest/doctest.h>

#include <algorithm>
#include <map>
#include <random>
#include <set>
#include <string>
#include <vector>

#include "index/posting_batch.h"
#include "index/radix_sort.h"

using namespace lode;

namespace {

struct Occurrences {
  std::uint32_t tf = 0;
  std::vector<std::uint32_t> positions;
};
using Key = std::pair<Field, std::string>;

// Positions from the stored form: varint deltas from 0 within one document.
std::vector<std::uint32_t> decode(const std::string& bytes) {
  std::vector<std::uint32_t> out;
  std::uint32_t value = 0, shift = 0, last = 0;
  for (char c : bytes) {
    const auto b = static_cast<unsigned char>(c);
    value |= static_cast<std::uint32_t>(b & 0x7f) << shift;
    shift += 7;
    if (b < 0x80) {
      last += value;
      out.push_back(last);
      value = shift = 0;
    }
  }
  return out;
}

}  // namespace

TEST_CASE("posting batch: runs, tf, positions and id order equal a map model") {
  std::mt19937 rng(77);
  PostingBatch batch;
  std::map<Key, std::map<DocId, Occurrences>> model;
  std::vector<Key> first_use;  // expected id order
  std::set<Key> seen;
  const DocId first_doc = 41;
  for (DocId doc = first_doc; doc < first_doc + 300; ++doc) {
    batch.begin_document(doc);
    for (Field f : kAllFields) {
      std::vector<Token> tokens;
      const std::size_t n = f == Field::kTitle ? rng() % 4 : rng() % 80;
      // Positions ascend with gaps (stopwords take positions); a few are huge.
      std::uint32_t position = doc % 7 == 0 ? 0x7FFFFFF0u - 200 : 0;
      for (std::size_t i = 0; i < n; ++i) {
        position += 1 + static_cast<std::uint32_t>(rng() % 3);
        const std::string term = "t" + std::to_string(rng() % 15 == 0 ? rng() % 2000 : rng() % 40);
        tokens.push_back(Token{term, position, 0, 0});
        Occurrences& o = model[{f, term}][doc];
        ++o.tf;
        o.positions.push_back(position);
      }
      REQUIRE(batch.add_field(f, tokens).ok());
      std::set<std::string> fresh;  // this field's new terms, alphabetical
      for (const Token& t : tokens)
        if (!seen.count({f, t.term})) fresh.insert(t.term);
      for (const std::string& t : fresh) {
        first_use.push_back({f, t});
        seen.insert({f, t});
      }
    }
  }
  REQUIRE(batch.term_count() == model.size());
  REQUIRE(batch.documents() == 300);

  const std::vector<std::uint32_t> order = batch.id_order();
  REQUIRE(order.size() == first_use.size());
  for (std::size_t k = 0; k < order.size(); ++k) {
    CHECK(batch.term(order[k]).field == first_use[k].first);
    CHECK(batch.term(order[k]).term == first_use[k].second);
  }

  const PostingBatch::Runs runs = batch.group(order);
  for (std::size_t k = 0, begin = 0; k < order.size(); begin = runs.end[k++]) {
    const PostingBatch::Term& t = batch.term(order[k]);
    CAPTURE(t.term);
    const auto& want = model.at({t.field, t.term});
    REQUIRE(runs.end[k] - begin == want.size());
    CHECK(t.df == want.size());
    std::uint64_t cf = 0;
    auto it = want.begin();
    for (std::size_t p = begin; p < runs.end[k]; ++p, ++it) {
      const PostingBatch::Posting& posting = runs.postings[p];
      CHECK(posting.doc == it->first);
      CHECK(runs.tf(posting) == it->second.tf);
      std::string bytes;
      batch.append_positions(bytes, runs, posting);
      CHECK(decode(bytes) == it->second.positions);
      cf += it->second.tf;
    }
    CHECK(t.cf == cf);
  }
  for (std::size_t d = 0; d < batch.documents(); ++d) CHECK(batch.doc(d).id == first_doc + d);
  CHECK(batch.bytes() > 0);
  batch.clear();
  CHECK(batch.term_count() == 0);
  CHECK(batch.documents() == 0);
}

TEST_CASE("radix_sort_by_bits equals std::stable_sort on the same bits") {
  std::mt19937_64 rng(99);
  std::vector<std::uint64_t> scratch;
  // Sizes around the insertion-sort cut-off; key ranges of one to all 64
  // bits, including a range with one value only (no word moves).
  for (std::size_t n : {0u, 1u, 2u, 31u, 32u, 33u, 500u, 5000u}) {
    for (auto [low, high] : {std::pair{32u, 51u}, std::pair{32u, 33u}, std::pair{0u, 64u}, std::pair{4u, 12u},
                             std::pair{40u, 41u}}) {
      CAPTURE(n);
      CAPTURE(low);
      CAPTURE(high);
      std::vector<std::uint64_t> words(n);
      for (auto& w : words) w = rng() & (n > 100 ? ~std::uint64_t{0} : 0xFFFF0000FFFFull);
      const std::uint64_t mask = high - low >= 64 ? ~std::uint64_t{0} : (std::uint64_t{1} << (high - low)) - 1;
      std::vector<std::uint64_t> expect = words;
      std::stable_sort(expect.begin(), expect.end(),
                       [&](std::uint64_t a, std::uint64_t b) { return ((a >> low) & mask) < ((b >> low) & mask); });
      lode::radix_sort_by_bits(words, scratch, low, high);
      CHECK(words == expect);
    }
  }
}
