// ICU word segmentation (see segment.h).
#include <unicode/ubrk.h>

#include <limits>

#include "analysis/segment.h"

namespace lode::analysis {

Result<std::unique_ptr<IcuWords>> IcuWords::create() {
  UErrorCode status = U_ZERO_ERROR;
  // The root locale on purpose: the rules must not depend on the analyzer's
  // language, so that one ASCII fast path serves every language.
  std::unique_ptr<icu::BreakIterator> bi(
      icu::BreakIterator::createWordInstance(icu::Locale::getRoot(), status));
  if (U_FAILURE(status) || !bi) {
    return Status::Unsupported(std::string("analysis: ICU word break iterator unavailable: ") +
                               u_errorName(status));
  }
  return std::unique_ptr<IcuWords>(new IcuWords(std::move(bi)));
}

IcuWords::~IcuWords() {
  bi_.reset();  // it holds a clone of ut_; drop it first
  if (ut_ != nullptr) utext_close(ut_);
}

void IcuWords::run(std::string_view text, std::size_t from, std::size_t to, WordSink& sink) {
  // ICU reports offsets as int32_t; segment() keeps stretches far below that.
  if (to - from > static_cast<std::size_t>(std::numeric_limits<int32_t>::max())) {
    to = from + static_cast<std::size_t>(std::numeric_limits<int32_t>::max());
  }
  UErrorCode status = U_ZERO_ERROR;
  ut_ = utext_openUTF8(ut_, text.data() + from, static_cast<int64_t>(to - from), &status);
  bi_->setText(ut_, status);
  if (U_FAILURE(status)) return;  // defensive: only allocation failure gets here
  int32_t begin = bi_->first();
  for (int32_t end = bi_->next(); end != icu::BreakIterator::DONE; begin = end, end = bi_->next()) {
    if (bi_->getRuleStatus() < UBRK_WORD_NONE_LIMIT) continue;  // spaces, punctuation
    const std::size_t b = from + static_cast<std::size_t>(begin);
    const std::size_t e = from + static_cast<std::size_t>(end);
    fold(text.substr(b, e - b), folded_);
    sink.word(folded_, b, e);
  }
}

}  // namespace lode::analysis
