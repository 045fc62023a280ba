// Keeps the screen on while the live page follows a flight, through the Screen Wake Lock API where
// the browser has it (feature-detected: elsewhere nothing happens). The browser drops the lock when
// the tab is hidden; it is asked for again when the tab comes back, and released on leave.

interface Sentinel {
	released: boolean;
	release(): Promise<void>;
}
type WakeLockNavigator = Navigator & { wakeLock?: { request(type: 'screen'): Promise<Sentinel> } };

export function wakeLockAvailable(): boolean {
	return typeof navigator !== 'undefined' && 'wakeLock' in navigator;
}

/** Holds the lock while `wanted()` is true; call update() when it may have changed; stop() releases it. */
export class ScreenAwake {
	/** True while the lock is held (shown on the page). */
	held = $state(false);
	private sentinel: Sentinel | null = null;
	private asking = false;
	private onVisible = () => void this.update();

	constructor(private readonly wanted: () => boolean) {}

	start(): void {
		document.addEventListener('visibilitychange', this.onVisible);
		void this.update();
	}

	async update(): Promise<void> {
		const nav = navigator as WakeLockNavigator;
		if (!nav.wakeLock) return;
		const want = this.wanted() && document.visibilityState === 'visible';
		if (this.sentinel?.released) this.sentinel = null;
		if (want && !this.sentinel && !this.asking) {
			this.asking = true;
			try {
				this.sentinel = await nav.wakeLock.request('screen');
				this.sentinel.released = false;
				(this.sentinel as unknown as EventTarget).addEventListener?.('release', () => (this.held = false));
				this.held = true;
			} catch {
				// Refused (battery saver, no user gesture yet): the page works, the screen may dim.
				this.held = false;
			} finally {
				this.asking = false;
			}
		} else if (!want && this.sentinel) {
			const s = this.sentinel;
			this.sentinel = null;
			this.held = false;
			await s.release().catch(() => {});
		}
	}

	stop(): void {
		document.removeEventListener('visibilitychange', this.onVisible);
		const s = this.sentinel;
		this.sentinel = null;
		this.held = false;
		void s?.release().catch(() => {});
	}
}
