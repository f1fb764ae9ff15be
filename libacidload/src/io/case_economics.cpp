// The `scrubbing` and `economics` sections of a case (docs/case-format.md): a train of stages and
// the prices. Keys, kinds and ranges come from the registry (keys.cpp); the physics they feed is in
// core/scrubber, core/economics and studies/economics.
#include <string>

#include "acidload/core/error.hpp"
#include "case_reader.hpp"
#include "text.hpp"

namespace acidload::io::detail {

namespace {

StageKind stage_kind(const std::string& w) {
  for (StageKind k : all_stage_kinds)
    if (name(k) == w) return k;
  return StageKind::fixed;
}

TrainStage read_stage(const Reader& r, const Node& n, std::size_t index) {
  r.require_section(n, "stage");
  TrainStage t;
  t.name = "stage " + std::to_string(index + 1);
  if (const Node* x = r.at(n, "stage.name")) {
    t.name = r.text(*x);
    if (t.name.empty()) r.fail(*x, "", "a name that is not empty");
  }
  const Node* kn = r.at(n, "stage.kind");
  if (!kn) r.fail(n, "(no kind)", "a 'kind': " + join(case_key("stage.kind").words));
  ScrubStage& s = t.stage;
  s.kind = stage_kind(r.word(*kn, case_key("stage.kind")));
  const bool bed = is_media_bed(s.kind);
  // keys that belong to beds only, or to other stages only
  for (const char* key : {"stage.capacity", "stage.bed-mass", "stage.breakthrough-width", "stage.changeout-at",
                          "stage.changeout-every"})
    if (!bed)
      if (const Node* x = r.at(n, key))
        r.fail(*x, describe(*x), std::string("no '") + case_key(key).key() + "' for a " + std::string(name(s.kind)) +
                                    " stage (media beds only: iron-oxide, activated-carbon)");
  if (s.kind == StageKind::iron_oxide || s.kind == StageKind::biological || s.kind == StageKind::caustic)
    for (const char* key : {"stage.other-sulfur-removal", "stage.halogen-removal"})
      if (const Node* x = r.at(n, key))
        r.fail(*x, describe(*x), std::string(name(s.kind)) + " takes H2S only (" +
                                     (s.kind == StageKind::iron_oxide ? "other sulfur and organic halogens pass iron oxide"
                                                                      : "use an activated-carbon or fixed stage for the rest") +
                                     ")");
  if (!r.get(n, "stage.efficiency", s.efficiency) && !bed)
    r.fail(n, "(no efficiency)", "an 'efficiency' (the share of the H2S removed) for a " + std::string(name(s.kind)) + " stage");
  r.get(n, "stage.capacity", s.capacity);
  r.get(n, "stage.breakthrough-width", s.breakthrough_width);
  r.get(n, "stage.other-sulfur-removal", s.other_sulfur_removal);
  r.get(n, "stage.halogen-removal", s.halogen_removal);
  if (bed) {
    if (!r.get(n, "stage.bed-mass", s.bed_mass)) r.fail(n, "(no bed-mass)", "a 'bed-mass' for a media bed");
    const Node* at = r.at(n, "stage.changeout-at");
    const Node* every = r.at(n, "stage.changeout-every");
    if (at && every) r.fail(*every, every->scalar, "either 'changeout-at' or 'changeout-every', not both");
    if (!at && !every) r.fail(n, "(no changeout rule)", "'changeout-at' (an outlet H2S in ppmv) or 'changeout-every' (hours)");
    if (every) {
      s.changeout.kind = ChangeoutRule::Kind::schedule;
      r.get(n, "stage.changeout-every", s.changeout.every_hours);
    } else {
      const Concentration c = r.contaminant(*at, Basis::dry);
      if (c.unit != ConcentrationUnit::ppmv || c.basis != Basis::dry || !(c.value > 0))
        r.fail(*at, at->scalar, "an outlet H2S above 0 in ppmv (dry), e.g. '50 ppmv'");
      s.changeout = {ChangeoutRule::Kind::outlet_level, c.value, 0};
    }
  }
  r.get(n, "stage.capital", t.costs.capital);
  r.get(n, "stage.life", t.costs.life_years);
  r.get(n, "stage.running-cost", t.costs.running);
  try {
    validate(s);
  } catch (const InputError& e) {
    r.fail(n, describe(n), e.key() + ": " + e.expected());
  }
  return t;
}

}  // namespace

std::vector<TrainStage> read_scrubbing(const Reader& r, const Node& s, double& step) {
  r.require_section(s, "scrubbing");
  r.get(s, "scrubbing.step", step);
  std::vector<TrainStage> train;
  const Node* st = r.at(s, "scrubbing.stages");
  if (!st || st->type == Node::Type::null) return train;
  if (st->type != Node::Type::sequence) r.fail(*st, describe(*st), "a list of stages, each with its 'kind'");
  if (st->items.size() > 20) r.fail(*st, std::to_string(st->items.size()) + " stages", "at most 20 stages (a cap on work)");
  for (std::size_t i = 0; i < st->items.size(); ++i) train.push_back(read_stage(r, st->items[i], i));
  return train;
}

void read_economics(const Reader& r, const Node& e, CostCase& c, double& sensitivity_step) {
  r.require_section(e, "economics");
  if (const Node* x = r.at(e, "economics.currency")) c.currency = r.text(*x);
  Prices& p = c.prices;
  r.get(e, "economics.hours-per-year", c.hours_per_year);
  r.get(e, "economics.electricity-price", p.electricity);
  r.get(e, "economics.oil-price", p.oil);
  r.get(e, "economics.oil-per-change", c.oil_per_change);
  r.get(e, "economics.oil-change-labour", p.oil_change_labour);
  r.get(e, "economics.oil-change-downtime", p.oil_change_downtime);
  r.get(e, "economics.lab-cost", p.lab_sample);
  r.get(e, "economics.sampling-interval", p.sampling_interval);
  r.get(e, "economics.iron-oxide-price", p.iron_oxide);
  r.get(e, "economics.carbon-price", p.carbon);
  r.get(e, "economics.disposal-price", p.disposal);
  r.get(e, "economics.changeout-labour", p.changeout_labour);
  r.get(e, "economics.changeout-downtime", p.changeout_downtime);
  r.get(e, "economics.caustic-price", p.caustic);
  r.get(e, "economics.caustic-excess", p.caustic_excess);
  r.get(e, "economics.biological-consumables", p.biological);
  r.get(e, "economics.discount-rate", p.discount_rate);
  r.get(e, "economics.wear-cost", p.wear_cost);
  r.get(e, "economics.wear-hours", p.wear_hours);
  r.get(e, "economics.sensitivity-step", sensitivity_step);
  try {
    validate(p);
  } catch (const InputError& x) {
    r.relocate(x, e);
  }
}

}  // namespace acidload::io::detail
