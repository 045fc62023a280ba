// The upload page's state: the aircraft and file chosen, how the columns are read (our format, an
// import profile, or the mapper) with the browser's trial parse of the file's first part, the fuel
// declared at engine start, and the transfer with the server's own progress and its answer.
// The page holds only markup; everything it shows or binds is here.
import { count, fileSize, flowFigure } from '$lib/format';
import { goto } from '$app/navigation';
import { parseRecorderText, previewCsv, type ColumnMapping, type ParseSummary, type Preview, type RecorderRow, type RowProblem } from '$lib/csv';
import { fromLitresPerHour, type FlowUnit, type FuelUnit } from '$lib/units';
import { needsAmount, type DeclarationKind } from '$lib/schemas/declaration';
import { completeLines, draftFromMapping, draftFromPreview, mappingFromDraft, type MappingDraft } from './mapper';
import { sendUpload, type ServerProgress, type UploadOutcome } from './upload-client';
import type { PageData } from './$types';

/** Enough of the file for the header, the mapper's rows and a trial parse. */
export const SAMPLE_BYTES = 256 * 1024;

type Profile = PageData['profiles'][number];
export type ColumnsMode = 'burndown' | 'profile' | 'manual';

/** The server's storing steps: where each puts the bar, and what it says. */
const STEP_SHARE: Record<string, [number, string]> = {
	checks: [88, 'Checking for duplicates and overlaps'],
	summary: [90, 'Computing the flight summary'],
	original: [93, 'Keeping the original file'],
	flight: [97, 'Saving the flight'],
	commit: [99, 'Finishing']
};

/** A byte count as KB or MB. */
export const mb = fileSize;

export class UploadFlow {
	// The page's own choices start from the loaded data and then belong to the user.
	aircraftId = $state('');
	readonly ac = $derived.by(() => this.data().fleet.find((a) => a.id === this.aircraftId) ?? null);
	readonly unit = $derived<FuelUnit>(this.ac?.displayUnit ?? 'l');
	readonly flowUnit = $derived(`${this.unit}/h` as FlowUnit);

	file = $state<File | null>(null);
	fileError = $state('');
	sample = $state('');
	whole = $state(false);
	detected = $state<Preview | null>(null);
	mode = $state<ColumnsMode>('manual');
	profiles = $state<Profile[]>([]);
	profileId = $state('');
	draft = $state<MappingDraft | null>(null);
	timeDate = $state('');
	timeStart = $state('');

	kind = $state<DeclarationKind>('onBoard');
	amount = $state('');
	title = $state('');
	notes = $state('');

	phase = $state<'idle' | 'sending' | 'finished'>('idle');
	sent = $state(0);
	total = $state(0);
	server = $state<ServerProgress | null>(null);
	outcome = $state<UploadOutcome | null>(null);
	failure = $state('');
	private abortUpload: (() => void) | null = null;

	readonly preview = $derived(this.sample ? previewCsv(this.sample, { whole: this.whole, delimiter: this.mode === 'manual' && this.draft ? this.draft.delimiter : undefined }) : null);
	readonly profile = $derived(this.profiles.find((p) => p.id === this.profileId) ?? null);

	/** The mapping the upload will use, as far as the browser can tell. */
	readonly chosen = $derived.by((): { mapping: ColumnMapping } | { error: string } | null => {
		const preview = this.preview;
		if (!preview) return null;
		if (this.mode === 'burndown') return 'mapping' in preview.burndown ? { mapping: preview.burndown.mapping } : { error: preview.burndown.message };
		if (this.mode === 'profile') {
			const profile = this.profile;
			if (!profile) return { error: 'Choose an import profile.' };
			const m = profile.mapping;
			if (m.time.format === 'clock' && !this.timeDate) return { error: 'This profile reads clock times: give the date of the flight.' };
			if (m.time.format === 'elapsedS' && !this.timeStart) return { error: 'This profile reads elapsed seconds: give the start date-time.' };
			return { mapping: { ...m, time: { ...m.time, ...(this.timeDate ? { date: this.timeDate } : {}), ...(this.timeStart ? { start: this.timeStart } : {}) } } };
		}
		return this.draft ? mappingFromDraft(this.draft) : null;
	});

	/** The same parser the server runs, on the first part of the file: the mapper's live check. */
	trial = $state<(ParseSummary & { rows: RecorderRow[] }) | null>(null);
	private trialRun = 0;

	/** Problems in the sample except "too few rows", which a cut sample of a long file says wrongly. */
	readonly trialProblems = $derived((this.trial?.problems ?? []).filter((p) => !(p.column === '' && /only one sample|no samples/.test(p.message) && !this.whole)));
	/** The trial lists at most five; the count says whether there are more, and what they mean. */
	readonly trialProblemNote = $derived.by(() => {
		const hidden = (this.trial?.problems.length ?? 0) - this.trialProblems.length;
		const n = (this.trial?.problemCount ?? 0) - hidden;
		const listed = n > this.trialProblems.length ? ` (the first ${this.trialProblems.length} below)` : '';
		return `${count(n)} ${n === 1 ? 'problem' : 'problems'} ${this.whole ? 'in this file' : 'in its first part'}${listed}. Burndown stores nothing of a file with problems: correct the file or the column mapping first.`;
	});

	readonly ready = $derived(
		!!this.file && !this.fileError && !!this.ac && !!this.chosen && 'mapping' in this.chosen && this.phase !== 'sending' && (!needsAmount(this.kind) || this.amount.trim() !== '')
	);

