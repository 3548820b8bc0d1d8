// Crash-safe record files: an append-only JSON Lines journal where each record is one write()
// of a full line followed by fsync, a reader that detects and drops a torn last line, and
// whole-file writes by temporary file + fsync + rename.
#pragma once

#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace arcsieve::survey {

struct JournalContents {
    std::vector<nlohmann::json> records;
    std::size_t valid_bytes = 0;  // length of the prefix made of complete, parseable lines
    bool torn_tail = false;       // a last line without newline, or unparseable, was found
};

// Reads a journal; a missing file is empty. A torn last line (what a kill during a write
// leaves) is reported, not returned. Throws InputError if a line other than the last is not
// a JSON object: that is damage no crash of ours produces.
JournalContents read_journal(const std::string& path);

// Cuts the file to `length` bytes (drops a torn tail before appending again).
void truncate_file(const std::string& path, std::size_t length);

// Appends records to a journal; every append is durable when it returns.
class JournalWriter {
  public:
    explicit JournalWriter(const std::string& path);
    ~JournalWriter();
    JournalWriter(const JournalWriter&) = delete;
    JournalWriter& operator=(const JournalWriter&) = delete;

    void append(const nlohmann::json& record);

  private:
    int fd_ = -1;
    std::string path_;
};

// Writes `content` to `path` atomically (temporary file in the same directory, fsync, rename).
void write_file_atomically(const std::string& path, const std::string& content);

std::string read_file(const std::string& path);

}  // namespace arcsieve::survey
