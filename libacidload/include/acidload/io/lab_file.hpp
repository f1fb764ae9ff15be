#pragma once
// Lab results as a CSV file (the fitted parameters are written as an overlay by fitted_overlay.hpp).
//
// Lab CSV columns (names ours; a header "tbn [mg KOH/g]" gives bare cells that unit):
//   charge        which oil charge of the case's record, 1 = the first      (required)
//   oil-hours     hours on that charge when sampled, e.g. 400 or "400 h"    (required)
//   engine-hours, date   kept for the reader's eye; not used by the fit
//   lab           the laboratory: a change between samples is flagged
//   tbn, tbn-method   base number [mg KOH/g] and its method (D2896 or D4739; default D4739)
//   tan           acid number, D664 [mg KOH/g]
//   san           strong acid number [mg KOH/g]; "<0.1" or "0" is censored (below 0.1, or below
//                 the figure after '<'), not an exact zero
//   i-ph          initial pH (ASTM D7946): read and reported, not modelled
//   oxidation, nitration   FTIR [A/cm] or [A/0.1mm]: the unit must be stated in the header or in
//                 an ftir-unit column (1 A/0.1mm = 100 A/cm: ask the lab)
//   hour-meter, changed-at  the engine's hour meter at the sample and at the charge's oil change:
//                 oil hours = hour-meter − changed-at where no oil-hours cell is given
//   tbn-sd, tan-sd, san-sd, oxidation-sd, nitration-sd   this row's precision (one standard deviation)
//   oxidation-baseline, nitration-baseline   the lab's FTIR reading of the fresh oil
//   trended readings (lab_trend_columns(): fe, cu, pb, al, si, na, k … [ppm], viscosity-100 [cSt],
//                 water [%] …): read with their unit, trended against alarm levels, not modelled
//   antioxidant-remaining [% of fresh] (ASTM D6971/D7590), water [%], viscosity-100 with
//                 viscosity-100-fresh [cSt] (the fresh oil's, for the change in %): also compared with
//                 the case's limits by the forecast (limits passed: change the oil now)
//   any other column: carried through as text, with a note (a near miss of a known name is refused)
#include <string>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/studies/calibration.hpp"

namespace acidload::io {

//! A reading the lab file may carry that is trended, not modelled.
struct TrendColumn {
  std::string name;   //!< column name, e.g. "fe"
  std::string unit;   //!< the unit it is kept in, e.g. "ppm"
  std::vector<std::pair<std::string, double>> units;  //!< accepted header units and their factor to `unit`
  std::string what;   //!< plain words, e.g. "iron (liners, gears, crankshaft)"
  double high = 1e7;  //!< the largest reading accepted, in `unit` (beyond it: impossible, refused)
  bool above_zero = false;  //!< 0 is refused too (a viscosity)
};
//! The trended columns (add a row here to read another).
const std::vector<TrendColumn>& lab_trend_columns();

//! Reads lab samples; every mistake names the file, line, column, the column and the cell. Notes
//! (columns carried through unread) go to `notes` when given.
std::vector<LabSample> read_lab_samples(const std::string& path, std::vector<std::string>* notes = nullptr);

}  // namespace acidload::io
