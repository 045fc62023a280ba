import { describe, expect, it } from 'vitest';
import { isTileTemplate, serverConfig } from './config';
import { allowImageSource, mapTiles, tileImageSource } from './map-tiles';

describe('map tile configuration', () => {
	it('is empty by default: no tiles, so the browser fetches none', () => {
		expect(mapTiles({})).toBeNull();
		expect(mapTiles({ MAP_TILE_URL: '', MAP_TILE_ATTRIBUTION: '' })).toBeNull();
	});

	it('gives the pages the template, the credit and the zoom limit', () => {
		expect(mapTiles({ MAP_TILE_URL: 'https://{s}.tiles.example/{z}/{x}/{y}.png', MAP_TILE_ATTRIBUTION: ' Tiles © Example ' })).toEqual({
			url: 'https://{s}.tiles.example/{z}/{x}/{y}.png',
			attribution: 'Tiles © Example',
			maxZoom: 18
		});
		expect(mapTiles({ MAP_TILE_URL: 'http://127.0.0.1:8080/t/{z}/{x}/{y}', MAP_TILE_ATTRIBUTION: 'Own tiles', MAP_TILE_MAX_ZOOM: '12' })?.maxZoom).toBe(12);
	});

	it('refuses a template it could not use, and tiles without a credit, naming the variable', () => {
		for (const bad of ['tiles.example/{z}/{x}/{y}.png', 'ftp://tiles.example/{z}/{x}/{y}', 'https://tiles.example/{z}/{x}.png', 'https://tiles-{s}.example/{z}/{x}/{y}', 'javascript:{z}{x}{y}'])
			expect(isTileTemplate(bad), bad).toBe(false);
		expect(() => serverConfig({ MAP_TILE_URL: 'https://tiles.example/{z}/{x}.png', MAP_TILE_ATTRIBUTION: 'x' })).toThrow(/MAP_TILE_URL/);
		expect(() => serverConfig({ MAP_TILE_URL: 'https://tiles.example/{z}/{x}/{y}.png' })).toThrow(/MAP_TILE_ATTRIBUTION/);
		expect(() => serverConfig({ MAP_TILE_MAX_ZOOM: '40' })).toThrow(/MAP_TILE_MAX_ZOOM/);
	});

	it('allows exactly the tile origin as an image source in the content security policy', () => {
		expect(tileImageSource('https://{s}.tiles.example/{z}/{x}/{y}.png')).toBe('https://*.tiles.example');
		expect(tileImageSource('http://127.0.0.1:8080/t/{z}/{x}/{y}')).toBe('http://127.0.0.1:8080');
		const policy = "default-src 'self'; img-src 'self' data: blob:; object-src 'none'";
		expect(allowImageSource(policy, 'https://*.tiles.example')).toBe("default-src 'self'; img-src 'self' data: blob: https://*.tiles.example; object-src 'none'");
		// Added once, whatever the number of calls.
		const twice = allowImageSource(allowImageSource(policy, 'https://a.example'), 'https://a.example');
		expect(twice.match(/https:\/\/a\.example/g)).toHaveLength(1);
		expect(allowImageSource("default-src 'self'", 'https://a.example')).toBe("default-src 'self'; img-src 'self' https://a.example");
	});
});
