#include "base/file_system.hpp"

#include "base/big_buffer.hpp"

#include <cerrno>
#include <cstring>
#include <filesystem>

#include <fmt/format.h>

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

namespace deckscale {

namespace fs = std::filesystem;

FileText owned_text(std::string text) {
    auto owner = std::make_shared<const std::string>(std::move(text));
    return FileText{owner, std::string_view(*owner)};
}

namespace {

std::nullopt_t refuse(std::string* problem, std::string why) {
    if (problem) *problem = std::move(why);
    return std::nullopt;
}

std::string too_large(std::size_t limit) {
    return fmt::format("it is larger than {} MiB, the most deckscale reads", limit >> 20);
}

// Reads to the end, at most `limit` bytes (a pipe or a file that grows while it is read).
std::optional<FileText> read_stream(int fd, std::size_t limit, std::string* problem) {
    std::string text;
    char buf[1 << 16];
    for (;;) {
        ssize_t n = ::read(fd, buf, sizeof buf);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) return refuse(problem, std::strerror(errno));
        if (n == 0) break;
        if (text.size() + static_cast<std::size_t>(n) > limit)
            return refuse(problem, too_large(limit));
        text.append(buf, static_cast<std::size_t>(n));
    }
    return owned_text(std::move(text));
}

// Reads exactly `size` bytes into `dst`; false (with the reason) when the file ended early.
bool read_exact(int fd, char* dst, std::size_t size, std::string* problem) {
    std::size_t done = 0;
    while (done < size) {
        ssize_t n = ::read(fd, dst + done, size - done);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) return refuse(problem, std::strerror(errno)), false;
        if (n == 0) return refuse(problem, "it changed while it was read"), false;
        done += static_cast<std::size_t>(n);
    }
    return true;
}

}  // namespace

std::optional<FileText> DiskFileSystem::read(const std::string& path, std::string* problem) const {
    // O_NONBLOCK: opening a FIFO that has no writer must not wait for one.
    int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK);
    if (fd < 0) return refuse(problem, std::strerror(errno));
    struct Closer {
        int fd;
        ~Closer() { ::close(fd); }
    } closer{fd};
    struct stat st {};
    if (::fstat(fd, &st) != 0) return refuse(problem, std::strerror(errno));
    if (S_ISDIR(st.st_mode)) return refuse(problem, "it is a directory");
    if (!S_ISREG(st.st_mode) && !S_ISFIFO(st.st_mode))
        return refuse(problem, "it is a device or socket, not a file");
    // Back to blocking reads: a pipe with a writer is read to its end.
    ::fcntl(fd, F_SETFL, ::fcntl(fd, F_GETFL) & ~O_NONBLOCK);
    if (S_ISFIFO(st.st_mode)) return read_stream(fd, limit_, problem);

    std::size_t size = static_cast<std::size_t>(st.st_size);
    if (size > limit_) return refuse(problem, too_large(limit_));
    // A large deck goes into huge pages (see base/big_buffer.hpp), much cheaper to touch
    // than 4 KiB pages.
    if (void* buf = size >= kBigBufferBytes ? allocate_big(size) : nullptr) {
        std::shared_ptr<const void> owner(buf, [size](const void* q) {
            release_big(const_cast<void*>(q), size);
        });
        if (!read_exact(fd, static_cast<char*>(buf), size, problem)) return std::nullopt;
        return FileText{owner, std::string_view(static_cast<const char*>(buf), size)};
    }
    std::string text(size, '\0');
    if (!read_exact(fd, text.data(), size, problem)) return std::nullopt;
    return owned_text(std::move(text));
}

std::string DiskFileSystem::identity(const std::string& path) const {
    std::error_code ec;
    auto p = fs::weakly_canonical(path, ec);
    return ec ? fs::path(path).lexically_normal().string() : p.string();
}

std::optional<FileText> MemoryFileSystem::read(const std::string& path,
                                               std::string* problem) const {
    auto it = files_.find(fs::path(path).lexically_normal().string());
    if (it == files_.end()) it = files_.find(path);
    if (it == files_.end()) return refuse(problem, "No such file or directory");
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
