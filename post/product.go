package post

// Version is the release of flangeseg that the files it writes name;
// builds from a checkout add the revision in `flangeseg version`.
const Version = "0.1.0-dev"

// Caution goes into every summary file and calculation note that flangeseg
// writes, and into its help: results can make an unsafe joint look safe if
// they are used unchecked.
const Caution = `flangeseg is a design aid. Its results must be checked against the governing
codes (e.g. EN 1993-1-8, EN 1993-1-9) and signed off under local codes and
licensed engineering practice before any joint is built or accepted.`
