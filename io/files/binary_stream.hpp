#pragma once
// Byte-exact serialisation of plain values for state files: numbers are stored as their
// bytes in the machine's order (state files are read back on the machine kind that wrote
// them; the header records the order), so a double reads back to the same bits.
#include <algorithm>
#include <cstdint>
#include <cstring>
#include <stdexcept>
#include <string>
#include <string_view>
#include <type_traits>
#include <vector>

namespace aquiledger {

/// A state file that is truncated or malformed.
class FormatError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

class BinaryWriter {
 public:
  template <class T>
  requires std::is_arithmetic_v<T>
  void put(T value) {
    char bytes[sizeof(T)];
    std::memcpy(bytes, &value, sizeof(T));
    data_.append(bytes, sizeof(T));
  }
  void put_size(std::size_t n) { put(static_cast<std::uint64_t>(n)); }
  void put_text(std::string_view s) {
    put_size(s.size());
    data_.append(s);
  }
  template <class T>
  requires std::is_arithmetic_v<T>
  void put_vector(const std::vector<T>& v) {
    put_size(v.size());
    if (!v.empty()) data_.append(reinterpret_cast<const char*>(v.data()), v.size() * sizeof(T));
  }
  const std::string& bytes() const { return data_; }

 private:
  std::string data_;
};

class BinaryReader {
 public:
  explicit BinaryReader(std::string_view data) : data_(data) {}
  template <class T>
  requires std::is_arithmetic_v<T> T get() {
    need(sizeof(T));
    T value;
    std::memcpy(&value, data_.data() + pos_, sizeof(T));
    pos_ += sizeof(T);
    return value;
  }
  /// A count, refused when it could not fit in what is left of the data (each element at
  /// least min_element_bytes), so that a damaged file never triggers a huge allocation.
  std::size_t get_size(std::size_t min_element_bytes = 1) {
    const auto n = get<std::uint64_t>();
    if (n > (data_.size() - pos_) / std::max<std::size_t>(min_element_bytes, 1))
      throw FormatError("a count of " + std::to_string(n) + " exceeds the file's length");
    return static_cast<std::size_t>(n);
  }
  std::string get_text() {
    const std::size_t n = get_size();
    std::string s(data_.substr(pos_, n));
    pos_ += n;
    return s;
  }
  template <class T>
  requires std::is_arithmetic_v<T> std::vector<T> get_vector() {
    const std::size_t n = get_size(sizeof(T));
    std::vector<T> v(n);
    if (n) std::memcpy(v.data(), data_.data() + pos_, n * sizeof(T));
    pos_ += n * sizeof(T);
    return v;
  }
  std::string_view rest() const { return data_.substr(pos_); }
  bool at_end() const { return pos_ == data_.size(); }

 private:
  void need(std::size_t n) const {
    if (data_.size() - pos_ < n) throw FormatError("the file ends early");
  }
  std::string_view data_;
  std::size_t pos_ = 0;
};

/// FNV-1a, 64 bits: a fingerprint of bytes (detects changed files, not tampering).
inline std::uint64_t fnv1a(std::string_view bytes, std::uint64_t hash = 0xcbf29ce484222325ull) {
  for (unsigned char c : bytes) {
    hash ^= c;
    hash *= 0x100000001b3ull;
  }
  return hash;
}

}  // namespace aquiledger
