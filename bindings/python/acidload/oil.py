"""The oil balance of docs/model.md §8 for one segment of constant rates, solved exactly by acidload's core
(closed form per regime: above the base floor, at the floor with free strong acid, at the floor with the
organic acid limiting). Concentrations in mg KOH/g, time in h, mass in kg.

    import acidload.oil as oil
    props = oil.OilProperties(); props.fresh_tbn = 6.0
    k = oil.balance_constants(props)
    r = oil.OilRates(); r.strong_acid = 4.0; r.consumption = 0.2        # g KOH/h, kg/h
    state, outcome = oil.advance(oil.fresh_oil(props, 528.0), k, r, 1000.0, oil.OilLedger())
"""
from ._core import oil as _oil

BaseNumberMethod = _oil.BaseNumberMethod
OilBalance = _oil.OilBalance
OilLedger = _oil.OilLedger
OilProperties = _oil.OilProperties
OilRates = _oil.OilRates
OilState = _oil.OilState
Regime = _oil.Regime
SegmentOutcome = _oil.SegmentOutcome
advance = _oil.advance
balance_constants = _oil.balance_constants
fresh_oil = _oil.fresh_oil
oil_change = _oil.oil_change
san = _oil.san
steady_state = _oil.steady_state
tan = _oil.tan
tbn = _oil.tbn
top_up = _oil.top_up

__all__ = ["BaseNumberMethod", "OilBalance", "OilLedger", "OilProperties", "OilRates", "OilState", "Regime",
           "SegmentOutcome", "advance", "balance_constants", "fresh_oil", "oil_change", "san", "steady_state",
           "tan", "tbn", "top_up"]
