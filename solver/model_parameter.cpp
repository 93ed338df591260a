#include "solver/model_parameter.hpp"

#include <cassert>

namespace aquiledger {
namespace {

PeriodValues scaled(const PeriodValues& v, double factor) {
  std::vector<std::vector<double>> tables = v.tables();
  for (auto& t : tables)
    for (double& x : t) x *= factor;
  return PeriodValues(std::move(tables), v.table_of_period());
}

}  // namespace

const char* parameter_property_label(ParameterProperty property) {
  switch (property) {
    case ParameterProperty::conductivity:
      return "k";
    case ParameterProperty::specific_storage:
      return "specific_storage";
    case ParameterProperty::storativity:
      return "storativity";
    case ParameterProperty::specific_yield:
      return "specific_yield";
    case ParameterProperty::recharge:
      return "recharge";
    case ParameterProperty::river_conductance:
      return "river_conductance";
    case ParameterProperty::drain_conductance:
      return "drain_conductance";
    case ParameterProperty::external_conductance:
      return "external_conductance";
  }
  return "?";
}

bool is_cell_property(ParameterProperty property) {
  switch (property) {
    case ParameterProperty::conductivity:
    case ParameterProperty::specific_storage:
    case ParameterProperty::storativity:
    case ParameterProperty::specific_yield:
      return true;
    default:
      return false;
  }
}

void apply_parameter(const Model& base, const ModelParameter& p, double value, Model& model) {
  const bool times = p.form == ParameterForm::multiplier;
  const Aquifer& b = base.aquifer;
  Aquifer& a = model.aquifer;
  switch (p.property) {
    case ParameterProperty::conductivity:
      for (int c : p.cells) {
        const auto i = static_cast<std::size_t>(c);
        a.kx[i] = times ? b.kx[i] * value : value;
        a.ky[i] = times ? b.ky[i] * value : b.kx[i] > 0.0 ? value * b.ky[i] / b.kx[i] : value;
      }
      return;
    case ParameterProperty::specific_storage:
      for (int c : p.cells) {
        const auto i = static_cast<std::size_t>(c);
        a.specific_storage[i] = times ? b.specific_storage[i] * value : value;
      }
      return;
    case ParameterProperty::storativity:
      for (int c : p.cells) {
        const auto i = static_cast<std::size_t>(c);
        a.specific_storage[i] =
            times ? b.specific_storage[i] * value : value / (b.top[i] - b.bottom[i]);
      }
      return;
    case ParameterProperty::specific_yield:
      for (int c : p.cells) {
        const auto i = static_cast<std::size_t>(c);
        a.specific_yield[i] = times ? b.specific_yield[i] * value : value;
      }
      return;
    case ParameterProperty::recharge:
      assert(times);
      for (std::size_t f : p.features)
        model.recharges[f].rate = scaled(base.recharges[f].rate, value);
      return;
    case ParameterProperty::river_conductance:
      assert(times);
      for (std::size_t f : p.features)
        model.rivers[f].conductance = scaled(base.rivers[f].conductance, value);
      return;
    case ParameterProperty::drain_conductance:
      assert(times);
      for (std::size_t f : p.features)
        model.drains[f].conductance = scaled(base.drains[f].conductance, value);
      return;
    case ParameterProperty::external_conductance:
      assert(times);
      for (std::size_t f : p.features)
        model.external_heads[f].conductance = scaled(base.external_heads[f].conductance, value);
      return;
  }
}

}  // namespace aquiledger
