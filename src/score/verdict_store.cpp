#include "envsift/score/verdict_store.hpp"

#include <cstring>
#include <string>

namespace envsift {
namespace {

void put_number(std::string& out, double v) {
  char bytes[sizeof v];
  std::memcpy(bytes, &v, sizeof v);
  out.append(bytes, sizeof v);
}

double take_number(const std::string& in, std::size_t& at) {
  double v;
  std::memcpy(&v, in.data() + at, sizeof v);
  at += sizeof v;
  return v;
}

void put_list(std::vector<std::string>& fields, const std::vector<std::string>& list) {
  fields.push_back(std::to_string(list.size()));
  fields.insert(fields.end(), list.begin(), list.end());
}

void take_list(const std::vector<std::string>& fields, std::size_t& at, std::vector<std::string>& list) {
  const std::size_t n = std::stoul(fields[at++]);
  list.assign(fields.begin() + static_cast<std::ptrdiff_t>(at), fields.begin() + static_cast<std::ptrdiff_t>(at + n));
  at += n;
}

}  // namespace

void VerdictStore::put(std::size_t record, const Verdict& v) {
  // fields: score (empty or 8 bytes), the combined probability, flags, reasons, codes (each a count, then the items), the
  // decision (one byte), its note and what it set aside, and one field of bits per test
  std::vector<std::string> fields{std::string()};
  if (v.score) put_number(fields[0], *v.score);
  fields.emplace_back();
  put_number(fields.back(), v.probability);
  put_list(fields, v.flags);
  put_list(fields, v.reasons);
  put_list(fields, v.codes);
  fields.emplace_back(1, static_cast<char>(v.decision));
  fields.push_back(v.decision_note);
  fields.push_back(v.set_aside);
  for (const TestResult& t : v.tests) {
    std::string bits(1, t.tested ? '1' : '0');
    put_number(bits, t.statistic);
    put_number(bits, t.threshold);
    put_number(bits, t.probability);
    for (double e : t.extras) put_number(bits, e);
    fields.push_back(std::move(bits));
  }
  std::lock_guard<std::mutex> guard(lock_);
  store_.append(fields);
  slot_[record] = store_.size() - 1;
}

void VerdictStore::get(std::size_t record, Verdict& v, Scratch& scratch) const {
  const std::vector<std::string>& fields = scratch.fields;
  store_.read_concurrently(slot_[record], scratch.bytes, scratch.fields);
  std::size_t at = 0;
  v.score.reset();
  if (!fields[0].empty()) v.score = take_number(fields[0], at);
  at = 0;
  v.probability = take_number(fields[1], at);
  std::size_t field = 2;
  take_list(fields, field, v.flags);
  take_list(fields, field, v.reasons);
  take_list(fields, field, v.codes);
  v.decision = static_cast<Decision>(fields[field++][0]);
  v.decision_note = fields[field++];
  v.set_aside = fields[field++];
  v.tests.resize(fields.size() - field);  // reusing the caller's vectors: no allocation per record
  for (TestResult& t : v.tests) {
    const std::string& bits = fields[field++];
    t.tested = bits[0] == '1';
    at = 1;
    t.statistic = take_number(bits, at);
    t.threshold = take_number(bits, at);
    t.probability = take_number(bits, at);
    t.extras.clear();
    while (at < bits.size()) t.extras.push_back(take_number(bits, at));
  }
}

}  // namespace envsift
