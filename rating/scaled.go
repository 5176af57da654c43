package rating

import "wetline/subdivide"

// ScaledN is a geometry whose Manning's n values are multiplied by Factor:
// every subsection's, or only the main channel's when ChannelOnly. A zero
// Factor leaves n unchanged.
type ScaledN struct {
	subdivide.Geometry
	// Factor multiplies n (dimensionless, > 0).
	Factor float64
	// ChannelOnly scales only subsections in the Channel region.
	ChannelOnly bool
}

// Scales reports whether the subsections of region r are scaled.
func (s ScaledN) Scales(r subdivide.Region) bool {
	return s.Factor > 0 && (!s.ChannelOnly || r == subdivide.Channel)
}

// At returns the wetted geometry with scaled n.
func (s ScaledN) At(stage float64, opt subdivide.Options) (subdivide.Wetted, error) {
	w, err := s.Geometry.At(stage, opt)
	for i := range w.Subs {
		if s.Scales(w.Subs[i].Region) {
			w.Subs[i].N *= s.Factor
		}
	}
	return w, err
}

// Subsections returns the layout with scaled n.
func (s ScaledN) Subsections() []subdivide.Subsection {
	subs := s.Geometry.Subsections()
	for i := range subs {
		if s.Scales(subs[i].Region) {
			subs[i].N *= s.Factor
		}
	}
	return subs
}

// Name returns the underlying geometry's name, if it has one.
func (s ScaledN) Name() string {
	if n, ok := s.Geometry.(interface{ Name() string }); ok {
		return n.Name()
	}
	return ""
}
