// What the replay and live pages get to draw the track on map tiles: the server's configured tile
// source (MAP_TILE_URL and friends), or null when none is configured — the default, in which the
// track draws on a plain background and the browser fetches nothing.

export interface MapTiles {
	/** URL template with {z}, {x}, {y} and optionally {s}. */
	url: string;
	/** The provider's credit, plain text, shown on the map. */
	attribution: string;
	maxZoom: number;
}
