// Forms of the debrief page: the instructor's summary, and a share link's lifetime.
import { z } from 'zod';

export const SHARE_DAYS_MAX = 90;
export const SHARE_DAYS_DEFAULT = 14;

export const debriefTextFormSchema = z.object({
	summary: z.string('Write the summary.').trim().max(5000, 'Use at most 5000 characters.')
});

export const shareFormSchema = z.object({
	days: z.coerce
		.number('Enter the number of days.')
		.int('Enter a whole number of days.')
		.min(1, `Choose between 1 and ${SHARE_DAYS_MAX} days.`)
		.max(SHARE_DAYS_MAX, `Choose between 1 and ${SHARE_DAYS_MAX} days.`)
		.default(SHARE_DAYS_DEFAULT)
});
