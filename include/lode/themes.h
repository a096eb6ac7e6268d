// lode/themes.h — topic groups: spherical k-means over TF-IDF vectors.
//
// Method: every live document's vector (lode/vectors.h) restricted to terms
// in at least `min_df` documents and l2-normalised again; spherical k-means
// (Dhillon & Modha 2001: centres are normalised sums, similarity is cosine)
// seeded with k-means++ (Arthur & Vassilvitskii 2007) from `seed`, Lloyd
// iterations until no document moves. Same index, options and seed => same
// groups.
//
// Suggested k (when k = 0): on a seeded sample of at most `sample`
// documents, k-means is run for every k in 2..max_k and the k with the
// highest mean silhouette (Rousseeuw 1987; distance 1 - cosine) is taken;
// ties go to the smaller k. The silhouettes are returned so the choice can
// be checked.
//
// Each group lists its size, its top terms (the heaviest entries of its
// centre, title and body weights of a word added) and its most central
// documents (largest cosine to the centre).
//
// Thread safety: find_themes opens its own read scope on `reader`, which must
// have none active; one thread at a time per reader.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "lode/index.h"
#include "lode/status.h"
#include "lode/vectors.h"

namespace lode {

struct ThemeOptions {
  VectorOptions vectors;
  std::size_t k = 0;               // groups; 0 = suggest one (see above)
  std::size_t max_k = 12;          // largest k tried when suggesting
  std::uint64_t seed = 1;
  std::size_t max_iterations = 100;
  std::uint64_t min_df = 2;        // a term in one document cannot link documents
  std::size_t sample = 1000;       // documents used to suggest k (silhouette is quadratic)
  std::size_t max_documents = 200000;  // above this, a seeded sample of this many is grouped
  std::size_t top_terms = 8;
  std::size_t top_documents = 3;
  Status check() const;            // InvalidArgument naming the bad option
};

struct ThemeTerm {
  std::string term;  // the analyzed term (a stem), for analysis
  std::string word;  // its most frequent word in the group's most central
                     // documents (lode/surface.h), for reading
  double weight = 0;
};

struct CentralDocument {
  DocId doc = 0;
  std::string external_id;
  std::string title;
  double similarity = 0;           // cosine to the group's centre
};

struct Theme {
  std::size_t size = 0;
  double cohesion = 0;             // mean cosine of its documents to the centre
  std::vector<ThemeTerm> terms;
  std::vector<CentralDocument> central;
};

struct ThemeReport {
  std::vector<Theme> themes;       // largest first (ties: lower group number)
  std::size_t k = 0;
  bool k_suggested = false;
  std::vector<std::pair<std::size_t, double>> silhouettes;  // (k, mean silhouette) when suggested
  double objective = 0;            // sum of cosines of documents to their centres
  std::size_t iterations = 0;
  bool converged = false;
  std::size_t documents = 0;       // documents grouped
  bool sampled = false;            // more live documents than max_documents
  std::vector<DocId> docs;         // documents grouped, ascending
  std::vector<std::uint32_t> group;  // group of docs[i], an index into themes
};

// Groups the live documents. InvalidArgument for bad options or when the
// index has fewer documents with terms than k; index read errors.
Result<ThemeReport> find_themes(IndexReader& reader, const ThemeOptions& options);

}  // namespace lode
