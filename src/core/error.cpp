#include "core/error.hpp"

namespace tw {

void fail_internal(const std::string& what, SourceLocation where) {
  throw InternalError("internal error in " + std::string(where.function_name()) + " (" +
                      where.file_name() + ":" + std::to_string(where.line()) + "): " + what);
}

}  // namespace tw
