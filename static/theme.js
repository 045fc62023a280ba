// Applies the saved theme before first paint (an external file, so the CSP needs no inline script).
(function () {
	var t = null;
	try { t = localStorage.getItem('burndown-theme'); } catch (e) {}
	if (!t) t = window.matchMedia && window.matchMedia('(prefers-color-scheme: dark)').matches ? 'dark' : 'light';
	document.documentElement.setAttribute('data-theme', t);
})();
