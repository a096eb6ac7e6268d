// Analyzer: segmentation -> folding -> stopwords -> stemming (lode/analysis.h).
#include <algorithm>
#include <cstring>
#include <string>
#include <unordered_set>
#include <utility>

#include "analysis/segment.h"
#include "analysis/stem_cache.h"
#include "analysis/stemmer.h"
#include "analysis/stopwords.h"
#include "lode/analysis.h"

namespace lode {
namespace {

using analysis::WordSink;

// Up to ~100k distinct words: a few MB, and most text's vocabulary fits.
constexpr std::size_t kStemCacheEntries = 100'000;
// Words a stem cache slot is prefetched ahead of its lookup (common practice:
// a few lookups' worth of memory latency).
constexpr std::size_t kLookupAhead = 8;

struct StringHash {
  using is_transparent = void;
  std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
};
using StringSet = std::unordered_set<std::string, StringHash, std::equal_to<>>;

// Collects folded words as tokens (words() and words_icu_reference()).
class CollectSink final : public WordSink {
 public:
  explicit CollectSink(std::uint32_t first_position) : position_(first_position) {}
  void word(std::string_view folded, std::size_t begin, std::size_t end) override {
    const std::uint32_t p = position_++;
    if (folded.empty()) return;  // a word, but no term to show for it
    tokens.push_back(Token{std::string(folded), p, static_cast<std::uint32_t>(begin),
                           static_cast<std::uint32_t>(end)});
  }
  std::vector<Token> tokens;

 private:
  std::uint32_t position_;
};

}  // namespace

struct Analyzer::Impl {
  AnalyzerOptions options;
  std::unique_ptr<analysis::IcuWords> icu;
  analysis::Stemmer stemmer;
  StringSet stopwords;  // folded
  analysis::StemCache cache{kStemCacheEntries};
  std::string scratch;

  analysis::StemCache::Entry lookup(std::string_view folded, std::uint64_t hash) {
    return cache.get(folded, hash, [this](std::string_view w) {
      return analysis::StemCache::Made{std::string(stemmer.stem(w)), stopwords.contains(w)};
    });
  }
};

Result<std::unique_ptr<Analyzer>> Analyzer::create(const AnalyzerOptions& options) {
  Result<analysis::Stemmer> stemmer = analysis::Stemmer::open(options.language);
  if (!stemmer.ok()) return stemmer.status();
  Result<std::unique_ptr<analysis::IcuWords>> icu = analysis::IcuWords::create();
  if (!icu.ok()) return icu.status();

  auto impl = std::make_unique<Impl>();
  impl->options = options;
  impl->icu = std::move(icu).value();
  impl->stemmer = std::move(stemmer).value();
  if (options.stopwords) {
    if (const analysis::StopwordFile* list = analysis::stopword_file_for(options.language)) {
      // Fold the published words exactly as text is folded ("daß" -> "dass").
      std::string folded;
      std::string_view rest = list->words;
      while (!rest.empty()) {
        const std::size_t nl = rest.find('\n');
        analysis::fold(rest.substr(0, nl), folded);
        if (!folded.empty()) impl->stopwords.insert(folded);
        rest = nl == std::string_view::npos ? std::string_view() : rest.substr(nl + 1);
      }
    }
  }
  return std::unique_ptr<Analyzer>(new Analyzer(std::move(impl)));
}

Analyzer::Analyzer(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
Analyzer::~Analyzer() = default;

const AnalyzerOptions& Analyzer::options() const { return impl_->options; }

Analyzer::Analyzed Analyzer::analyze(std::string_view text, std::uint32_t first_position) {
  // Words wait in a short queue so that each one's cache slot is prefetched
  // a few words before it is looked up (the lookup is otherwise a cache
  // miss per word); tokens still come out in text order.
  class IndexSink final : public WordSink {
   public:
    IndexSink(Impl& impl, Analyzed& out, std::uint32_t first)
        : impl_(impl), out_(out), position_(first) {}
    void word(std::string_view folded, std::size_t begin, std::size_t end) override {
      const std::uint32_t p = position_++;
      if (folded.empty() || folded.size() > kMaxWordBytes) return;  // takes a position only
      if (queued_ == kLookupAhead) emit();
      Pending& w = queue_[(head_ + queued_++) % kLookupAhead];
      std::memcpy(w.bytes, folded.data(), folded.size());
      w.size = static_cast<std::uint8_t>(folded.size());
      w.hash = analysis::StemCache::hash(folded);
      w.position = p;
      w.begin = static_cast<std::uint32_t>(begin);
      w.end = static_cast<std::uint32_t>(end);
      impl_.cache.prefetch(w.hash);
    }
    // Looks up the words still queued.
    void finish() {
      while (queued_ > 0) emit();
    }
    std::uint32_t position() const { return position_; }

   private:
    struct Pending {
      char bytes[kMaxWordBytes];
      std::uint8_t size;
      std::uint64_t hash;
      std::uint32_t position, begin, end;
    };
    void emit() {
      const Pending& w = queue_[head_];
      head_ = (head_ + 1) % kLookupAhead;
      --queued_;
      const analysis::StemCache::Entry e = impl_.lookup(std::string_view(w.bytes, w.size), w.hash);
      if (!e.stopword) out_.tokens.push_back(Token{std::string(e.term), w.position, w.begin, w.end});
    }
    Impl& impl_;
    Analyzed& out_;
    std::uint32_t position_;
    Pending queue_[kLookupAhead];
    std::size_t head_ = 0, queued_ = 0;
  };

  Analyzed out;
  out.tokens.reserve(text.size() / 6 + 4);  // English prose: ~1 term per 6-10 bytes
  IndexSink sink(*impl_, out, first_position);
  analysis::segment(text, *impl_->icu, sink, impl_->scratch);
  sink.finish();
  out.word_count = sink.position() - first_position;
  return out;
}

std::vector<Token> Analyzer::words(std::string_view text, std::uint32_t first_position) const {
  CollectSink sink(first_position);
  analysis::segment(text, *impl_->icu, sink, impl_->scratch);
  return std::move(sink.tokens);
}

std::string Analyzer::stem(std::string_view folded_word) {
  // Straight to libstemmer: single words (queries, tests) gain nothing from
  // the cache, and a long list of distinct words would only churn it.
  return std::string(impl_->stemmer.stem(folded_word));
}

bool Analyzer::is_stopword(std::string_view folded_word) const {
  return impl_->stopwords.contains(folded_word);
}

std::vector<std::string> stemmer_languages() {
  std::vector<std::string> names = analysis::snowball_algorithms();
  names.emplace_back("none");
  std::sort(names.begin(), names.end());
  return names;
}

std::vector<Token> words_icu_reference(std::string_view text) {
  CollectSink sink(0);
  Result<std::unique_ptr<analysis::IcuWords>> icu = analysis::IcuWords::create();
  if (icu.ok()) icu.value()->run(text, 0, text.size(), sink);
  return std::move(sink.tokens);
}

}  // namespace lode
