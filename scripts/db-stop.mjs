// `npm run db:stop`: stops the project's PostgreSQL clusters (the one `npm start` uses and the
// test one, plus any other Burndown cluster of this user under /tmp). Their data stays unless
// --delete-data is given. Needs only Node's built-ins.
//
//   npm run db:stop [-- --dev | --test] [-- --delete-data]
import fs from 'node:fs';
import { parseArgs } from 'node:util';
import { info, report } from './lib/log.mjs';
import { clusterSettings, knownDataDirs, stopServer } from './lib/postgres.mjs';

const usage = `Usage: npm run db:stop [-- --dev | --test] [--delete-data]
  --dev          only the cluster of npm start (BURNDOWN_PGDATA / BURNDOWN_PGPORT)
  --test         only the test cluster (BURNDOWN_TEST_PGDATA / BURNDOWN_TEST_PGPORT)
  --delete-data  also delete the data folder(s): the demo data is loaded again at the next start`;

async function main() {
	const { values } = parseArgs({
		options: { dev: { type: 'boolean' }, test: { type: 'boolean' }, 'delete-data': { type: 'boolean' }, help: { type: 'boolean', short: 'h' } }
	});
	if (values.help) {
		console.log(usage);
		return 0;
	}
	const dev = clusterSettings({ prefix: 'burndown-pg', portVar: 'BURNDOWN_PGPORT', dataVar: 'BURNDOWN_PGDATA', defaultPort: 54329 }).dataDir;
	const test = clusterSettings({ prefix: 'burndown-pgtest', portVar: 'BURNDOWN_TEST_PGPORT', dataVar: 'BURNDOWN_TEST_PGDATA', defaultPort: 54339 }).dataDir;
	const dirs = new Set();
	if (values.dev || !values.test) dirs.add(dev);
	if (values.test || !values.dev) dirs.add(test);
	if (!values.dev && !values.test) for (const d of knownDataDirs()) dirs.add(d);

	let found = 0;
	for (const dir of dirs) {
		if (!fs.existsSync(dir)) continue;
		found++;
		const isCluster = fs.existsSync(`${dir}/PG_VERSION`);
		if (isCluster) info(`${dir}: ${(await stopServer(dir)) ? 'stopped' : 'was not running'}`);
		if (values['delete-data'] && (isCluster || fs.readdirSync(dir).length === 0)) {
			fs.rmSync(dir, { recursive: true, force: true });
			info(`${dir}: deleted`);
		}
	}
	if (found === 0) info('no Burndown PostgreSQL data folder found: nothing to stop');
	return 0;
}

main().then(
	(status) => process.exit(status),
	(error) => process.exit(report(error))
);
