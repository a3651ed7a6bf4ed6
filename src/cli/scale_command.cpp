#include "cli/scale_command.hpp"

#include <filesystem>

#include <fmt/format.h>

#include "base/output_file.hpp"
#include "cli/exit_codes.hpp"
#include "cli/verify_command.hpp"
#include "deck/load.hpp"
#include "scale/cautions.hpp"
#include "scale/change_report.hpp"
#include "scale/expression.hpp"
#include "scale/noise_effect.hpp"
#include "scale/rescale.hpp"
#include "write/data_files.hpp"
#include "write/plan.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// Why -i must not replace `deck` ("" when it may): a symbolic link would be replaced by a
// file (the link's target left as it was), and a file without write permission is one its
// owner marked as not to be changed.
std::string in_place_refusal(const std::string& deck) {
    namespace fs = std::filesystem;
    std::error_code ec;
    auto st = fs::symlink_status(deck, ec);
    if (ec || !fs::exists(st)) return {};  // reading it reports the problem
    if (fs::is_symlink(st))
        return fmt::format("'{}' is a symbolic link; -i would replace the link with a file: run "
                           "-i on the file it points to, or write with -o",
                           deck);
    using P = fs::perms;
    if ((st.permissions() & (P::owner_write | P::group_write | P::others_write)) == P::none)
        return fmt::format("'{}' is read-only; -i does not replace a read-only deck: write with "
                           "-o, or make it writable first",
                           deck);
    return {};
}

bool same_file(const std::string& a, const std::string& b) {
    std::error_code ec;
    return fs::exists(a, ec) && fs::exists(b, ec) && fs::equivalent(a, b, ec);
}

}  // namespace

int run_scale(const ScaleOptions& o, std::ostream& out, std::ostream& err) {
    std::string output = o.in_place ? o.deck : o.output;
    if (!o.in_place && !output.empty() && same_file(output, o.deck)) {
        err << fmt::format("deckscale: error: '{}' is the input deck; refusing to overwrite it "
                           "(use -i/--in-place for that)\n", output);
        return exit_bad_input;
    }
    if (o.in_place) {
        if (auto why = in_place_refusal(o.deck); !why.empty()) {
            err << "deckscale: error: " << why << "\n";
            return exit_bad_input;
        }
    }
    DiskFileSystem disk;
    ScaleSettings settings;
    settings.factors = {o.km, o.kf};
    settings.digits = o.digits;
    settings.mark_unscalable = o.leave_unscalable;
    settings.threads = o.threads;
    settings.follow_flicker = o.follow_flicker;
    settings.record_changes = o.list_changes || !o.changes_json.empty();
    settings.hold = o.hold;
    try {
        ScaledDeck scaled = load_and_scale(o.deck, disk, settings);
        const Deck& deck = scaled.deck;
        ScaleResult& result = scaled.result;
        err << render(deck.warnings);
        err << render(result.notes);
        if (!o.list_changes && !result.held.empty()) err << held_list_text(deck, result);
        if (!result.unscalable.empty()) {
            err << render(result.unscalable);
            if (!o.leave_unscalable) {
                err << fmt::format(
                    "deckscale: {} item(s) cannot be scaled exactly; nothing was written "
                    "(--leave-unscalable writes the deck anyway, marking each item; --hold "
                    "keeps a part, a .model or a .subckt as written, and verify then reports "
                    "how far the response moved)\n",
                    result.unscalable.size());
                return exit_refused;
            }
        }
        OutputPlan plan = plan_output(deck, std::move(result.edits), output, o.flatten);
        plan.parallel = o.threads != 1;
        add_data_files(plan, data_file_outputs(deck, result.data_files, output, disk, o.digits));
        // Every file is written whole before any is renamed into place: an error or an
        // interruption leaves all the old files.
        OutputBatch batch;
        for (const auto& f : plan.files) {
            if (f.path.empty()) {
                StreamSink sink(out);
                produce_output(deck, plan, f, sink);
                sink.flush();
                out.flush();
                continue;
            }
            auto produce = [&](ByteSink& sink) { produce_output(deck, plan, f, sink); };
            // Replacing the user's own deck (-i): on disk before the original goes. Other
            // outputs can be made again from the deck, which is never touched.
            Durability durability = o.in_place && f.path == output ? Durability::synced
                                                                   : Durability::atomic;
            if (auto e = batch.add(f.path, produce, durability); !e.empty()) {
                err << "deckscale: error: " << e << "\n";
                return exit_bad_input;
            }
        }
        if (!o.changes_json.empty()) {
            if (auto e = batch.add(o.changes_json,
                                   change_list_json(deck, result, settings.factors, plan,
                                                    o.follow_flicker));
                !e.empty()) {
                err << "deckscale: error: " << e << "\n";
                return exit_bad_input;
            }
        }
        if (auto e = batch.commit(); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
        if (o.list_changes) (output.empty() ? err : out) << change_list_text(deck, result);
        if (!output.empty()) {
            err << fmt::format("deckscale: {} value(s) rewritten (Km = {}, Kf = {}); wrote", 
                               result.change_count, factor_text(o.km), factor_text(o.kf));
            for (const auto& f : plan.files) err << " " << f.path;
            err << "\n";
            err << render(data_files_left_behind(deck, o.deck, output, disk, result.data_files));
        }
        if (o.km == 1 && o.kf == 1)
            err << "deckscale: note: Km = Kf = 1 (no --km or --kf given?): the deck is written "
                   "unchanged\n";
        if (std::string n = noise_effect(deck, settings.factors, o.follow_flicker).line; !n.empty())
            err << "deckscale: " << n << "\n";
        err << scale_cautions(settings.factors, !result.held.empty(), result.semiconductors_scaled);
        if (o.verify) {
            // Verify the pair just written (the CLI allows --verify only with -o).
            VerifyOptions v;
            v.original = o.deck;
            v.scaled = output;
            v.factors_given = true;
            v.km = o.km;
            v.kf = o.kf;
            return run_verify(v, out, err);
        }
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
    return exit_ok;
}

}  // namespace deckscale
