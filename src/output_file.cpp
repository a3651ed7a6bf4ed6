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
    namespace fs = std::filesystem;
    fs::path target(path);
    fs::path dir = target.parent_path().empty() ? fs::path(".") : target.parent_path();
    std::string tmpl = (dir / ("." + target.filename().string() + ".XXXXXX")).string();
    int fd = mkstemp(tmpl.data());
    if (fd < 0) return fmt::format("cannot create a temporary file in '{}': {}", dir.string(), std::strerror(errno));
    // Keep the permissions of a file being replaced; new files get the usual 0644 (umask).
    struct stat st {};
    if (stat(path.c_str(), &st) == 0)
        fchmod(fd, st.st_mode & 07777);
    else {
        mode_t mask = umask(0);
        umask(mask);
        fchmod(fd, 0666 & ~mask);
    }
    std::size_t done = 0;
    while (done < content.size()) {
        ssize_t n = ::write(fd, content.data() + done, content.size() - done);
        if (n < 0) {
            if (errno == EINTR) continue;
            std::string err = std::strerror(errno);
            ::close(fd);
            ::unlink(tmpl.c_str());
            return fmt::format("cannot write '{}': {}", path, err);
        }
        done += static_cast<std::size_t>(n);
    }
    if (::fsync(fd) != 0 || ::close(fd) != 0) {
        std::string err = std::strerror(errno);
        ::unlink(tmpl.c_str());
        return fmt::format("cannot write '{}': {}", path, err);
    }
    if (std::rename(tmpl.c_str(), path.c_str()) != 0) {
        std::string err = std::strerror(errno);
        ::unlink(tmpl.c_str());
        return fmt::format("cannot write '{}': {}", path, err);
    }
    return {};
}

}  // namespace deckscale
