// File access behind an interface, so that tests need no disk.
#pragma once

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <string_view>

namespace deckscale {

// The bytes of a file and what keeps them alive (a string, or a buffer of huge pages for a
// large deck). Always a private copy: a file that changes or shrinks while a run reads it can
// never take the run down (a mapping of it would raise SIGBUS).
struct FileText {
    std::shared_ptr<const void> owner;
    std::string_view bytes;
};

FileText owned_text(std::string text);

class FileSystem {
public:
    virtual ~FileSystem() = default;
    // The whole file, read in binary; nullopt if it cannot be read, with the reason in
    // `problem` when given ("it is a directory", "No such file or directory", ...).
    virtual std::optional<FileText> read(const std::string& path,
                                         std::string* problem = nullptr) const = 0;
    // A key that is equal for two spellings of one file (used for include cycles).
    virtual std::string identity(const std::string& path) const = 0;
};

// Reads regular files and pipes (a FIFO with no writer reads as empty, never blocks);
// directories and devices are refused, and so is anything longer than `limit` bytes, so an
// endless stream cannot exhaust memory.
class DiskFileSystem : public FileSystem {
public:
    static constexpr std::size_t kDefaultLimit = std::size_t{1} << 30;  // 1 GiB
    explicit DiskFileSystem(std::size_t limit = kDefaultLimit) : limit_(limit) {}
    std::optional<FileText> read(const std::string& path,
                                 std::string* problem = nullptr) const override;
    std::string identity(const std::string& path) const override;

private:
    std::size_t limit_;
};

class MemoryFileSystem : public FileSystem {
public:
    void add(const std::string& path, std::string text) { files_[path] = std::move(text); }
    std::optional<FileText> read(const std::string& path,
                                 std::string* problem = nullptr) const override;
    std::string identity(const std::string& path) const override;

private:
    std::map<std::string, std::string> files_;
};

// The directory part of a path ("" for a bare name), and a path joined onto a directory
// unless it is absolute.
std::string directory_of(const std::string& path);
std::string join_path(const std::string& dir, const std::string& path);

}  // namespace deckscale
