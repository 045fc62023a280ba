// Drawing helpers for the replay charts: theme colours read from the page's CSS variables (canvas
// cannot use them directly), and marks drawn on a uPlot canvas — horizontal reference lines with a
// label, vertical markers, shaded spans — all in canvas pixels and clipped to the plot area.
import type uPlot from 'uplot';

export interface ChartColours {
	ink: string;
	muted: string;
	line: string;
	surface: string;
	brand: string;
	steady: string;
	watch: string;
	act: string;
	dark: boolean;
}

export function readColours(): ChartColours {
	const css = getComputedStyle(document.documentElement);
	const v = (name: string, fallback: string) => css.getPropertyValue(`--bd-${name}`).trim() || fallback;
	return {
		ink: v('ink', '#161b23'),
		muted: v('muted', '#4d586a'),
		line: v('line', '#d9dee6'),
		surface: v('surface', '#ffffff'),
		brand: v('brand', '#2a5cc0'),
		steady: v('steady', '#1e8c6d'),
		watch: v('watch', '#b97a06'),
		act: v('act', '#c43a2b'),
		dark: document.documentElement.getAttribute('data-theme') === 'dark'
	};
}

/** #rrggbb with an alpha, for fills. */
export function alpha(hex: string, a: number): string {
	const m = /^#([0-9a-f]{6})$/i.exec(hex.trim());
	if (!m) return hex;
	const n = parseInt(m[1], 16);
	return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${a})`;
}

const px = (u: uPlot, css: number) => css * (u.ctx.canvas.width / Math.max(1, u.ctx.canvas.clientWidth || u.width));

function clip(u: uPlot, draw: () => void) {
	const { ctx, bbox } = u;
	ctx.save();
	ctx.beginPath();
	ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
	ctx.clip();
	draw();
	ctx.restore();
}

export function font(u: uPlot, sizeCss = 11, weight = 500): string {
	return `${weight} ${Math.round(px(u, sizeCss))}px "Inter Variable", system-ui, sans-serif`;
}

export interface Box {
	x: number;
	y: number;
	w: number;
	h: number;
}

/**
 * Where a horizontal reference line's label goes and the pieces of the line either side of it:
 * the label sits on the line (kept inside the plot), on a plate, and the line stops `pad` short of
 * the plate on both sides, so a line never crosses its own words — wherever the line is, even
 * when the label had to be moved inside the plot at the top or bottom edge.
 */
export function referenceLabelLayout(plot: Box, y: number, text: { w: number; h: number }, right: boolean, pad: number): { plate: Box; segments: [number, number][] } {
	const w = text.w + 2 * pad;
	const h = text.h + pad;
	const x = right ? plot.x + plot.w - pad - w : plot.x + pad;
	const top = Math.max(plot.y, Math.min(plot.y + plot.h - h, y - h / 2));
	const segments = ([[plot.x, x - pad], [x + w + pad, plot.x + plot.w]] as [number, number][]).filter(([a, b]) => b > a);
	return { plate: { x, y: top, w, h }, segments };
}

/** A horizontal line at `value` on scale `y`, labelled at its left (or right) end; see referenceLabelLayout. */
export function hLine(u: uPlot, value: number, colour: string, label: string, opts: { dash?: number[]; y?: string; labelRight?: boolean; plate?: string } = {}) {
	const scale = opts.y ?? 'y';
	if (!Number.isFinite(value)) return;
	const y = u.valToPos(value, scale, true);
	const { ctx, bbox } = u;
	if (y < bbox.top - 1 || y > bbox.top + bbox.height + 1) return;
	clip(u, () => {
		ctx.font = font(u);
		const plot = { x: bbox.left, y: bbox.top, w: bbox.width, h: bbox.height };
		const layout = label
			? referenceLabelLayout(plot, y, { w: ctx.measureText(label).width, h: px(u, 14) }, opts.labelRight ?? false, px(u, 4))
			: { plate: null, segments: [[bbox.left, bbox.left + bbox.width]] as [number, number][] };
		ctx.strokeStyle = colour;
		ctx.lineWidth = px(u, 1.5);
		ctx.setLineDash((opts.dash ?? [6, 4]).map((d) => px(u, d)));
		ctx.beginPath();
		for (const [a, b] of layout.segments) {
			ctx.moveTo(a, y);
			ctx.lineTo(b, y);
		}
		ctx.stroke();
		ctx.setLineDash([]);
		if (layout.plate) {
			const p = layout.plate;
			if (opts.plate) {
				ctx.fillStyle = opts.plate;
				ctx.fillRect(p.x, p.y, p.w, p.h);
			}
			ctx.strokeStyle = colour;
			ctx.lineWidth = px(u, 1);
			ctx.strokeRect(p.x, p.y, p.w, p.h);
			ctx.fillStyle = colour;
			ctx.textBaseline = 'middle';
			ctx.textAlign = 'center';
			ctx.fillText(label, p.x + p.w / 2, p.y + p.h / 2);
		}
	});
}

/** A vertical marker at time `t` with a short label at the top. */
export function vLine(u: uPlot, t: number, colour: string, label: string, dash: number[] = [3, 3]) {
	const x = u.valToPos(t, 'x', true);
	const { ctx, bbox } = u;
	if (x < bbox.left - 1 || x > bbox.left + bbox.width + 1) return;
	clip(u, () => {
		ctx.strokeStyle = colour;
		ctx.lineWidth = px(u, 1.5);
		ctx.setLineDash(dash.map((d) => px(u, d)));
		ctx.beginPath();
		ctx.moveTo(x, bbox.top);
		ctx.lineTo(x, bbox.top + bbox.height);
		ctx.stroke();
		ctx.setLineDash([]);
		if (label) {
			ctx.font = font(u, 11, 600);
			ctx.fillStyle = colour;
			ctx.textBaseline = 'top';
			ctx.textAlign = x > bbox.left + bbox.width - px(u, 80) ? 'right' : 'left';
			ctx.fillText(label, x + (ctx.textAlign === 'right' ? -px(u, 4) : px(u, 4)), bbox.top + px(u, 3));
		}
	});
}

/** A shaded span from t0 to t1 over the full height of the plot. */
export function span(u: uPlot, t0: number, t1: number, fill: string) {
	const x0 = u.valToPos(t0, 'x', true);
	const x1 = u.valToPos(t1, 'x', true);
	const { ctx, bbox } = u;
	clip(u, () => {
		ctx.fillStyle = fill;
		ctx.fillRect(Math.min(x0, x1), bbox.top, Math.abs(x1 - x0), bbox.height);
	});
}

/** A straight dashed segment between two (time, value) points, and a dot at the second. */
export function segment(u: uPlot, a: [number, number], b: [number, number], colour: string, label: string) {
	const { ctx } = u;
	const ax = u.valToPos(a[0], 'x', true);
	const ay = u.valToPos(a[1], 'y', true);
	const bx = u.valToPos(b[0], 'x', true);
	const by = u.valToPos(b[1], 'y', true);
	clip(u, () => {
		ctx.strokeStyle = colour;
		ctx.lineWidth = px(u, 2);
		ctx.setLineDash([px(u, 2), px(u, 3)]);
		ctx.beginPath();
		ctx.moveTo(ax, ay);
		ctx.lineTo(bx, by);
		ctx.stroke();
		ctx.setLineDash([]);
		ctx.fillStyle = colour;
		ctx.beginPath();
		ctx.arc(bx, by, px(u, 4), 0, Math.PI * 2);
		ctx.fill();
		if (label) {
			ctx.font = font(u, 11, 600);
			ctx.textBaseline = 'bottom';
			const right = bx > u.bbox.left + u.bbox.width - px(u, 120);
			ctx.textAlign = right ? 'right' : 'left';
			ctx.fillText(label, bx + (right ? -px(u, 6) : px(u, 6)), by - px(u, 4));
		}
	});
}

/** A broken line through points (e.g. the planned fuel on board), a label at its last point. */
export function polyline(u: uPlot, ts: readonly number[], ys: readonly number[], colour: string, label: string) {
	const { ctx } = u;
	if (ts.length < 2) return;
	clip(u, () => {
		ctx.strokeStyle = colour;
		ctx.lineWidth = px(u, 2);
		ctx.setLineDash([px(u, 8), px(u, 4)]);
		ctx.beginPath();
		ts.forEach((t, k) => {
			const x = u.valToPos(t, 'x', true);
			const y = u.valToPos(ys[k], 'y', true);
			if (k === 0) ctx.moveTo(x, y);
			else ctx.lineTo(x, y);
		});
		ctx.stroke();
		ctx.setLineDash([]);
		ctx.fillStyle = colour;
		ctx.font = font(u, 11, 600);
		ctx.textBaseline = 'top';
		ctx.textAlign = 'right';
		ctx.fillText(label, u.valToPos(ts[ts.length - 1], 'x', true) - px(u, 6), u.valToPos(ys[ys.length - 1], 'y', true) + px(u, 4));
	});
}

/** A dot with a label, e.g. the declared fuel at engine start. */
export function dot(u: uPlot, t: number, value: number, colour: string, label: string, plate?: string) {
	const { ctx } = u;
	const x = u.valToPos(t, 'x', true);
	const y = u.valToPos(value, 'y', true);
	clip(u, () => {
		ctx.fillStyle = colour;
		ctx.beginPath();
		ctx.arc(x, y, px(u, 4.5), 0, Math.PI * 2);
		ctx.fill();
		if (label) {
			ctx.font = font(u, 11, 600);
			ctx.textAlign = 'left';
			ctx.textBaseline = 'top';
			if (plate) {
				// A plate behind the words, so the series line under them does not cross them.
				const w = ctx.measureText(label).width;
				ctx.fillStyle = plate;
				ctx.fillRect(x + px(u, 5), y + px(u, 1), w + px(u, 4), px(u, 15));
				ctx.fillStyle = colour;
			}
			ctx.fillText(label, x + px(u, 7), y + px(u, 3));
		}
	});
}

/** A label at the right edge of the plot, at `value` on the y scale (kept inside the plot). */
export function edgeLabel(u: uPlot, value: number, colour: string, label: string, background?: string) {
	const { ctx, bbox } = u;
	const y = Math.max(bbox.top + px(u, 20), Math.min(bbox.top + bbox.height - px(u, 4), u.valToPos(value, 'y', true) - px(u, 8)));
	clip(u, () => {
		ctx.font = font(u, 11, 600);
		const w = ctx.measureText(label).width;
		const right = bbox.left + bbox.width - px(u, 4);
		if (background) {
			// A plate behind the words, so they stay readable over the line they sit on.
			ctx.fillStyle = background;
			ctx.fillRect(right - w - px(u, 4), y - px(u, 15), w + px(u, 8), px(u, 16));
		}
		ctx.fillStyle = colour;
		ctx.textAlign = 'right';
		ctx.textBaseline = 'bottom';
		ctx.fillText(label, right, y - px(u, 2));
	});
}
