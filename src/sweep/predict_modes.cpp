// Predictions from numerical eigenmodes (`tubewave modes`): the hook.
//
// `tubewave modes` (being written beside the sweep) computes a case's linear eigenmodes
// from its run file. To put its branches into sweep summaries, return one
// PredictionSource per branch here, e.g. id "modes:alfven", whose `predict` calls the
// modes library with `*in.run` (the case's resolved run file) and returns, at `in.omega`
// (a driven run) or `in.k` (an initial-value run), the same quantities as the closed forms
// (wavenumber, wavelength, phase_speed, group_speed, damping_rate, ...; see
// wave_quantities()). Nothing else changes: the sweep file names the id under
// `predict[].formula`, and the summary gets the columns.
#include "sweep/predict.hpp"

namespace tw::sweep {

std::vector<PredictionSource> modes_prediction_sources() { return {}; }

}  // namespace tw::sweep
