// Internal to the code-model handlers (scale/codemodels.cpp): a code-model .model card as read,
// and what scaling it for one set of instance port types changes, applied to the card itself
// or written into a copy of it under a new name.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "scale/codemodel_ports.hpp"

namespace deckscale {

class ScalePass;

// One name=value of a code-model .model card: a scalar or the elements of a [ ] vector.
struct GivenParam {
    const Token* key = nullptr;
    const CodeModelParam* rule = nullptr;
    std::vector<Token> elements;
};

struct ModelCard {
    const CodeModelType* model = nullptr;
    std::vector<PortSpec> specs;
    std::vector<GivenParam> given;
    bool fraction = false;  // the value of `fraction`, given or default
    const GivenParam* given_of(std::string_view name) const;
};

// Reads the pass's current card. Throws DeckError for a parameter the model does not have;
// returns false (reported as unscalable) when `fraction` is not a true/false literal.
bool read_model_card(ScalePass& p, const CodeModelType& model, ModelCard& out);

struct ScaledValue {
    Token at;
    double factor;
    const CodeModelParam* rule;
};

// The changes for instances with these port types (null: the model's defaults): values to
// multiply and defaults to write out. Values a clamp inside the model would cut are reported.
struct CardPlan {
    std::vector<ScaledValue> values;
    std::string added;  // " name=value ..." to insert
    double first_factor = 1;
};
CardPlan plan_card(ScalePass& p, const ModelCard& m, const InstancePorts* ports);

// Applies a plan to the card itself.
void apply_plan(ScalePass& p, const CardPlan& plan);

// The text of the card with a plan applied and its name replaced, to insert after it.
std::string cloned_card(ScalePass& p, const CardPlan& plan, std::string_view name);

// True when two instances' port types give every parameter of the model the same factors.
bool same_factors(const CodeModelType& model, const std::vector<PortSpec>& specs,
                  const InstancePorts& a, const InstancePorts& b, ScaleFactors f);

bool differs(double a, double b);

}  // namespace deckscale
