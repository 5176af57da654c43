// Package plotting draws the report figures of wetline as PNG images: the
// stage–discharge rating (linear and log–log panels, with the bands of a
// fit and the gaugings), the surveyed cross-section with its water surfaces
// and subsections, hydraulic properties against stage, the slope-area reach
// profile and overlaid sections, step-backwater profiles and ratings, the
// plan of a coordinate survey, shifts against time and stage, the
// hydrograph of a discharge record, and comparisons of two ratings or two
// surveys. Draw functions (DrawRating, DrawFit, DrawReach, ...) turn a
// report into its named figures (rating.Figure) in memory.
//
// Conventions used throughout the package:
//
//   - Inputs are plain values defined here (RatingPlot, SectionPlot,
//     PropertiesPlot, ReachPlot); helpers such as CurveFromTable and
//     PropertiesFromTable build them from a rating.Table. Inputs are never
//     modified.
//   - Lengths, stages and discharges are in the unit system named by the
//     figure's Units field (rating.SI: m, m², m³/s; rating.US: ft, ft², ft³/s);
//     the package never converts units. A missing value is NaN and is left
//     out of the drawing.
//   - Stage or elevation is on the vertical axis of every figure but the
//     plan (northing) and the hydrograph's discharge panel, as hydrologists
//     read a rating.
//   - Each drawing function writes one PNG to an io.Writer and returns a
//     Result whose Warnings list what was left out and why. Bad data never
//     panics: a panic inside the plotting library is recovered and returned
//     as an error (ErrDraw).
//   - Figures are sized in pixels at a resolution (Size; the zero value is
//     1600×1000 px at 150 dpi), so text keeps its printed size in points.
//   - The colour scheme keeps series apart by lightness, dash pattern and
//     marker shape as well as hue, so figures survive greyscale printing.
//   - The package never sets plot.DefaultFont; every text style it uses is
//     set on the figure itself, so drawing is safe from several goroutines.
package plotting
