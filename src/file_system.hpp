// File access behind an interface, so that tests need no disk.
#pragma once

#include <map>
#include <optional>
#include <string>

namespace deckscale {

class FileSystem {
public:
    virtual ~FileSystem() = default;
    // The whole file, read in binary; nullopt if it cannot be read.
    virtual std::optional<std::string> read(const std::string& path) const = 0;
    // A key that is equal for two spellings of one file (used for include cycles).
    virtual std::string identity(const std::string& path) const = 0;
};

class DiskFileSystem : public FileSystem {
public:
    std::optional<std::string> read(const std::string& path) const override;
    std::string identity(const std::string& path) const override;
};

class MemoryFileSystem : public FileSystem {
public:
    void add(const std::string& path, std::string text) { files_[path] = std::move(text); }
    std::optional<std::string> read(const std::string& path) const override;
    std::string identity(const std::string& path) const override;

private:
    std::map<std::string, std::string> files_;
};

// The directory part of a path ("" for a bare name), and a path joined onto a directory
// unless it is absolute.
std::string directory_of(const std::string& path);
std::string join_path(const std::string& dir, const std::string& path);

}  // namespace deckscale
