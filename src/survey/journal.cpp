#include "survey/journal.hpp"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>

#include "arith/rational.hpp"

namespace arcsieve::survey {
namespace {

[[noreturn]] void fail(const std::string& what, const std::string& path) {
    throw std::runtime_error(what + " '" + path + "': " + std::strerror(errno));
}

void write_all(int fd, const std::string& data, const std::string& path) {
    std::size_t done = 0;
    while (done < data.size()) {
        const ssize_t n = ::write(fd, data.data() + done, data.size() - done);
        if (n < 0) {
            if (errno == EINTR) continue;
            fail("cannot write", path);
        }
        done += static_cast<std::size_t>(n);
    }
}

}  // namespace

std::string read_file(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) return {};
    std::ostringstream buffer;
    buffer << in.rdbuf();
    return buffer.str();
}

JournalContents read_journal(const std::string& path) {
    JournalContents contents;
    const std::string text = read_file(path);
    std::size_t start = 0;
    std::size_t line_number = 0;
    while (start < text.size()) {
        const std::size_t end = text.find('\n', start);
        ++line_number;
        if (end == std::string::npos) {  // no newline: the write was cut short
            contents.torn_tail = true;
            break;
        }
        nlohmann::json record;
        bool parsed = true;
        try {
            record = nlohmann::json::parse(text.begin() + static_cast<std::ptrdiff_t>(start),
                                           text.begin() + static_cast<std::ptrdiff_t>(end));
        } catch (const nlohmann::json::parse_error&) {
            parsed = false;
        }
        if (!parsed || !record.is_object()) {
            if (end + 1 == text.size()) {  // a damaged final line: treat as torn
                contents.torn_tail = true;
                break;
            }
            throw InputError(path + ":" + std::to_string(line_number) +
                             ": damaged record in the middle of the file");
        }
        contents.records.push_back(std::move(record));
        start = end + 1;
        contents.valid_bytes = start;
    }
    return contents;
}

void truncate_file(const std::string& path, std::size_t length) {
    std::error_code error;
    std::filesystem::resize_file(path, length, error);
    if (error) throw std::runtime_error("cannot truncate '" + path + "': " + error.message());
}

JournalWriter::JournalWriter(const std::string& path) : path_(path) {
    fd_ = ::open(path.c_str(), O_WRONLY | O_CREAT | O_APPEND | O_CLOEXEC, 0644);
    if (fd_ < 0) fail("cannot open", path);
}

JournalWriter::~JournalWriter() {
    if (fd_ >= 0) ::close(fd_);
}

void JournalWriter::append(const nlohmann::json& record) {
    // One write() of the whole line: with O_APPEND a kill leaves either nothing or a prefix of
    // this line at the end of the file, never an interleaving.
    write_all(fd_, record.dump() + "\n", path_);
    if (::fsync(fd_) != 0) fail("cannot fsync", path_);
}

void write_file_atomically(const std::string& path, const std::string& content) {
    const std::string temporary = path + ".partial";
    const int fd = ::open(temporary.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
    if (fd < 0) fail("cannot create", temporary);
    write_all(fd, content, temporary);
    if (::fsync(fd) != 0) fail("cannot fsync", temporary);
    ::close(fd);
    if (std::rename(temporary.c_str(), path.c_str()) != 0) fail("cannot rename", temporary);
    // Make the rename itself durable.
    const std::string directory = std::filesystem::path(path).parent_path().string();
    const int dir_fd = ::open(directory.empty() ? "." : directory.c_str(), O_RDONLY | O_CLOEXEC);
    if (dir_fd >= 0) {
        ::fsync(dir_fd);
        ::close(dir_fd);
    }
}

}  // namespace arcsieve::survey
