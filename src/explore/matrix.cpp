// Matrix Market export of the document-term matrix (format and weights in
// lode/matrix.h). Two passes over the forward index: df, then weights.
#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <unordered_map>

#include "explore/letters.h"
#include "explore/top_n.h"
#include "lode/matrix.h"
#include "lode/ranking.h"
#include "lode/vectors.h"

namespace lode {

Status MatrixOptions::check() const {
  LODE_RETURN_IF_ERROR(explore::check_letters(tf, idf, log_base, "matrix"));
  if (!fields[0] && !fields[1]) return Status::InvalidArgument("choose at least one field");
  if (!(max_df > 0 && max_df <= 1)) return Status::InvalidArgument("max df must be a share in (0, 1]");
  return Status();
}

namespace {

// A file written under "<path>.tmp" and renamed by commit(); removed otherwise.
class OutFile {
 public:
  explicit OutFile(std::string path) : path_(std::move(path)), tmp_(path_ + ".tmp") {
    f_ = std::fopen(tmp_.c_str(), "wb");
  }
  ~OutFile() {
    if (f_) std::fclose(f_);
    if (!done_) std::remove(tmp_.c_str());
  }
  Status opened() const { return f_ ? Status() : Status::IOError("cannot write " + tmp_); }
  void put(std::string_view s) { std::fwrite(s.data(), 1, s.size(), f_); }
  Status commit() {
    bool ok = std::ferror(f_) == 0;
    ok = std::fclose(f_) == 0 && ok;
    f_ = nullptr;
    if (!ok) return Status::IOError("writing " + tmp_ + " failed (disk full?)");
    std::error_code ec;
    std::filesystem::rename(tmp_, path_, ec);
    if (ec) return Status::IOError("cannot rename " + tmp_ + " to " + path_ + ": " + ec.message());
    done_ = true;
    return Status();
  }

