// Preloaded (node --import) into the app server that scripts/start.mjs starts: when that script
// is gone (killed outright, so it could not stop its children), the server shuts down gracefully
// instead of holding port 5180 for the next `npm start`.
const parent = Number(process.env.BURNDOWN_PARENT_PID);
if (parent > 0) {
	const timer = setInterval(() => {
		try {
			process.kill(parent, 0);
		} catch (error) {
			if (error.code !== 'ESRCH') return;
			clearInterval(timer);
			process.kill(process.pid, 'SIGTERM');
		}
	}, 1000);
	timer.unref();
}
