// An audible alarm for the live page, made with the Web Audio API (an oscillator, so no sound file
// is fetched). Off until the viewer turns it on: browsers let a page make sound only after a tap,
// and turning it on is that tap.

type AudioCtor = typeof AudioContext;

export function audioAvailable(): boolean {
	return typeof window !== 'undefined' && ('AudioContext' in window || 'webkitAudioContext' in window);
}

export class AlarmTone {
	private ctx: AudioContext | null = null;

	/** Call from the tap that turns the sound on. */
	unlock(): void {
		if (!audioAvailable()) return;
		const Ctor = (window.AudioContext ?? (window as unknown as { webkitAudioContext: AudioCtor }).webkitAudioContext) as AudioCtor;
		this.ctx ??= new Ctor();
		void this.ctx.resume().catch(() => {});
	}

	/** Three short two-tone beeps, about 1.2 s in all. */
	sound(): void {
		const ctx = this.ctx;
		if (!ctx) return;
		const start = ctx.currentTime + 0.05;
		for (let k = 0; k < 3; k++) {
			const at = start + k * 0.4;
			const osc = ctx.createOscillator();
			const gain = ctx.createGain();
			osc.type = 'square';
			osc.frequency.setValueAtTime(880, at);
			osc.frequency.setValueAtTime(660, at + 0.12);
			gain.gain.setValueAtTime(0.0001, at);
			gain.gain.exponentialRampToValueAtTime(0.25, at + 0.02);
			gain.gain.exponentialRampToValueAtTime(0.0001, at + 0.25);
			osc.connect(gain).connect(ctx.destination);
			osc.start(at);
			osc.stop(at + 0.27);
		}
	}

	close(): void {
		void this.ctx?.close().catch(() => {});
		this.ctx = null;
	}
}
