#include "sweep/job_script.hpp"

#include <algorithm>
#include <cctype>
#include <filesystem>

namespace tw::sweep {

namespace fs = std::filesystem;

std::string shell_quote(const std::string& word) {
  bool plain = !word.empty();
  for (char c : word)
    plain = plain && (std::isalnum(static_cast<unsigned char>(c)) || std::string_view("/._-+=:,@").find(c) != std::string_view::npos);
  if (plain) return word;
  std::string r = "'";
  for (char c : word) r += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return r + "'";
}

std::string index_ranges(std::vector<std::size_t> v) {
  std::sort(v.begin(), v.end());
  v.erase(std::unique(v.begin(), v.end()), v.end());
  std::string out;
  for (std::size_t i = 0; i < v.size();) {
    std::size_t j = i;
    while (j + 1 < v.size() && v[j + 1] == v[j] + 1) ++j;
    if (!out.empty()) out += ',';
    out += std::to_string(v[i]);
    if (j > i) {
      out += '-';
      out += std::to_string(v[j]);
    }
    i = j + 1;
  }
  return out;
}

std::string job_script_text(const Sweep& s, const std::vector<std::size_t>& cases, const JobScriptOptions& opt) {
  const std::string out_dir = fs::absolute(s.output_dir).lexically_normal().string();
  std::string name = fs::path(opt.sweep_file).stem().string();
  std::string args;
  for (const auto& a : opt.extra_args) {
    args += ' ';
    args += shell_quote(a);
  }
  if (opt.retry_failed) args += " --retry-failed";
  const std::string sweep_cmd = shell_quote(opt.tubewave) + " sweep " + shell_quote(opt.sweep_file);
  std::string t;
  t += "#!/bin/bash\n";
  t += "# Job array of the tubewave sweep " + opt.sweep_file + "\n";
  if (!s.title.empty()) t += "# (" + s.title + ")\n";
  t += "# " + std::to_string(cases.size()) + " of its " + std::to_string(s.cases.size()) +
       " cases, one array task each. Written by `tubewave sweep --job-script`.\n";
  t += "#\n";
  t += "# Submit it to a batch scheduler that reads #SBATCH lines:\n";
  t += "#     sbatch " + shell_quote(out_dir + "/job-array.sh") + "\n";
  t += "# or run one case by hand:   bash " + shell_quote(out_dir + "/job-array.sh") + " CASE_NUMBER\n";
  t += "# When every task has ended, merge the case files into summary.csv and summary.h5:\n";
  t += "#     " + sweep_cmd + args + " --merge\n";
  t += "#\n";
  t += "# Each task runs one case with `--case N`: its run, measurement and record in\n";
  t += "# " + out_dir + "/cases/. A case that is already complete is skipped, so after a\n";
  t += "# failure or a time limit the same array can be submitted again. The output folder must\n";
  t += "# be on a file system every compute node sees. Set the wall-time limit your longest case\n";
  t += "# needs (`tubewave sweep SWEEP --list` shows the cases' relative costs), and the account\n";
  t += "# or partition your site asks for, on extra #SBATCH lines.\n";
  t += "#SBATCH --job-name=tw-" + name + "\n";
  t += "#SBATCH --array=" + index_ranges(cases) + "\n";
  t += "#SBATCH --ntasks=1\n";
  t += "#SBATCH --cpus-per-task=" + std::to_string(std::max(1, opt.threads)) + "\n";
  t += "#SBATCH --output=" + out_dir + "/logs/case-%a.log\n";
  t += "set -euo pipefail\n";
  t += "case_number=\"${SLURM_ARRAY_TASK_ID:-${1:?give the case number (0 to " + std::to_string(s.cases.size() - 1) +
       ")}}\"\n";
  t += "export OMP_NUM_THREADS=\"${SLURM_CPUS_PER_TASK:-" + std::to_string(std::max(1, opt.threads)) + "}\"\n";
  t += "exec " + sweep_cmd + args + " --case \"$case_number\"\n";
  return t;
}

}  // namespace tw::sweep
