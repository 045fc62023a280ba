// Shapes the replay components pass to each other and to the pages that use them.

/** Something drawn under the time scrubber. */
export interface ScrubMark {
	kind: 'gap' | 'alarm' | 'event' | 'note';
	/** Epoch seconds. */
	start: number;
	end?: number;
	label: string;
}

/** A remark shown on the timeline; t null when it is not pinned to a moment. */
export interface TimelineNote {
	id: string;
	t: number | null;
	body: string;
	author: string | null;
}
