package rating

// Caution is the short statement every report of a rating, a flood
// estimate or a discharge record carries, in every format.
const Caution = "Computed ratings and flood estimates are estimates: verify them against discharge measurements. " +
	"Local codes, agency standards and licensed professional judgement govern their use for design or flood warning."

// IndirectNote is stated beside the caution by every report of a flood
// peak estimated indirectly (slope-area, slope-conveyance).
const IndirectNote = "Indirect estimates of a flood peak carry large uncertainty: review the marks, the n values and the checks."
