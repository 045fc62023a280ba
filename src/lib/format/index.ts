// The one formatting module: numbers (one precision per quantity and unit), dates and times (UTC
// first, the reader's zone beside it), durations, and the fuel and reserve helpers pages share.
// Rules are written out in DEVELOPERS.md, "Figures, dates and times".
export * from './numbers';
export * from './time';
export * from './duration';
export * from './fuel';
