// The Burndown recorder CSV: the column names and units of our own documented format, the limits
// every recorder row must respect whatever its layout, and the upload size limit.
// Documented for users in the README section "Burndown recorder CSV".
import { DEFAULT_LIMITS } from '$lib/fuel';
import type { FlowUnit } from '$lib/units';

/** Time column of our format: ISO 8601 with Z or an offset. */
export const TIME_COLUMN = 'time_utc';

/** The flow column's name carries its unit; a file has exactly one of these. */
export const FLOW_COLUMNS: Readonly<Record<string, FlowUnit>> = {
	fuel_flow_usgph: 'usgal/h',
	fuel_flow_lph: 'l/h',
	fuel_flow_impgph: 'impgal/h',
	fuel_flow_lbph: 'lb/h',
	fuel_flow_kgph: 'kg/h'
};

export const GS_COLUMN = 'ground_speed_kt';
export const DTG_COLUMN = 'distance_to_go_nm';
export const WPT_COLUMN = 'waypoint';
export const LAT_COLUMN = 'latitude';
export const LON_COLUMN = 'longitude';
export const ALT_COLUMN = 'altitude_ft';
export const SEQ_COLUMN = 'seq';

/** Columns that must be present in a file of our format (plus one flow column). */
export const REQUIRED_COLUMNS = [TIME_COLUMN, GS_COLUMN, DTG_COLUMN] as const;
export const OPTIONAL_COLUMNS = [WPT_COLUMN, LAT_COLUMN, LON_COLUMN, ALT_COLUMN, SEQ_COLUMN] as const;

/**
 * Above this flow a reading is a sensor or unit error, not fuel burnt: 500 L/h is about 132 US
 * gal/h, several times the full-rich take-off flow of the largest piston singles (from memory).
 * The same figure the fuel engine rejects rows at, so parser and engine never disagree.
 */
export const MAX_FLOW_LPH: number = DEFAULT_LIMITS.maxFlowLph;
/** No piston light aircraft reaches 400 kt over the ground; above is a unit or GPS error. */
export const MAX_GS_KT: number = DEFAULT_LIMITS.maxGsKt;
/** Half the Earth's circumference is about 10,800 NM; no next waypoint is further. */
export const MAX_DTG_NM: number = DEFAULT_LIMITS.maxDtgNm;
export const MIN_ALT_FT: number = DEFAULT_LIMITS.minAltFt;
export const MAX_ALT_FT: number = DEFAULT_LIMITS.maxAltFt;
/** Waypoint ids are short identifiers; a long text is a shifted column. */
export const MAX_WPT_LENGTH = 40;
/** Times outside these years are a wrong time format (epoch seconds read as ms, or the reverse). */
export const MIN_TIME_MS = Date.UTC(2000, 0, 1);
export const MAX_TIME_MS = Date.UTC(2100, 0, 1);
/** samples.seq is a PostgreSQL integer. */
export const MAX_SEQ = 2_147_483_647;

/**
 * Largest file accepted: 100 MB (100 × 1024 × 1024 bytes), about 1.3 million samples of our full
 * format, or 370 hours at one sample a second. Counted while the file streams in; the server's
 * request-body limit (adapter-node BODY_SIZE_LIMIT, 110M in the start scripts) sits above it so
 * this limit is the one users meet, with a clear message.
 */
export const MAX_UPLOAD_BYTES = 100 * 1024 * 1024;
export const MAX_UPLOAD_LABEL = '100 MB';

/** Problems listed in an answer; the total count is always given. */
export const MAX_LISTED_PROBLEMS = 50;
