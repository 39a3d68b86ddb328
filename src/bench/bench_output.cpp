// Cost of writing snapshots through io::OutputFile (a figure to report, not a test).
//
//   bench_output [rows=10000] [cells=4096] [columns=1] [compress=0|1] [dir=/tmp]
//
// Appends `rows` snapshot rows of `columns` fields x `cells` cells (one row per chunk, as
// the solver declares snapshots), closes the file and prints wall time, time per row,
// throughput and the file size. The fields are smooth travelling waves with a little
// round-off noise, so the compression figure is about what a real run gets, not a best case.
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <span>
#include <string>
#include <vector>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/output.hpp"

int main(int argc, char** argv) {
  const long rows = argc > 1 ? std::stol(argv[1]) : 10000;
  const int cells = argc > 2 ? std::stoi(argv[2]) : 4096;
  const int columns = argc > 3 ? std::stoi(argv[3]) : 1;
  const bool compress = argc > 4 && std::string(argv[4]) == "1";
  const std::string dir = argc > 5 ? argv[5] : "/tmp";
  const std::string path = dir + "/bench_output." + std::to_string(::getpid()) + ".h5";

  try {
    std::vector<tw::io::ColumnInfo> info;
    for (int c = 0; c < columns; ++c) {
      info.push_back({"field_" + std::to_string(c), "1", "synthetic travelling wave"});
    }
    // The rows are made before the clock starts (64 phases, reused cyclically), so the
    // figure is the cost of output alone, not of evaluating sines.
    const std::size_t row_size =
        static_cast<std::size_t>(columns) * static_cast<std::size_t>(cells);
    constexpr int n_distinct = 64;
    std::vector<tw::real> table(n_distinct * row_size);
    const tw::real k = 2 * tw::constants::pi * 8 / cells;  // 8 wavelengths per tube
    for (int r = 0; r < n_distinct; ++r) {
      for (int c = 0; c < columns; ++c) {
        for (int i = 0; i < cells; ++i) {
          const tw::real phase = k * i - 2 * tw::constants::pi * r / n_distinct + c;
          table[r * row_size + static_cast<std::size_t>(c) * cells + i] =
              1.0 + 0.1 * std::sin(phase) + 1e-12 * std::cos(37.0 * phase * phase);
        }
      }
    }

    const auto start = std::chrono::steady_clock::now();
    {
      tw::io::OutputFile out(path);
      tw::io::Series s = out.create_series("snapshots", info, cells, 1, compress);
      for (long r = 0; r < rows; ++r) {
        const std::span<const tw::real> row(table.data() + (r % n_distinct) * row_size, row_size);
        s.append(1e-9 * static_cast<tw::real>(r), r, row);
        if (r % 1000 == 999) out.flush();
      }
      out.close_as("completed", "", rows, 1e-9 * static_cast<tw::real>(rows), 0);
    }
    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    const double raw_bytes = 8.0 * static_cast<double>(rows) * cells * columns;
    const auto file_bytes = static_cast<double>(std::filesystem::file_size(path));
    std::printf(
        "rows %ld  cells %d  columns %d  compress %d\n"
        "wall %.3f s  per row %.1f us  raw %.1f MB  %.0f MB/s  file %.1f MB (ratio %.2f)\n",
        rows, cells, columns, compress ? 1 : 0, seconds, 1e6 * seconds / static_cast<double>(rows),
        raw_bytes / 1e6, raw_bytes / 1e6 / seconds, file_bytes / 1e6, raw_bytes / file_bytes);
    std::filesystem::remove(path);
  } catch (const tw::Error& e) {
    std::fprintf(stderr, "bench_output: %s\n", e.what());
    return e.exit_code();
  }
  return 0;
}
