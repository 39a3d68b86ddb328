#pragma once
/// Private to src/io (output.cpp, h5read.cpp): ownership of HDF5 identifiers and conversion
/// of the HDF5 error stack into tubewave error messages. Nothing outside src/io includes it.
///
/// Every identifier returned by an H5*open / H5*create / H5*copy / H5*get_* call is wrapped
/// in a Handle at once, so it is closed on every path, exceptions included. The HDF5
/// library's own printing of its error stack to stderr is switched off once per process
/// (`silence_error_printing`); failures are reported through `failure_message` instead.
#include <hdf5.h>

#include <string>
#include <string_view>
#include <utility>

namespace tw::io::h5 {

/// Which H5*close releases an identifier.
enum class Kind { file, group, dataset, dataspace, datatype, plist, attribute, object };

/// Owns one HDF5 identifier (move-only). An invalid id (negative) owns nothing.
class Handle {
 public:
  Handle() noexcept = default;
  Handle(hid_t id, Kind kind) noexcept : id_(id), kind_(kind) {}
  Handle(const Handle&) = delete;
  Handle& operator=(const Handle&) = delete;
  Handle(Handle&& other) noexcept
      : id_(std::exchange(other.id_, H5I_INVALID_HID)), kind_(other.kind_) {}
  Handle& operator=(Handle&& other) noexcept {
    if (this != &other) {
      reset();
      id_ = std::exchange(other.id_, H5I_INVALID_HID);
      kind_ = other.kind_;
    }
    return *this;
  }
  ~Handle() { reset(); }

  [[nodiscard]] hid_t get() const noexcept { return id_; }
  [[nodiscard]] bool valid() const noexcept { return id_ >= 0; }

  /// Close now and report the library's status (negative on failure). Used where a failed
  /// close means lost data (the file itself); the handle is empty afterwards either way.
  herr_t close() noexcept;
  /// Close now, ignoring failure (destructors, error paths).
  void reset() noexcept { (void)close(); }

 private:
  hid_t id_ = H5I_INVALID_HID;
  Kind kind_ = Kind::object;
};

/// Switch off HDF5's automatic printing of error stacks (process-wide, idempotent).
void silence_error_printing() noexcept;

/// One-line description of the current HDF5 error stack (innermost cause first), then the
/// stack is cleared. Returns "no detail from the HDF5 library" when the stack is empty.
std::string error_stack_message();

/// "cannot <op> '<object>' in file '<file>': <HDF5 detail>" (the object part is left out
/// when `object` is empty). Consumes the current HDF5 error stack.
std::string failure_message(std::string_view file, std::string_view op, std::string_view object);

/// Wrap `id` or throw `E(failure_message(...))` when it is negative.
template <class E>
Handle own(hid_t id, Kind kind, std::string_view file, std::string_view op,
           std::string_view object = {}) {
  if (id < 0) throw E(failure_message(file, op, object));
  return Handle(id, kind);
}

/// Throw `E(failure_message(...))` when an HDF5 call returned a negative status.
template <class E>
void check(herr_t status, std::string_view file, std::string_view op,
           std::string_view object = {}) {
  if (status < 0) throw E(failure_message(file, op, object));
}

}  // namespace tw::io::h5