 private:
  std::string path_, tmp_;
  std::FILE* f_ = nullptr;
  bool done_ = false;
};

std::string escape_id(std::string_view id) {
  std::string out;
  for (char c : id) {
    switch (c) {
      case '\\': out += "\\\\"; break;
      case '\t': out += "\\t"; break;
      case '\n': out += "\\n"; break;
      case '\r': out += "\\r"; break;
      default: out += c;
    }
  }
  return out;
}

// Words of the chosen fields, numbered in order of first sight ("keys").
struct Keys {
  std::unordered_map<TermId, std::uint32_t> of_term;
  std::unordered_map<std::string, std::uint32_t> of_word;
  std::vector<std::string> words;
  std::vector<std::uint64_t> df;
};

// (key, tf) of one document over the chosen fields, keys ascending and merged.
Status doc_keys(IndexReader& reader, DocId doc, const MatrixOptions& o, Keys& keys,
                std::vector<std::pair<std::uint32_t, std::uint32_t>>& out, double& length) {
  out.clear();
  length = 0;
  for (Field f : kAllFields) {
    if (!o.fields[static_cast<std::size_t>(f)]) continue;
    length += reader.length(doc, f);
    auto fwd = reader.forward(doc, f);
    if (!fwd) return fwd.status();
    for (auto& [id, tf] : *fwd) {
      auto it = keys.of_term.find(id);
      if (it == keys.of_term.end()) {
        auto info = reader.term_by_id(id);
        if (!info) return info.status();
        auto [w, added] = keys.of_word.emplace(info->term, static_cast<std::uint32_t>(keys.words.size()));
        if (added) {
          keys.words.push_back(info->term);
          keys.df.push_back(0);
        }
        it = keys.of_term.emplace(id, w->second).first;
      }
      out.emplace_back(it->second, tf);
    }
  }
  std::sort(out.begin(), out.end());
  std::size_t w = 0;
  for (std::size_t r = 0; r < out.size(); ++r) {
    if (w > 0 && out[w - 1].first == out[r].first) out[w - 1].second += out[r].second;
    else out[w++] = out[r];
  }
  out.resize(w);
  return Status();
}

// Kept keys as columns (byte order of the word); column[key] = -1 if dropped.
std::vector<std::uint32_t> choose_columns(const Keys& keys, const MatrixOptions& o, double n_docs) {
  std::vector<std::uint32_t> kept;
  for (std::uint32_t k = 0; k < keys.words.size(); ++k) {
    double df = static_cast<double>(keys.df[k]);
    if (keys.df[k] >= o.min_df && df <= o.max_df * n_docs) kept.push_back(k);
  }
  if (o.max_terms > 0)
    explore::keep_top(kept, o.max_terms, [&](std::uint32_t a, std::uint32_t b) {
      return keys.df[a] != keys.df[b] ? keys.df[a] > keys.df[b] : keys.words[a] < keys.words[b];
    });
  std::sort(kept.begin(), kept.end(), [&](std::uint32_t a, std::uint32_t b) { return keys.words[a] < keys.words[b]; });
  return kept;
}

void put_number(OutFile& f, double v) {
  char buf[64];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  f.put(std::string_view(buf, static_cast<std::size_t>(r.ptr - buf)));
}

}  // namespace

Result<MatrixSummary> export_matrix(IndexReader& reader, const MatrixOptions& o, const MatrixFiles& files) {
  LODE_RETURN_IF_ERROR(o.check());
  auto scope = reader.begin();
  if (!scope) return scope.status();
  std::vector<DocId> docs = live_documents(reader);
  const double n = static_cast<double>(docs.size());

  // Pass 1: df of every word over the exported rows.
  Keys keys;
  std::vector<std::pair<std::uint32_t, std::uint32_t>> row;
  double length = 0;
  for (std::size_t i = 0; i < docs.size(); ++i) {
    LODE_RETURN_IF_ERROR(doc_keys(reader, docs[i], o, keys, row, length));
    for (auto& [k, tf] : row) ++keys.df[k];
    if (o.progress && (i % 4096 == 0 || i + 1 == docs.size())) o.progress(i + 1, docs.size());
  }
  std::vector<std::uint32_t> columns = choose_columns(keys, o, n);
  std::vector<std::int64_t> column_of(keys.words.size(), -1);
  std::vector<double> idf(keys.words.size(), 0.0);
  MatrixSummary sum;
  sum.rows = docs.size();
  sum.columns = columns.size();
  for (std::size_t j = 0; j < columns.size(); ++j) {
    std::uint32_t k = columns[j];
    column_of[k] = static_cast<std::int64_t>(j);
    idf[k] = smart_idf(o.idf, n, static_cast<double>(keys.df[k]), o.log_base);
    if (idf[k] > 0) sum.entries += keys.df[k];  // a column with idf 0 holds no entries
  }

  OutFile mtx(files.matrix), vocab(files.vocabulary), ids(files.documents);
  LODE_RETURN_IF_ERROR(mtx.opened());
  LODE_RETURN_IF_ERROR(vocab.opened());
  LODE_RETURN_IF_ERROR(ids.opened());
  for (std::uint32_t k : columns) vocab.put(keys.words[k] + "\n");
  char head[512];
  std::snprintf(head, sizeof head,
                "%%%%MatrixMarket matrix coordinate real general\n"
                "%% lode document-term matrix: rows = documents, columns = terms\n"
                "%% tf %c, idf %c, log base %.17g, norm %s, fields%s%s, min df %llu, max df %.17g, max terms %zu\n"
                "%zu %zu %zu\n",
                o.tf, o.idf, o.log_base, o.l2 ? "l2" : "none", o.fields[0] ? " title" : "",
                o.fields[1] ? " body" : "", static_cast<unsigned long long>(o.min_df), o.max_df, o.max_terms,
                sum.rows, sum.columns, sum.entries);
  mtx.put(head);

  // Pass 2: weights, row by row.
  std::vector<std::pair<std::int64_t, double>> entries;
  for (std::size_t i = 0; i < docs.size(); ++i) {
    auto info = reader.document(docs[i]);
    if (!info) return info.status();
    ids.put(escape_id(info->external_id) + "\n");
    LODE_RETURN_IF_ERROR(doc_keys(reader, docs[i], o, keys, row, length));
    double max_tf = 0, sum_tf = 0;
    for (auto& [k, tf] : row) max_tf = std::max(max_tf, static_cast<double>(tf)), sum_tf += tf;
    double avg_tf = row.empty() ? 0 : sum_tf / static_cast<double>(row.size());
    entries.clear();
    double sq = 0;
    for (auto& [k, tf] : row) {
      if (k >= column_of.size() || column_of[k] < 0 || idf[k] <= 0) continue;
      double w = smart_tf(o.tf, tf, max_tf, avg_tf, length, o.log_base) * idf[k];
      entries.emplace_back(column_of[k], w);
      sq += w * w;
    }
    std::sort(entries.begin(), entries.end());
    double norm = o.l2 && sq > 0 ? std::sqrt(sq) : 1.0;
    std::string line;
    for (auto& [j, w] : entries) {
      mtx.put(std::to_string(i + 1) + " " + std::to_string(j + 1) + " ");
      put_number(mtx, w / norm);
      mtx.put("\n");
    }
    if (o.progress && (i % 4096 == 0 || i + 1 == docs.size())) o.progress(i + 1, docs.size());
  }
  LODE_RETURN_IF_ERROR(mtx.commit());
  LODE_RETURN_IF_ERROR(vocab.commit());
  LODE_RETURN_IF_ERROR(ids.commit());
  return sum;
}

}  // namespace lode
