package record

import (
	"math"
	"time"

	"wetline/rating/gauged"
)

// daySeconds is the length of a calendar day in a fixed UTC offset.
const daySeconds = 86400

// dayAcc accumulates one calendar day.
type dayAcc struct {
	area       float64 // ∫Q dt over the covered part (discharge unit × s)
	covered    int64   // seconds covered
	min, max   float64
	minT, maxT int64
	readings   int
	flags      Flag
}

// counter accumulates the days of a record and the counts its warnings
// need.
type counter struct {
	off   int64 // UTC offset, seconds
	first int64 // Unix time of the first day's midnight
	days  []dayAcc
	units []UnitValue
	// flags[b] counts the unit values with flag bit b.
	flags              [16]int
	gaps               int
	longest, longestAt int64
}

// newCounter lays out the days from the first reading's to the last's.
func newCounter(res *Result, st *Stages, off int64) *counter {
	c := &counter{off: off, units: res.Units}
	c.first = c.midnight(st.Time[0])
	last := c.midnight(st.Time[len(st.Time)-1])
	c.days = make([]dayAcc, (last-c.first)/daySeconds+1)
	for i := range c.days {
		c.days[i].min, c.days[i].max = math.NaN(), math.NaN()
	}
	return c
}

// midnight is the Unix time of the midnight that begins t's day.
func (c *counter) midnight(t int64) int64 {
	return floorDiv(t+c.off, daySeconds)*daySeconds - c.off
}

// day is the index of t's day.
func (c *counter) day(t int64) int { return int((c.midnight(t) - c.first) / daySeconds) }

// reading counts one unit value into its day.
func (c *counter) reading(u UnitValue) {
	for b := 0; u.Flags>>b != 0; b++ {
		if u.Flags&(1<<b) != 0 {
			c.flags[b]++
		}
	}
	d := &c.days[c.day(u.Time)]
	d.readings++
	d.flags |= u.Flags &^ Gap
	d.extreme(u.Time, u.Discharge)
}

// extreme counts the discharge q at time t into the day's least and
// greatest; of equal discharges the earliest time is kept. NaN counts for
// nothing.
func (d *dayAcc) extreme(t int64, q float64) {
	if math.IsNaN(q) {
		return
	}
	if math.IsNaN(d.min) || q < d.min || q == d.min && t < d.minT {
		d.min, d.minT = q, t
	}
	if math.IsNaN(d.max) || q > d.max || q == d.max && t < d.maxT {
		d.max, d.maxT = q, t
	}
}

// integrate adds every bridged interval between readings to its days,
// splitting it at the rating's breaks.
func (c *counter) integrate(st *Stages, r *gauged.Rater, maxGap int64) {
	var breaks []int64
	for _, b := range r.Breaks() {
		breaks = append(breaks, b.Unix())
	}
	k := 0 // next break to consider
	for i := 1; i < len(st.Time); i++ {
		t0, t1 := st.Time[i-1], st.Time[i]
		for k < len(breaks) && breaks[k] <= t0 {
			k++
		}
		if t1-t0 > maxGap {
			c.gap(t0, t1)
			continue
		}
		h0, h1 := st.Stage[i-1], st.Stage[i]
		ta, qa, node := t0, c.units[i-1].Discharge, false
		for ; k < len(breaks) && breaks[k] <= t1; k++ {
			b := breaks[k]
			hb := h0 + (h1-h0)*float64(b-t0)/float64(t1-t0)
			c.segment(ta, qa, b, r.AtUnix(b, hb, true).Discharge, node, b < t1) // on a reading, the reading stands for the break
			ta, qa, node = b, c.units[i].Discharge, false
			if b < t1 {
				qa, node = r.AtUnix(b, hb, false).Discharge, true
			}
		}
		c.segment(ta, qa, t1, c.units[i].Discharge, node, false)
	}
}

// gap marks an unbridged interval from t0 to t1 on the days it touches.
func (c *counter) gap(t0, t1 int64) {
	c.gaps++
	if t1-t0 > c.longest {
		c.longest, c.longestAt = t1-t0, t0
	}
	for d := c.day(t0); d <= c.day(t1-1); d++ {
		c.days[d].flags |= Gap
	}
}

// segment adds the trapezoid from (ta, qa) to (tb, qb) to the days it
// covers, split at midnights with the discharge linear in time. A segment
// with no discharge at an end covers nothing. The discharge at a midnight
// the segment reaches counts into the least and greatest of the day it
// ends and of the day it begins, at the midnight's time. An end that is a
// side of a rating break (fromBreak for its start, toBreak for its end:
// the discharge at the break on the rating and shifts in force after it,
// or before it) counts into the least and greatest of its day too, at the
// break's time, as the unit values do: the daily extremes are those of the
// discharge the mean integrates. A reading's end is counted by reading;
// a break that falls on a reading is that reading's unit value alone (the
// side before it is no unit value, and a daily extreme there would be one
// the record's table does not show).
func (c *counter) segment(ta int64, qa float64, tb int64, qb float64, fromBreak, toBreak bool) {
	if tb <= ta || math.IsNaN(qa) || math.IsNaN(qb) {
		return
	}
	slope := (qb - qa) / float64(tb-ta)
	s, qs := ta, qa
	for d := c.day(ta); s < tb; d++ {
		begin, end := c.first+int64(d)*daySeconds, c.first+int64(d+1)*daySeconds
		e := min(tb, end)
		qe := qb
		if e < tb {
			qe = qa + slope*float64(e-ta)
		}
		day := &c.days[d]
		day.area += 0.5 * (qs + qe) * float64(e-s)
		day.covered += e - s
		if s == begin || s == ta && fromBreak {
			day.extreme(s, qs)
		}
		if e == end || e == tb && toBreak {
			day.extreme(e, qe)
		}
		s, qs = e, qe
	}
}

// daily returns the daily values.
func (c *counter) daily(z *time.Location) []DailyValue {
	out := make([]DailyValue, len(c.days))
	for i, d := range c.days {
		v := DailyValue{
			Date: time.Unix(c.first+int64(i)*daySeconds, 0).In(z), Mean: math.NaN(), Min: d.min, Max: d.max,
			Coverage: float64(d.covered) / daySeconds, Readings: d.readings, Flags: d.flags,
		}
		if d.covered > 0 {
			v.Mean = d.area / float64(d.covered)
		}
		if !math.IsNaN(d.min) {
			v.MinTime, v.MaxTime = time.Unix(d.minT, 0).In(z), time.Unix(d.maxT, 0).In(z)
		}
		if d.covered < daySeconds {
			v.Flags |= Partial
		}
		out[i] = v
	}
	return out
}
