#include "base/output_file.hpp"

#include <atomic>
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

// Temporary files not yet renamed, where a signal handler can reach them: fixed slots of
// fixed-size paths, claimed and released with atomics (no allocation, no lock).
constexpr int kSlots = 64;
constexpr std::size_t kPathBytes = 4096;
std::atomic<bool> slot_used[kSlots];
std::atomic<bool> slot_live[kSlots];  // the path is complete and the file exists
char slot_path[kSlots][kPathBytes];

int claim_slot(const std::string& temporary) {
    if (temporary.size() >= kPathBytes) return -1;
    for (int i = 0; i < kSlots; ++i) {
        bool expected = false;
        if (slot_used[i].compare_exchange_strong(expected, true)) {
            std::memcpy(slot_path[i], temporary.c_str(), temporary.size() + 1);
            slot_live[i].store(true);
            return i;
        }
    }
    return -1;  // more than kSlots at once: still removed on errors, just not on signals
}

void release_slot(int i) {
    if (i < 0) return;
    slot_live[i].store(false);
    slot_used[i].store(false);
}

}  // namespace

void remove_unfinished_outputs() noexcept {
    for (int i = 0; i < kSlots; ++i)
        if (slot_live[i].load()) ::unlink(slot_path[i]);
}

OutputBatch::~OutputBatch() {
    for (const auto& p : pending_) {
        ::unlink(p.temporary.c_str());
        release_slot(p.slot);
    }
}

std::string OutputBatch::add(const std::string& path, std::string_view content,
                             Durability durability) {
    return add(path, [&](ByteSink& sink) { sink.write(content); }, durability);
}

std::string OutputBatch::add(const std::string& path,
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
    pending_.push_back({path, tmpl, claim_slot(tmpl)});
    auto drop = [&](std::string why) {
        ::unlink(tmpl.c_str());
        release_slot(pending_.back().slot);
        pending_.pop_back();
        return fmt::format("cannot write '{}': {}", path, why);
    };
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
    try {
        FileSink sink(fd, durability == Durability::synced);
        produce(sink);
        sink.flush();
        error = sink.error();
    } catch (...) {
        ::close(fd);
        drop("");
        throw;
    }
    if (durability == Durability::synced && error.empty() && ::fsync(fd) != 0)
        error = std::strerror(errno);
    if (::close(fd) != 0 && error.empty()) error = std::strerror(errno);
    if (!error.empty()) return drop(error);
    return {};
}

std::string OutputBatch::commit() {
    std::string error;
    for (const auto& p : pending_) {
        if (error.empty() && std::rename(p.temporary.c_str(), p.target.c_str()) != 0)
            error = fmt::format("cannot write '{}': {}", p.target, std::strerror(errno));
        if (!error.empty()) ::unlink(p.temporary.c_str());
        release_slot(p.slot);
    }
    pending_.clear();
    return error;
}

std::string write_file_atomically(const std::string& path, std::string_view content,
                                  Durability durability) {
    OutputBatch batch;
    if (auto e = batch.add(path, content, durability); !e.empty()) return e;
    return batch.commit();
}

std::string write_file_atomically(const std::string& path,
                                  const std::function<void(ByteSink&)>& produce,
                                  Durability durability) {
    OutputBatch batch;
    if (auto e = batch.add(path, produce, durability); !e.empty()) return e;
    return batch.commit();
}

}  // namespace deckscale
