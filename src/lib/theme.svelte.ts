// Light/dark theme, kept in localStorage and applied to <html data-theme>; static/theme.js applies
// it before first paint.
const KEY = 'burndown-theme';

class Theme {
	current = $state<'light' | 'dark'>('light');

	init() {
		this.current = document.documentElement.getAttribute('data-theme') === 'dark' ? 'dark' : 'light';
	}

	toggle() {
		this.current = this.current === 'dark' ? 'light' : 'dark';
		document.documentElement.setAttribute('data-theme', this.current);
		try {
			localStorage.setItem(KEY, this.current);
		} catch {
			/* private mode: the choice lasts for this page only */
		}
	}
}

export const theme = new Theme();
