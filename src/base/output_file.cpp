#include "base/output_file.hpp"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <fmt/format.h>

namespace deckscale {

namespace {

// Writes blocks to a file descriptor; for a synced file it starts their writeback at once,
// so that the final fsync() waits only for the last blocks instead of the whole file.
class FileSink : public ByteSink {
public:
    FileSink(int fd, bool start_writeback) : fd_(fd), start_writeback_(start_writeback) {}
    const std::string& error() const { return error_; }

protected:
    void take(std::string_view bytes) override {
        std::size_t done = 0;
        while (error_.empty() && done < bytes.size()) {
            ssize_t n = ::write(fd_, bytes.data() + done, bytes.size() - done);
            if (n < 0) {
                if (errno == EINTR) continue;
                error_ = std::strerror(errno);
                break;
            }
            done += static_cast<std::size_t>(n);
        }
        if (!error_.empty()) return;
        // A hint only (it fails harmlessly where unsupported): fsync() is the guarantee.
        if (start_writeback_)
            ::sync_file_range(fd_, static_cast<off_t>(written_), static_cast<off_t>(done),
                              SYNC_FILE_RANGE_WRITE);
        written_ += done;
    }

private:
    int fd_;
    bool start_writeback_;
    std::size_t written_ = 0;
    std::string error_;
};

}  // namespace

std::string write_file_atomically(const std::string& path, std::string_view content,
                                  Durability durability) {
    return write_file_atomically(path, [&](ByteSink& sink) { sink.write(content); }, durability);
}

std::string write_file_atomically(const std::string& path,
                                  const std::function<void(ByteSink&)>& produce,
                                  Durability durability) {
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
    std::string error;
    {
        FileSink sink(fd, durability == Durability::synced);
        produce(sink);
        sink.flush();
        error = sink.error();
    }
    if (durability == Durability::synced && error.empty() && ::fsync(fd) != 0)
        error = std::strerror(errno);
    if (::close(fd) != 0 && error.empty()) error = std::strerror(errno);
    if (error.empty() && std::rename(tmpl.c_str(), path.c_str()) != 0) error = std::strerror(errno);
    if (!error.empty()) {
        ::unlink(tmpl.c_str());
        return fmt::format("cannot write '{}': {}", path, error);
    }
    return {};
}

}  // namespace deckscale
