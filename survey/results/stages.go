package results

import (
	"errors"
	"fmt"

	"wetline/rating"
	"wetline/subdivide"
)

// ErrNoDepth is the cause of a section that default stages cannot rate:
// it holds no water below its ends, or is shallower than a table writes
// stages apart (LengthResolution). It is a fault of the survey, not of
// the stages asked for.
var ErrNoDepth = errors.New("the section has no depth to rate")

// TableStages returns the stages spec asks for in geometry g, with the
// warnings of rating.StageSpec.StagesWarn, checked to be written apart
// (CheckStagesApart). A default step is never finer than a table writes
// its stages: spec.MinStep is raised to LengthResolution when it is
// finer. With default stages (no list, no range, no step), a
// section holding no water below its ends (rating.ErrNoLowPoint) or
// shallower than LengthResolution (ErrStagesAlike) is an error naming
// source and wrapping ErrNoDepth and the cause; other errors are returned
// as they are, for the caller to name the flag that asked.
func TableStages(spec rating.StageSpec, g subdivide.Geometry, source string) ([]float64, []string, error) {
	spec.MinStep = max(spec.MinStep, LengthResolution)
	stages, warnings, err := spec.StagesWarn(g)
	if err == nil {
		err = CheckStagesApart(stages)
	}
	if err == nil {
		return stages, warnings, nil
	}
	given := len(spec.List) > 0 || spec.FromSet || spec.ToSet || spec.Step != 0
	switch {
	case given:
	case errors.Is(err, rating.ErrNoLowPoint):
		return nil, nil, fmt.Errorf("%s: %w: %w", source, ErrNoDepth, err)
	case errors.Is(err, ErrStagesAlike):
		return nil, nil, fmt.Errorf("%s: %w: its lowest point, at %g, lies %.2g below the lower of its ends, at %g, less than the table's precision: %w",
			source, ErrNoDepth, g.Bottom(), g.Top()-g.Bottom(), g.Top(), err)
	}
	return nil, nil, err
}
