// A document's TF-IDF vector over title and body as one field (the default
// TF-IDF, FieldScoring::kJoint): a word's tf is the weighted sum of its
// fields' tfs, w_title * tf_title + w_body * tf_body, so with weights 1 and 1
// the vector is that of the title and text joined into one field. Its df is
// the live documents with the word in any weighted field.
#pragma once

#include <optional>
#include <unordered_map>
#include <vector>

#include "lode/index.h"
#include "lode/ranking.h"

namespace lode::rank {

struct JointStats {
  double norm = 1, max_tf = 0, avg_tf = 0, length = 0;  // length: sum of w_f * field length
};

class JointVectors {
 public:
  // REQUIRES: `reader` has an active read scope while this is used.
  JointVectors(IndexReader& reader, const SearchOptions& options) : reader_(reader), options_(options) {}

  // Norm (per the document-side SMART letters), max tf, average tf and
  // weighted length of `doc`'s joint vector, from the forward index.
  Result<JointStats> stats(DocId doc, const DocNorms& norms);
  // df of a word over the fields with a non-zero weight, given its term in
  // each field (nullopt: absent from that field).
  Result<std::uint64_t> word_df(const std::optional<TermInfo>& title, const std::optional<TermInfo>& body);

 private:
  // The key a term's word is merged under: the body term's id if the word
  // has one, else the term's own id. Cached per term for this query.
  Result<TermId> word_key(TermId id, Field field);
  // df of the word keyed `key` (doc-side idf other than 'n' only).
  Result<std::uint64_t> key_df(TermId key);

  IndexReader& reader_;
  const SearchOptions& options_;
  std::unordered_map<TermId, TermId> key_;                     // title term -> key
  std::unordered_map<TermId, std::uint64_t> df_;               // key -> df over weighted fields
  std::vector<std::pair<TermId, double>> merged_;              // scratch: (key, weighted tf)
};

}  // namespace lode::rank
