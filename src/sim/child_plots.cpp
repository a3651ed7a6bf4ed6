// Reading the plots of a run out of ngspice's memory and sending them to the parent.
#include <algorithm>
#include <cstring>

#include "sim/child_state.hpp"

namespace deckscale::child_process {
namespace {

// ngspice's vector types (enum simulation_types in ngspice's include/ngspice/sim.h;
// sharedspice.h only exposes the int): SV_TIME = 1, SV_FREQUENCY = 2, SV_VOLTAGE = 3,
// SV_CURRENT = 4, SV_VOLTAGE_DENSITY = 5, SV_CURRENT_DENSITY = 6, SV_SQR_VOLTAGE_DENSITY = 7,
// SV_SQR_CURRENT_DENSITY = 8, SV_SQR_VOLTAGE = 9, SV_SQR_CURRENT = 10 (ngspice 39's
// `display` names them "voltage-density", "current^2-density", ... in a .noise run).
VectorKind kind_of(int v_type) {
    constexpr VectorKind kinds[] = {VectorKind::other,
                                    VectorKind::time,
                                    VectorKind::frequency,
                                    VectorKind::voltage,
                                    VectorKind::current,
                                    VectorKind::voltage_density,
                                    VectorKind::current_density,
                                    VectorKind::voltage_squared_density,
                                    VectorKind::current_squared_density,
                                    VectorKind::voltage_squared,
                                    VectorKind::current_squared};
    return v_type > 0 && v_type < 11 ? kinds[v_type] : VectorKind::other;
}
constexpr short vf_complex = 1 << 1;  // VF_COMPLEX in ngspice's include/ngspice/dvec.h

}  // namespace

std::vector<PlotView> find_plots(Child& child) {
    std::vector<std::string> names;
    for (char** p = child.api.all_plots(); p && *p; ++p)
        if (std::strcmp(*p, "const") != 0) names.emplace_back(*p);
    std::vector<PlotView> plots;
    for (auto it = names.rbegin(); it != names.rend(); ++it) {
        PlotView plot;
        plot.name = *it;
        for (const PlotRecord& r : child.records)
            if (r.type == plot.name) plot.analysis = r.name;
        std::vector<std::string> vec_names;
        for (char** v = child.api.all_vecs(plot.name.data()); v && *v; ++v)
            vec_names.emplace_back(*v);
        for (const std::string& vec_name : vec_names) {
            std::string qualified = plot.name + "." + vec_name;
            pvector_info info = child.api.vec_info(qualified.data());  // one static struct
            if (!info) {  // e.g. a multi-dimensional vector; ngspice logged why
                child.unreadable = true;
                continue;
            }
            VectorView v;
            v.name = info->v_name ? info->v_name : vec_name;
            v.kind = kind_of(info->v_type);
            if ((info->v_flags & vf_complex) != 0 && info->v_compdata) {
                v.complex = info->v_compdata;
            } else if (info->v_realdata) {
                v.real = info->v_realdata;
            }
            v.length = (v.complex || v.real) && info->v_length > 0
                           ? static_cast<std::uint32_t>(info->v_length)
                           : 0;
            plot.vectors.push_back(std::move(v));
        }
        plots.push_back(std::move(plot));
    }
    return plots;
}

void send_plot(Child& child, const PlotView& plot) {
    child.send(wire::plot_header_frame(plot.name, plot.analysis,
                                       static_cast<std::uint32_t>(plot.vectors.size())));
    for (const VectorView& v : plot.vectors) {
        child.send(wire::vector_frame_start(v.name, v.kind, v.length));
        if (v.complex) {
            child.give(reinterpret_cast<const char*>(v.complex), v.length * sizeof(ngcomplex_t));
            continue;
        }
        double pairs[2 * 512];
        for (std::uint32_t i = 0; i < v.length;) {
            std::uint32_t n = std::min<std::uint32_t>(512, v.length - i);
            for (std::uint32_t k = 0; k < n; ++k) {
                pairs[2 * k] = v.real[i + k];
                pairs[2 * k + 1] = 0.0;
            }
            child.send(reinterpret_cast<const char*>(pairs), n * 2 * sizeof(double));
            i += n;
        }
    }
}

}  // namespace deckscale::child_process
