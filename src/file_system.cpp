#include "file_system.hpp"

#include <filesystem>
#include <fstream>
#include <sstream>

namespace deckscale {

namespace fs = std::filesystem;

std::optional<std::string> DiskFileSystem::read(const std::string& path) const {
    std::error_code ec;
    if (fs::is_directory(path, ec)) return std::nullopt;
    std::ifstream in(path, std::ios::binary);
    if (!in) return std::nullopt;
    std::string text;
    in.seekg(0, std::ios::end);
    auto size = in.tellg();
    if (size > 0) {
        text.resize(static_cast<std::size_t>(size));
        in.seekg(0);
        in.read(text.data(), size);
        if (!in) return std::nullopt;
    }
    return text;
}

std::string DiskFileSystem::identity(const std::string& path) const {
    std::error_code ec;
    auto p = fs::weakly_canonical(path, ec);
    return ec ? fs::path(path).lexically_normal().string() : p.string();
}

std::optional<std::string> MemoryFileSystem::read(const std::string& path) const {
    auto it = files_.find(fs::path(path).lexically_normal().string());
    if (it == files_.end()) it = files_.find(path);
    if (it == files_.end()) return std::nullopt;
    return it->second;
}

std::string MemoryFileSystem::identity(const std::string& path) const {
    return fs::path(path).lexically_normal().string();
}

std::string directory_of(const std::string& path) {
    return fs::path(path).parent_path().string();
}

std::string join_path(const std::string& dir, const std::string& path) {
    if (dir.empty() || fs::path(path).is_absolute()) return path;
    return (fs::path(dir) / path).string();
}

}  // namespace deckscale
