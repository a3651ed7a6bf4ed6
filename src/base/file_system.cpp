#include "base/file_system.hpp"

#include "base/big_buffer.hpp"

#include <cerrno>
#include <filesystem>

#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

namespace deckscale {

namespace fs = std::filesystem;

FileText owned_text(std::string text) {
    auto owner = std::make_shared<const std::string>(std::move(text));
    return FileText{owner, std::string_view(*owner)};
}

std::optional<FileText> DiskFileSystem::read(const std::string& path) const {
    int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) return std::nullopt;
    struct stat st {};
    if (::fstat(fd, &st) != 0 || S_ISDIR(st.st_mode)) {
        ::close(fd);
        return std::nullopt;
    }
    std::size_t size = static_cast<std::size_t>(st.st_size);
    if (S_ISREG(st.st_mode) && size >= kBigBufferBytes) {
        // A large deck: read into huge pages (see base/big_buffer.hpp), much cheaper to touch
        // than the 4 KiB pages of a file mapping.
        if (void* buf = allocate_big(size)) {
            std::shared_ptr<const void> owner(buf, [size](const void* q) {
                release_big(const_cast<void*>(q), size);
            });
            std::size_t done = 0;
            while (done < size) {
                ssize_t n = ::read(fd, static_cast<char*>(buf) + done, size - done);
                if (n < 0 && errno == EINTR) continue;
                if (n <= 0) break;
                done += static_cast<std::size_t>(n);
            }
            ::close(fd);
            if (done != size) return std::nullopt;  // changed or unreadable while read
            return FileText{owner, std::string_view(static_cast<const char*>(buf), size)};
        }
    }
    if (S_ISREG(st.st_mode) && size > 0) {
        // Every byte is read at least once: map all pages now, in one call, rather than
        // one page fault at a time (page faults are expensive on virtual machines).
        void* p = ::mmap(nullptr, size, PROT_READ, MAP_PRIVATE | MAP_POPULATE, fd, 0);
        if (p != MAP_FAILED) {
            ::close(fd);
            std::shared_ptr<const void> owner(p, [size](const void* q) {
                ::munmap(const_cast<void*>(q), size);
            });
            return FileText{owner, std::string_view(static_cast<const char*>(p), size)};
        }
    }
    // Not mappable (a pipe, an empty file, ...): read it.
    std::string text;
    char buf[1 << 16];
    for (;;) {
        ssize_t n = ::read(fd, buf, sizeof buf);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) {
            ::close(fd);
            return std::nullopt;
        }
        if (n == 0) break;
        text.append(buf, static_cast<std::size_t>(n));
    }
    ::close(fd);
    return owned_text(std::move(text));
}

std::string DiskFileSystem::identity(const std::string& path) const {
    std::error_code ec;
    auto p = fs::weakly_canonical(path, ec);
    return ec ? fs::path(path).lexically_normal().string() : p.string();
}

std::optional<FileText> MemoryFileSystem::read(const std::string& path) const {
    auto it = files_.find(fs::path(path).lexically_normal().string());
    if (it == files_.end()) it = files_.find(path);
    if (it == files_.end()) return std::nullopt;
    return owned_text(it->second);
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
