package runs

// Version is the program version written into every run folder (fields.h5,
// checkpoints, summary.json) and printed by `rollerbed version`.
const Version = "0.2.0"
