// File access behind an interface, so that tests need no disk.
#pragma once

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <string_view>

namespace deckscale {

// The bytes of a file and what keeps them alive (a string, or a read-only mapping of the
// file: a large deck is then never copied into memory).
struct FileText {
    std::shared_ptr<const void> owner;
    std::string_view bytes;
};

FileText owned_text(std::string text);

class FileSystem {
public:
    virtual ~FileSystem() = default;
    // The whole file, read in binary; nullopt if it cannot be read.
    virtual std::optional<FileText> read(const std::string& path) const = 0;
    // A key that is equal for two spellings of one file (used for include cycles).
    virtual std::string identity(const std::string& path) const = 0;
};

class DiskFileSystem : public FileSystem {
public:
    std::optional<FileText> read(const std::string& path) const override;
    std::string identity(const std::string& path) const override;
};

class MemoryFileSystem : public FileSystem {
public:
    void add(const std::string& path, std::string text) { files_[path] = std::move(text); }
    std::optional<FileText> read(const std::string& path) const override;
    std::string identity(const std::string& path) const override;

private:
    std::map<std::string, std::string> files_;
};

// The directory part of a path ("" for a bare name), and a path joined onto a directory
// unless it is absolute.
std::string directory_of(const std::string& path);
std::string join_path(const std::string& dir, const std::string& path);

}  // namespace deckscale