	readonly serverPercent = $derived.by(() => {
		if (this.outcome) return 100;
		if (!this.server || !this.file) return 0;
		if (this.server.phase === 'reading') return Math.min(85, (this.server.bytes / Math.max(1, this.file.size)) * 85);
		return STEP_SHARE[this.server.step]?.[0] ?? 90;
	});
	readonly serverLabel = $derived.by(() => {
		if (this.outcome) return 'Done';
		if (!this.server) return this.phase === 'sending' ? 'Waiting for the server' : '';
		if (this.server.phase === 'reading') return `Reading and checking: ${count(this.server.rows)} samples`;
		return STEP_SHARE[this.server.step]?.[1] ?? 'Storing';
	});
	readonly sentPercent = $derived(this.total > 0 ? (this.sent / this.total) * 100 : 0);

	readonly problems = $derived(this.outcome?.body.outcome === 'rejected' ? this.outcome.body.problems : ([] as RowProblem[]));
	readonly lastKnown = $derived(this.ac?.lastOnBoardL ?? null);

	/** Create it while the page initialises: its effects run the trial parse and keep the choices valid. */
	constructor(private readonly data: () => PageData) {
		const d = data();
		this.aircraftId = d.fleet.find((a) => a.id === d.preselect)?.id ?? d.fleet[0]?.id ?? '';
		this.profiles = d.profiles;
		this.kind = d.fleet.find((a) => a.id === this.aircraftId)?.lastOnBoardL != null ? 'unchanged' : 'onBoard';

		$effect(() => {
			const c = this.chosen;
			const text = completeLines(this.sample, this.whole);
			const density = this.ac?.densityKgPerL;
			const run = ++this.trialRun;
			if (!c || !('mapping' in c) || !text) {
				this.trial = null;
				return;
			}
			void parseRecorderText(text, c.mapping, { densityKgPerL: density, maxProblems: 5 }).then((r) => {
				if (run === this.trialRun) this.trial = r;
			});
		});
		// Switching aircraft can take away a choice the previous one had.
		$effect(() => {
			const ac = this.ac;
			if (this.kind === 'unchanged' && ac && ac.lastOnBoardL === null) this.kind = 'onBoard';
			if (this.kind === 'lower' && ac && ac.lowerLevelL === null) this.kind = 'full';
		});
	}

	/** A flow from the trial rows in the aircraft's flow unit. */
	flowCell(lph: number | null): string {
		return lph === null ? '—' : flowFigure(fromLitresPerHour(lph, this.flowUnit, this.ac?.densityKgPerL), this.flowUnit);
	}

	chooseFile = async (e: Event): Promise<void> => {
		const input = e.currentTarget as HTMLInputElement;
		const f = input.files?.[0] ?? null;
		const { maxBytes, maxLabel } = this.data();
		this.reset();
		this.file = f;
		this.fileError = '';
		this.sample = '';
		this.detected = null;
		if (!f) return;
		if (f.size > maxBytes) {
			this.fileError = `This file is ${fileSize(f.size)}; the limit is ${maxLabel}.`;
			return;
		}
		this.whole = f.size <= SAMPLE_BYTES;
		this.sample = await f.slice(0, SAMPLE_BYTES).text();
		const p = previewCsv(this.sample, { whole: this.whole });
		this.detected = p;
		const match = this.profiles.find((x) => x.headerSignature === p.signature);
		if ('mapping' in p.burndown) this.mode = 'burndown';
		else if (match) {
			this.mode = 'profile';
			this.profileId = match.id;
		} else this.mode = 'manual';
		this.draft = match ? draftFromMapping(match.mapping) : draftFromPreview(p);
		if (!this.title) this.title = f.name.replace(/\.(csv|txt|log)$/i, '');
	};

	/** A profile the page saved: listed A to Z, chosen, and applied. */
	profileSaved(saved: Profile): void {
		this.profiles = [...this.profiles.filter((p) => p.id !== saved.id), saved].sort((a, b) => a.name.localeCompare(b.name));
		this.profileId = saved.id;
		this.mode = 'profile';
	}

	private reset(): void {
		this.phase = 'idle';
		this.outcome = null;
		this.failure = '';
		this.server = null;
		this.sent = 0;
		this.total = 0;
	}

	upload = async (): Promise<void> => {
		const { file, ac, chosen, profile } = this;
		if (!file || !ac || !chosen || !('mapping' in chosen)) return;
		this.reset();
		this.phase = 'sending';
		const fd = new FormData();
		fd.set('aircraftId', ac.id);
		fd.set('declaration', this.kind);
		if (needsAmount(this.kind)) fd.set('amount', this.amount);
		fd.set('unit', this.unit);
		if (this.mode === 'manual') fd.set('mapping', JSON.stringify(chosen.mapping));
		if (this.mode === 'profile' && profile) {
			fd.set('profileId', profile.id);
			if (this.timeDate) fd.set('timeDate', this.timeDate);
			if (this.timeStart) fd.set('timeStart', this.timeStart);
		}
		if (this.title.trim()) fd.set('title', this.title.trim());
		if (this.notes.trim()) fd.set('notes', this.notes.trim());
		// The fields go first: the server reads them before the file streams in.
		fd.set('file', file, file.name);
		const req = sendUpload('/api/v1/flights', fd, {
			onSent: (s, t) => {
				this.sent = s;
				this.total = t;
			},
			onServer: (p) => (this.server = p)
		});
		this.abortUpload = req.abort;
		try {
			const outcome = await req.done;
			this.outcome = outcome;
			this.phase = 'finished';
			if (outcome.body.outcome === 'stored') await goto(outcome.body.url);
			else if (outcome.body.outcome === 'duplicate') await goto(`${outcome.body.url}?duplicate=1`);
		} catch (e) {
			this.failure = (e as Error).message;
			this.phase = 'finished';
		} finally {
			this.abortUpload = null;
		}
	};

	cancel = (): void => {
		this.abortUpload?.();
	};
}
