// The track drawn with Leaflet: loaded only in the browser, on demand, by TrackMap.svelte (the
// library touches `window` as it loads). Tiles only when the server configures a source;
// otherwise a plain background with a light graticule. Always a scale bar (NM and km) and a north
// arrow; the track flown solid, gaps dashed, the waypoints where passed, and the aircraft at the
// scrubber. Colours come from the theme through CSS classes (TrackMap.svelte), never from here.
import L from 'leaflet';
import 'leaflet/dist/leaflet.css';
import type { SampleColumns } from '$lib/fuel';
import type { MapTiles } from '$lib/wire/map';
import { num } from '$lib/format';
import { nearestSample, roundScaleLength, type TrackPiece, type TrackPosition, type TrackWaypoint } from './track';

export interface TrackViewOptions {
	tiles: MapTiles | null;
	/** A click on the track: the sample nearest to it. */
	onpick?: (index: number) => void;
}

const METRES_PER_NM = 1852; // exact (BIPM SI Brochure, non-SI units accepted for use with the SI)
const SCALE_MAX_PX = 120;
/** How near the edge the aircraft may come before the map pans to keep it in view. */
const EDGE_PX = 12;

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** A bar control: two scale bars, NM above km, redrawn as the map moves. */
const ScaleBars = L.Control.extend({
	options: { position: 'bottomleft' as L.ControlPosition },
	onAdd(map: L.Map) {
		const box = L.DomUtil.create('div', 'track-scale');
		box.setAttribute('data-testid', 'map-scale');
		const nm = L.DomUtil.create('div', 'track-scale-bar', box);
		const km = L.DomUtil.create('div', 'track-scale-bar', box);
		const update = () => {
			const size = map.getSize();
			const y = size.y / 2;
			const metres = map.distance(map.containerPointToLatLng([0, y]), map.containerPointToLatLng([SCALE_MAX_PX, y]));
			for (const [el, unit, per] of [
				[nm, 'NM', METRES_PER_NM],
				[km, 'km', 1000]
			] as const) {
				const max = metres / per;
				const len = roundScaleLength(max);
				el.style.width = `${Math.round((SCALE_MAX_PX * len) / max)}px`;
				el.textContent = `${num(len, len >= 1 ? 0 : len >= 0.1 ? 1 : 2)} ${unit}`;
			}
		};
		map.on('move zoom resize', update);
		map.whenReady(update);
		(this as unknown as { _off: () => void })._off = () => map.off('move zoom resize', update);
		return box;
	},
	onRemove() {
		(this as unknown as { _off?: () => void })._off?.();
	}
});

/** North is up on this map (it never rotates): a fixed arrow says so. */
const NorthArrow = L.Control.extend({
	options: { position: 'topright' as L.ControlPosition },
	onAdd() {
		const box = L.DomUtil.create('div', 'track-north');
		box.setAttribute('data-testid', 'map-north');
		box.setAttribute('aria-hidden', 'true');
		box.innerHTML = '<svg viewBox="0 0 28 42" width="28" height="42"><path d="M14 3 L22 24 L14 19 L6 24 Z"/><text x="14" y="39" text-anchor="middle">N</text></svg>';
		return box;
	}
});

/** One button under the zoom buttons that brings the whole track back into view. */
const FitButton = L.Control.extend({
	options: { position: 'topleft' as L.ControlPosition },
	onAdd() {
		const bar = L.DomUtil.create('div', 'leaflet-bar track-fit');
		const a = L.DomUtil.create('a', '', bar) as HTMLAnchorElement;
		a.href = '#';
		a.setAttribute('role', 'button');
		a.setAttribute('aria-label', 'Show the whole track');
		a.title = 'Show the whole track';
		a.innerHTML = '<span aria-hidden="true">⤢</span>';
		L.DomEvent.disableClickPropagation(bar);
		L.DomEvent.on(a, 'click', (e) => {
			L.DomEvent.preventDefault(e);
			(this as unknown as { fit: () => void }).fit();
		});
		return bar;
	}
});

export class TrackMapView {
	private map: L.Map;
	private trackLayer = L.layerGroup();
	private waypointLayer = L.layerGroup();
	private graticule: L.LayerGroup | null = null;
	private marker: L.CircleMarker | null = null;
	private bounds: L.LatLngBounds | null = null;
	private columns: SampleColumns | null = null;
	private count = 0;
	private fitted = false;
	/** The view keeps the whole track in it (as a live track grows) until the user pans or zooms. */
	private auto = true;
	private fitting = false;

	constructor(container: HTMLElement, private readonly options: TrackViewOptions) {
		const tiles = options.tiles;
		this.map = L.map(container, {
			zoomControl: true,
			attributionControl: tiles !== null,
			// The page scrolls under the wheel; zoom with the buttons, a double click, + and − or a pinch.
			scrollWheelZoom: false,
			// One finger scrolls the page on a tablet; two pinch the map.
			dragging: !L.Browser.mobile,
			keyboard: true,
			maxZoom: tiles?.maxZoom ?? 18,
			zoomSnap: 0.25
		});
		this.map.zoomControl.setPosition('topleft');
		const fit = new FitButton();
		(fit as unknown as { fit: () => void }).fit = () => this.fit();
		fit.addTo(this.map);
		new NorthArrow().addTo(this.map);
		new ScaleBars().addTo(this.map);
		if (tiles) {
			this.map.attributionControl.setPrefix(false);
			L.tileLayer(tiles.url, { attribution: escapeHtml(tiles.attribution), maxZoom: tiles.maxZoom, crossOrigin: false }).addTo(this.map);
		} else {
			this.graticule = L.layerGroup().addTo(this.map);
			this.map.on('moveend zoomend', () => this.drawGraticule());
		}
		this.trackLayer.addTo(this.map);
		this.waypointLayer.addTo(this.map);
		this.map.on('dragstart', () => (this.auto = false));
		this.map.on('zoomstart', () => {
			if (!this.fitting) this.auto = false;
		});
	}

