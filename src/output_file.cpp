#include "output_file.hpp"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <fmt/format.h>

namespace deckscale {

std::string write_file_atomically(const std::string& path, std::string_view content) {
    return write_file_atomically(path, [&](const PieceSink& sink) { sink(content); });
}

std::string write_file_atomically(const std::string& path,
                                  const std::function<void(const PieceSink&)>& produce) {
    namespace fs = std::filesystem;
    fs::path target(path);
    fs::path dir = target.parent_path().empty() ? fs::path(".") : target.parent_path();
    std::error_code ec;
    if (!fs::is_directory(dir, ec))
        return fmt::format("cannot write '{}': the folder '{}' does not exist", path, dir.string());
    // mkstemp replaces the six trailing X.
    std::string tmpl = (dir / ("." + target.filename().string() + "." + std::string(6, 'X'))).string();
    int fd = mkstemp(tmpl.data());
    if (fd < 0)
        return fmt::format("cannot create a temporary file in '{}': {}", dir.string(), std::strerror(errno));
    // Keep the permissions of a file being replaced; new files get the usual 0666 & ~umask.
    struct stat st {};
    if (stat(path.c_str(), &st) == 0) {
        fchmod(fd, st.st_mode & 07777);
    } else {
        mode_t mask = umask(0);
        umask(mask);
        fchmod(fd, 0666 & ~mask);
    }
    // Pieces are gathered into 1 MiB blocks before each write().
    std::string block;
    block.reserve(1 << 20);
    std::string error;
    auto flush = [&] {
        std::size_t done = 0;
        while (error.empty() && done < block.size()) {
            ssize_t n = ::write(fd, block.data() + done, block.size() - done);
            if (n < 0) {
                if (errno == EINTR) continue;
                error = std::strerror(errno);
                break;
            }
            done += static_cast<std::size_t>(n);
        }
        block.clear();
    };
    produce([&](std::string_view piece) {
        if (block.size() + piece.size() > block.capacity()) flush();
        if (piece.size() >= block.capacity()) {
            block.assign(piece);
            flush();
        } else {
            block.append(piece);
        }
    });
    flush();
    if (error.empty() && ::fsync(fd) != 0) error = std::strerror(errno);
    if (::close(fd) != 0 && error.empty()) error = std::strerror(errno);
    if (error.empty() && std::rename(tmpl.c_str(), path.c_str()) != 0) error = std::strerror(errno);
    if (!error.empty()) {
        ::unlink(tmpl.c_str());
        return fmt::format("cannot write '{}': {}", path, error);
    }
    return {};
}

}  // namespace deckscale
