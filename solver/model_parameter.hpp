#pragma once
// A parameter of a model that an estimation varies: which property, on which cells or
// features, and whether its value multiplies the model's own values or replaces them
// (docs/estimation.md). Plain data and one function that puts a value into a model.
#include <cstddef>
#include <string>
#include <vector>

#include "solver/model.hpp"

namespace aquiledger {

enum class ParameterProperty {
  conductivity,         ///< K (kx, and ky in the model's ratio ky / kx), L/T
  specific_storage,     ///< Ss, 1/L
  storativity,          ///< S = Ss (top - bottom), -; stored as Ss
  specific_yield,       ///< Sy, -
  recharge,             ///< rate of [[recharge]] features, multiplier only
  river_conductance,    ///< conductance of [[river]] features, multiplier only
  drain_conductance,    ///< conductance of [[drain]] features, multiplier only
  external_conductance  ///< conductance of [[external_head]] features, multiplier only
};

/// "k", "specific_storage", ... as written in the set-up file.
const char* parameter_property_label(ParameterProperty property);

/// True for the properties held per grid cell by the aquifer; false for the features' ones.
bool is_cell_property(ParameterProperty property);

enum class ParameterForm {
  multiplier,  ///< the model's values times the parameter (-)
  value        ///< the parameter replaces the model's values (the property's unit)
};

struct ModelParameter {
  std::string name;
  ParameterProperty property = ParameterProperty::conductivity;
  ParameterForm form = ParameterForm::multiplier;
  /// Grid cells the parameter sets (cell properties), ascending, active cells only.
  std::vector<int> cells;
  /// Positions in the model's list of the feature kind (feature properties), ascending.
  std::vector<std::size_t> features;
};

/// Puts `value` (multiplier, -, or the property's value in the model's units) of parameter
/// p into model, whose values of p's cells or features are replaced by those of base times
/// value (multiplier) or by value (value; for K, ky keeps base's ratio ky / kx; for S, Ss =
/// S / (top - bottom)). Everything else of model is left as it is, so that parameters on
/// distinct cells compose. model must have base's shape (a copy of it).
void apply_parameter(const Model& base, const ModelParameter& p, double value, Model& model);

}  // namespace aquiledger
