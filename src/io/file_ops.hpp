#pragma once
/// File-system steps shared by the writers of run output and checkpoints: copies and
/// replacements that are atomic for readers and survive a crash of the writer.
///
/// Why fsync: a rename is atomic for other processes at once, but after a power loss or a
/// node crash the directory entry can reach the disk before the file's data, leaving a
/// complete-looking name over an empty or short file. `replace_file` therefore syncs the
/// file's data first, renames, then syncs the directory. A process killed with SIGKILL needs
/// none of this (the kernel keeps its written pages); the syncs cost a few milliseconds per
/// checkpoint and are worth it on cluster file systems.
///
/// Errors: RunError naming both paths and the system's reason (exit code 1).
#include <string>

namespace tw::io {

/// Flush the data of `path` to stable storage (fsync).
void sync_file(const std::string& path);

/// Atomically replace `final_path` by `temp_path` (same directory): sync the data of
/// `temp_path`, rename it over `final_path`, sync the directory. Readers of `final_path` see
/// the old file or the new one, never a mix; the old file stays until the rename.
void replace_file(const std::string& temp_path, const std::string& final_path);

/// Copy `from` to `to`, which must not exist (an existing file is an error, never
/// overwritten). The copy is synced before returning.
void copy_new_file(const std::string& from, const std::string& to);

/// "<path>.tmp.<pid>": where a writer builds a file before renaming it to `path`. The PID
/// keeps two processes writing the same path apart; a leftover name means its writer died.
std::string temporary_name(const std::string& path);

/// Write `text` to `path` through its temporary name and replace_file (so readers never see
/// a partial file); `executable` adds the execute permissions. On failure the temporary file
/// is removed and RunError names it.
void write_text_file(const std::string& path, const std::string& text, bool executable = false);

}  // namespace tw::io
