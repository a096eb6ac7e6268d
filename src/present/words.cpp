// The words behind the terms of a page of hits (lode/surface.h).
#include "lode/present.h"
#include "lode/surface.h"

namespace lode {

Result<std::map<std::string, std::string>> hit_words(IndexReader& reader, Analyzer& analyzer,
                                                      const std::vector<Hit>& hits) {
  std::vector<std::string> terms;
  for (const Hit& h : hits)
    for (const TermContribution& c : h.breakdown) terms.push_back(c.term);
  if (terms.empty()) return std::map<std::string, std::string>{};
  SurfaceForms forms(terms);
  auto scope = reader.begin();
  if (!scope) return scope.status();
  for (const Hit& h : hits)
    for (Field f : kAllFields) {
      auto text = reader.stored_text(h.doc, f);
      if (!text) {
        if (text.status().code() == Code::kNotFound) continue;  // removed since the search
        return text.status();
      }
      std::string_view head = *text;
      if (head.size() > kHitWordBytes) {  // cut at a character boundary
        std::size_t cut = kHitWordBytes;
        while (cut > 0 && (static_cast<unsigned char>(head[cut]) & 0xC0) == 0x80) --cut;
        head = head.substr(0, cut);
      }
      forms.add(head, analyzer);
    }
  return forms.words();
}

}  // namespace lode
