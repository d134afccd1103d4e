// Package bolt holds the data of metric bolts that the model file, the
// material laws and the hand methods share: ISO 261 coarse threads with the
// ISO 898-1 stress area, the strengths of the property classes (nominal
// values of EN 1993-1-8 Table 3.1, minimum values of ISO 898-1) and the
// design preload of EN 1993-1-8, 3.9. It imports nothing of ours.
//
// Units are mm, mm², N and MPa.
package bolt