	/** Draws the track anew: the pieces over the first `count` samples, and the waypoints. */
	setTrack(columns: SampleColumns, count: number, pieces: readonly TrackPiece[], waypoints: readonly TrackWaypoint[]): void {
		const lat = columns.lat;
		const lon = columns.lon;
		this.columns = columns;
		this.count = count;
		this.trackLayer.clearLayers();
		this.waypointLayer.clearLayers();
		if (!lat || !lon || pieces.length === 0) return;
		const flown: L.LatLngExpression[][] = [];
		const gaps: L.LatLngExpression[][] = [];
		for (const p of pieces) {
			if (p.kind === 'gap') {
				gaps.push([
					[lat[p.from], lon[p.from]],
					[lat[p.to], lon[p.to]]
				]);
				continue;
			}
			const line: L.LatLngExpression[] = [];
			for (let i = p.from; i <= p.to; i++) if (Number.isFinite(lat[i]) && Number.isFinite(lon[i])) line.push([lat[i], lon[i]]);
			flown.push(line);
		}
		if (gaps.length > 0) L.polyline(gaps, { className: 'track-gap', interactive: false, dashArray: '6 6' }).addTo(this.trackLayer);
		L.polyline(flown, { className: 'track-flown', interactive: false }).addTo(this.trackLayer);
		// A wide, invisible twin catches clicks on the line: a click picks the nearest sample.
		const hit = L.polyline(flown, { className: 'track-hit', weight: 18, opacity: 0 }).addTo(this.trackLayer);
		hit.on('click', (e: L.LeafletMouseEvent) => {
			if (!this.columns) return;
			const i = nearestSample(this.columns, this.count, { lat: e.latlng.lat, lon: e.latlng.lng });
			if (i >= 0) this.options.onpick?.(i);
		});
		for (const w of waypoints) {
			L.circleMarker([w.lat, w.lon], { radius: 6, className: 'track-waypoint', interactive: false })
				.bindTooltip(escapeHtml(w.planned !== null ? `${w.planned} ${w.name}` : w.name), { permanent: true, direction: 'right', offset: [6, 0], className: 'track-label' })
				.addTo(this.waypointLayer);
		}
		this.marker?.bringToFront();
		const all = [...flown.flat(), ...gaps.flat()];
		const bounds = L.latLngBounds(all as L.LatLngTuple[]);
		const grew = !this.bounds || !this.bounds.equals(bounds);
		this.bounds = bounds;
		if (!this.fitted || (this.auto && grew)) {
			this.fitted = true;
			this.fit();
		}
	}

	/** The aircraft at the scrubber; the map pans to keep it in view. */
	setPosition(pos: TrackPosition | null, exact: boolean): void {
		if (!pos) {
			this.marker?.remove();
			this.marker = null;
			return;
		}
		const at: L.LatLngTuple = [pos.lat, pos.lon];
		// In the track's own layer of the one SVG renderer (a pane of its own would get a second
		// renderer, which can lag a pan behind the first), brought to the front when drawn.
		if (!this.marker) this.marker = L.circleMarker(at, { radius: 8, className: 'track-position', interactive: false }).addTo(this.map);
		else this.marker.setLatLng(at);
		// Hollow when the scrubber's sample has no position of its own (the last known is shown).
		this.marker.getElement()?.classList.toggle('track-position-stale', !exact);
		// Pan only when the marker is about to leave the view: a map that moves under a pointer
		// aiming at the track would make it miss.
		if (!this.fitted) return;
		const p = this.map.latLngToContainerPoint(at);
		const size = this.map.getSize();
		if (p.x < EDGE_PX || p.y < EDGE_PX || p.x > size.x - EDGE_PX || p.y > size.y - EDGE_PX) this.map.panTo(at, { animate: false });
	}

	/** The whole track in view; the view follows the track again from now on. */
	fit(): void {
		this.auto = true;
		if (!this.bounds || !this.bounds.isValid()) return;
		this.fitting = true;
		try {
			// Room for the buttons (top left), the scale bars (bottom left) and the waypoint labels,
			// which sit to the right of their marks.
			this.map.fitBounds(this.bounds, { paddingTopLeft: [60, 28], paddingBottomRight: [90, 52], animate: false, maxZoom: 14 });
		} finally {
			this.fitting = false;
		}
	}

	/** The container changed size (a layout change): Leaflet measures it again. */
	resize(): void {
		this.map.invalidateSize({ animate: false });
	}

	destroy(): void {
		this.map.remove();
	}

	private drawGraticule(): void {
		const g = this.graticule;
		if (!g) return;
		g.clearLayers();
		const b = this.map.getBounds();
		const span = Math.max(b.getNorth() - b.getSouth(), 1e-6);
		const step = roundScaleLength(span / 3);
		if (!(step > 0)) return;
		const lines: L.LatLngExpression[][] = [];
		const west = b.getWest();
		const east = b.getEast();
		for (let lat = Math.ceil(b.getSouth() / step) * step; lat <= b.getNorth(); lat += step)
			lines.push([
				[lat, west],
				[lat, east]
			]);
		for (let lon = Math.ceil(west / step) * step; lon <= east; lon += step)
			lines.push([
				[b.getSouth(), lon],
				[b.getNorth(), lon]
			]);
		L.polyline(lines, { className: 'track-graticule', interactive: false, weight: 1 }).addTo(g);
	}
}
