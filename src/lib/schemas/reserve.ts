// The reserve rule as stored: one zod schema for the rule id, used by the forms and by the
// database column (src/lib/server/db/schema.ts), which refuses an unknown id at write and reads
// one that got in anyway (older rows, hand-edited data) as null — "not a rule we know" — so a
// page shows that and computes without a reserve instead of failing.
import { z } from 'zod';
// Relative import: the database schema imports this module when drizzle-kit reads it.
import { RESERVE_RULE_IDS, type ReserveRuleId } from '../fuel/reserve';

export const reserveRuleIdSchema = z.enum(RESERVE_RULE_IDS);

/** A stored reserve rule id, or null when it is not one of ours. */
export function storedReserveRule(value: unknown): ReserveRuleId | null {
	const r = reserveRuleIdSchema.safeParse(value);
	return r.success ? r.data : null;
}
