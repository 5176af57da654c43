package rating

import (
	"fmt"
	"strings"
)

// Units selects the unit system of every input and output.
// The zero value is SI.
type Units int

// Unit systems.
const (
	SI Units = iota // metres, m³/s
	US              // feet, ft³/s
)

// ParseUnits reads "si" or "us" (any case).
func ParseUnits(s string) (Units, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "si", "metric", "":
		return SI, nil
	case "us", "imperial", "customary":
		return US, nil
	}
	return SI, fmt.Errorf("units %q: want si or us", s)
}

func (u Units) String() string {
	if u == US {
		return "us"
	}
	return "si"
}

// ManningK is the unit factor k of Manning's equation V = (k/n)·R^(2/3)·S^(1/2):
// 1 in SI and 1.486 in US customary units (Chow, 1959, Open-Channel
// Hydraulics, eq. 5-7).
func (u Units) ManningK() float64 {
	if u == US {
		return 1.486
	}
	return 1
}

// Gravity is the standard acceleration of gravity: 9.80665 m/s² or
// 32.174 ft/s².
func (u Units) Gravity() float64 {
	if u == US {
		return 32.174
	}
	return 9.80665
}

// UnitWeight is the specific weight of fresh water near 10 °C:
// 9 804 N/m³ or 62.4 lb/ft³.
func (u Units) UnitWeight() float64 {
	if u == US {
		return 62.4
	}
	return 9804
}

// Length, Area, Discharge, Velocity and Stress name the units for output.
func (u Units) Length() string {
	if u == US {
		return "ft"
	}
	return "m"
}

// Area names the unit of area.
func (u Units) Area() string { return u.Length() + "2" }

// Discharge names the unit of discharge.
func (u Units) Discharge() string { return u.Length() + "3/s" }

// Velocity names the unit of velocity.
func (u Units) Velocity() string { return u.Length() + "/s" }

// Conveyance names the unit of conveyance (discharge at unit slope).
func (u Units) Conveyance() string { return u.Discharge() }

// Stress names the unit of boundary shear stress.
func (u Units) Stress() string {
	if u == US {
		return "lb/ft2"
	}
	return "Pa"
}

// FeetPerMetre is the number of international feet in a metre, 1/0.3048
// (the international foot is 0.3048 m exactly, by the international yard
// and pound agreement of 1959), to the rounding of float64.
const FeetPerMetre = 1 / 0.3048

// MaxDischarge bounds a discharge given or read, in either unit system:
// far above any river's flood (the largest are near 3·10⁵ m³/s), so a
// larger number is a typing slip.
const MaxDischarge = 1e8

// MinN and MaxN bound a plausible Manning's n (dimensionless): below
// 0.005 no channel is so smooth, above 1 the value is not an n (common
// practice).
const MinN, MaxN = 0.005, 1.0
