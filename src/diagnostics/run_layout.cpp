#include "diagnostics/run_layout.hpp"

#include "core/error.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "sim/run.hpp"

namespace tw::diag {

namespace {

/// Whether this build's schema declares a dotted key (run files of other versions, and
/// keys that only some builds have, are read with care).
bool declared(const std::string& path) {
  const io::Section* sec = &run_schema().root();
  std::size_t pos = 0;
  while (true) {
    const std::size_t dot = path.find('.', pos);
    const io::KeySpec* k = sec->find(path.substr(pos, dot == std::string::npos ? std::string::npos : dot - pos));
    if (k == nullptr) return false;
    if (dot == std::string::npos) return true;
    if (!k->sub) return false;
    sec = k->sub.get();
    pos = dot + 1;
  }
}

/// The value of a key when this build declares it and the run file has it.
bool present(const io::RunFile& rf, const std::string& key) { return declared(key) && rf.has(key); }

/// What the resolved run file alone says.
RunLayout read_run_file_layout(const io::H5Reader& h, std::vector<std::string>& notes) {
  RunLayout layout;
  const std::string where = "/provenance/resolved_run_file";
  if (!h.exists(where)) {
    notes.push_back("the file has no " + where + ": probe positions and drive frequency are unknown");
    return layout;
  }
  try {
    const io::RunFile rf = io::RunFile::parse(h.read_string(where), h.file_name() + ":" + where, run_schema());
    if (present(rf, "output.probes")) layout.probe_x = rf.get_reals("output.probes");
    layout.normalized = rf.get_string("units") == "normalized";
    const std::string left = rf.get_string("boundaries.left.kind");
    const std::string right = rf.get_string("boundaries.right.kind");
    layout.periodic = left == "periodic" && right == "periodic";
    // The drives: driven ends, then antennas inside the tube, in the run file's order.
    std::vector<std::pair<std::string, std::string>> drives;  // (key, name in notes)
    for (const char* side : {"left", "right"}) {
      const std::string key = std::string("boundaries.") + side;
      if (rf.get_string(key + ".kind") == "driven") drives.emplace_back(key, std::string("the ") + side + " end's drive");
    }
    const std::size_t antennas = declared("antennas") ? rf.count("antennas") : 0;
    for (std::size_t i = 0; i < antennas; ++i)
      drives.emplace_back("antennas[" + std::to_string(i) + "]", "antenna " + std::to_string(i + 1));
    std::string chosen;
    for (const auto& [key, name] : drives) {
      if (!rf.has(key + ".frequency")) continue;
      // Waveforms without one carrier frequency (sweeps, pulses) leave it to the spectrum.
      const std::string waveform = rf.has(key + ".waveform") ? rf.get_string(key + ".waveform") : "continuous";
      if (waveform != "continuous" && waveform != "tone-burst") {
        notes.push_back(name + " (" + waveform + ") has no single frequency: the spectral peak is measured");
        continue;
      }
      const real f = rf.get_real(key + ".frequency");
      if (!(f > 0)) continue;
      if (!layout.drive_frequency) {
        layout.drive_frequency = f;
        chosen = name;
      } else if (f != *layout.drive_frequency) {
        notes.push_back("the drives run at different frequencies: " + chosen +
                        "'s is measured (give --frequency for another)");
      }
    }
  } catch (const Error& e) {
    notes.push_back(std::string("the run's resolved run file does not read with this tubewave (") + e.what() +
                    "): probe positions and drive frequency are unknown");
  }
  return layout;
}

}  // namespace

RunLayout read_run_layout(const io::H5Reader& h, std::vector<std::string>& notes) {
  RunLayout layout = read_run_file_layout(h, notes);
  // Files written since /grid/probe_x exists hold the positions themselves.
  if (h.exists("/grid/probe_x")) layout.probe_x = h.read_real("/grid/probe_x");
  return layout;
}

}  // namespace tw::diag
