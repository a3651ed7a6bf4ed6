#include "deckscale/deck.hpp"

#include <fmt/format.h>

#include <cmath>
#include <filesystem>

#include "deckscale/internal.hpp"
#include "scale/factor.hpp"

namespace deckscale::api {

namespace fs = std::filesystem;

std::string memory_key(const std::string& path) {
    std::error_code ec;
    fs::path p = fs::absolute(path, ec);
    return (ec ? fs::path(path) : p).lexically_normal().string();
}

std::optional<FileText> OverlayFileSystem::read(const std::string& path,
                                                std::string* problem) const {
    if (auto it = memory_.find(memory_key(path)); it != memory_.end())
        return owned_text(it->second);
    return disk_.read(path, problem);
}

std::string OverlayFileSystem::identity(const std::string& path) const {
    std::string key = memory_key(path);
    return memory_.count(key) ? key : disk_.identity(path);
}

DeckError request_error(std::string message) {
    Diagnostic d;
    d.message = std::move(message);
    return DeckError(std::move(d));
}

Deck load_with(const std::string& path, MemoryFiles memory) {
    auto impl = std::make_shared<Deck::Impl>();
    OverlayFileSystem files(memory);
    impl->deck = load_deck(path, files);
    impl->memory = std::move(memory);
    return Deck(std::move(impl));
}

const std::string& Deck::path() const { return impl_->deck.top().path(); }

std::vector<std::string> Deck::files() const {
    std::vector<std::string> paths;
    for (const auto& f : impl_->deck.files) paths.push_back(f.source->path());
    return paths;
}

std::string_view Deck::text(std::size_t file) const {
    if (file >= impl_->deck.files.size())
        throw request_error(fmt::format("the deck has {} file(s), not a file number {}",
                                        impl_->deck.files.size(), file));
    return impl_->deck.files[file].source->text();
}

const std::vector<Diagnostic>& Deck::warnings() const { return impl_->deck.warnings; }

Deck read_deck(const std::string& path) { return load_with(path, {}); }

Deck read_text(std::string text, const std::string& name) {
    if (name.empty()) throw request_error("a deck given as text needs a file name");
    MemoryFiles memory;
    memory[memory_key(name)] = std::move(text);
    return load_with(name, std::move(memory));
}

double parse_factor(const std::string& text) {
    auto v = deckscale::parse_factor(std::string_view(text));
    if (!v || !std::isfinite(*v))
        throw request_error(
            fmt::format("'{}' is not a factor (write e.g. 1k, 2.2MEG, 2*pi*1k)", text));
    if (!(*v > 0)) throw request_error(fmt::format("the factor must be positive, got '{}'", text));
    return *v;
}

const char* version() { return DECKSCALE_VERSION; }

}  // namespace deckscale::api
