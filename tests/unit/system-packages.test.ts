/**
 * scripts/lib/system-packages.sh, the check npm start and npm test run first: it finds the Debian
 * packages they need, installs missing ones as root through apt-get, and otherwise stops with the
 * exact command to run. Nothing is removed from this machine: each test plays a fresh machine with
 * a folder of its own as the system root (WRENCHROLL_SYSTEM_ROOT) and PATH set to a folder holding
 * only a stand-in `apt-get` that writes down how it was called (running the real one would change
 * the machine). The non-root cases really run as the unprivileged `nobody` user when the tests run
 * as root. The apt-get options (-y, --no-install-recommends) are as Debian's apt-get(8) manual
 * describes them.
 */
import { spawnSync } from 'node:child_process';
import {
	chmodSync,
	existsSync,
	mkdirSync,
	mkdtempSync,
	readFileSync,
	rmSync,
	writeFileSync
} from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, test } from 'vitest';

const script = path.resolve(import.meta.dirname, '../../scripts/lib/system-packages.sh');
const runningAsRoot = process.getuid?.() === 0;
const NOBODY = 65534;

let machine: string;
let systemRoot: string;
let bin: string;
let aptLog: string;

/** Puts an executable file where the package would install it. */
function install(relativePath: string) {
	const file = path.join(systemRoot, relativePath);
	mkdirSync(path.dirname(file), { recursive: true });
	writeFileSync(file, '#!/bin/sh\n');
	chmodSync(file, 0o755);
}

/**
 * A stand-in apt-get: writes its arguments to a log, and on `install` puts the packages' files
 * under the system root, as the real packages would.
 */
function standInAptGet() {
	const files: Record<string, string[]> = {
		postgresql: ['usr/lib/postgresql/15/bin/pg_ctl'],
		chromium: ['usr/bin/chromium'],
		ffmpeg: ['usr/bin/ffmpeg', 'usr/bin/ffprobe']
	};
	const cases = Object.entries(files)
		.map(
			([name, paths]) =>
				`\t\t${name}) ${paths
					.map(
						(file) =>
							`/bin/mkdir -p "$root/${path.dirname(file)}"; : > "$root/${file}"; /bin/chmod +x "$root/${file}"`
					)
					.join('; ')} ;;`
		)
		.join('\n');
	writeFileSync(
		path.join(bin, 'apt-get'),
		[
			'#!/bin/sh',
			`echo "$*" >> "${aptLog}"`,
			`root="${systemRoot}"`,
			'[ "$1" = install ] || exit 0',
			'for package in "$@"; do',
			'\tcase $package in',
			cases,
			'\tesac',
			'done',
			''
		].join('\n')
	);
	chmodSync(path.join(bin, 'apt-get'), 0o755);
}

function run(
	packages: string[],
	options: { env?: Record<string, string>; asNobody?: boolean } = {}
) {
	const env = {
		PATH: bin,
		WRENCHROLL_SYSTEM_ROOT: systemRoot,
		...options.env
	};
	const command = options.asNobody && runningAsRoot ? '/usr/bin/setpriv' : '/bin/bash';
	const args =
		options.asNobody && runningAsRoot
			? [`--reuid=${NOBODY}`, `--regid=${NOBODY}`, '--clear-groups', '/bin/bash', script]
			: [script];
	const result = spawnSync(command, [...args, 'npm test', ...packages], { env, encoding: 'utf8' });
	return {
		status: result.status,
		stdout: result.stdout,
		stderr: result.stderr,
		aptCalls: existsSync(aptLog) ? readFileSync(aptLog, 'utf8').trim().split('\n') : []
	};
}

beforeEach(() => {
	machine = mkdtempSync(path.join(tmpdir(), 'wrenchroll-packages-'));
	chmodSync(machine, 0o755); // readable by `nobody`
	systemRoot = path.join(machine, 'root');
	bin = path.join(machine, 'bin');
	aptLog = path.join(machine, 'apt-get.log');
	mkdirSync(systemRoot);
	mkdirSync(bin);
	standInAptGet();
});

afterEach(() => rmSync(machine, { recursive: true, force: true }));

describe('system-packages.sh', () => {
	test('says nothing and succeeds when every package is there', () => {
		install('usr/lib/postgresql/15/bin/pg_ctl');
		install('usr/bin/chromium');
		install('usr/bin/ffmpeg');
		install('usr/bin/ffprobe');
		const result = run(['postgresql', 'chromium', 'ffmpeg']);
		expect(result).toMatchObject({ status: 0, stdout: '', stderr: '', aptCalls: [] });
	});

	test('finds PostgreSQL by pg_ctl on PATH as well as in Debian’s versioned folders', () => {
		writeFileSync(path.join(bin, 'pg_ctl'), '#!/bin/sh\n');
		chmodSync(path.join(bin, 'pg_ctl'), 0o755);
		expect(run(['postgresql']).status).toBe(0);
	});

	test('as a normal user: stops, names what is missing and why, and prints the exact apt-get command', () => {
		install('usr/lib/postgresql/15/bin/pg_ctl');
		const result = run(['postgresql', 'chromium', 'ffmpeg'], { asNobody: true });
		expect(result.status).toBe(1);
		expect(result.aptCalls).toEqual([]);
		expect(result.stderr).toContain('npm test needs Debian packages that are not installed:');
		expect(result.stderr).toContain('  chromium (the headless browser for the browser tests)');
		expect(result.stderr).toMatch(/^ {2}ffmpeg \(ffprobe reads/m);
		expect(result.stderr).not.toMatch(/^ {2}postgresql/m);
		expect(result.stderr).toContain('Install them as root, then run npm test again:');
		expect(result.stderr.split('\n')).toContain(
			'  apt-get update && apt-get install -y --no-install-recommends chromium ffmpeg'
		);
	});

	test('as root with WRENCHROLL_INSTALL_PACKAGES=no: the same message, and apt-get is not run', () => {
		const result = run(['postgresql'], { env: { WRENCHROLL_INSTALL_PACKAGES: 'no' } });
		expect(result.status).toBe(1);
		expect(result.aptCalls).toEqual([]);
		expect(result.stderr.split('\n')).toContain(
			'  apt-get update && apt-get install -y --no-install-recommends postgresql'
		);
	});

	test.runIf(runningAsRoot)(
		'as root: says in one line what it installs and why, runs apt-get update and install, then finds the packages',
		() => {
			install('usr/bin/chromium');
			const result = run(['postgresql', 'chromium', 'ffmpeg']);
			expect(result.stderr).toBe('');
			expect(result.stdout).toBe(
				'npm test: installing Debian packages with apt-get: postgresql (the database server), ' +
					'ffmpeg (ffprobe reads the duration, frame rate and codec of footage)\n'
			);
			expect(result.aptCalls).toEqual([
				'update -qq',
				'install -y -qq --no-install-recommends postgresql ffmpeg'
			]);
			expect(result.status).toBe(0);
		}
	);

	test.runIf(runningAsRoot)(
		'as root: fails with a message when a package is still missing after apt-get',
		() => {
			writeFileSync(path.join(bin, 'apt-get'), '#!/bin/sh\nexit 0\n'); // installs nothing
			const result = run(['chromium']);
			expect(result.status).toBe(1);
			expect(result.stderr).toContain('apt-get installed chromium, but it is still not found');
		}
	);

	test('honours CHROMIUM_PATH and FFPROBE_PATH, as the browser tests and the server do', () => {
		install('opt/browser/chrome');
		install('opt/media/ffprobe');
		install('usr/bin/ffmpeg');
		const result = run(['chromium', 'ffmpeg'], {
			env: {
				CHROMIUM_PATH: path.join(systemRoot, 'opt/browser/chrome'),
				FFPROBE_PATH: path.join(systemRoot, 'opt/media/ffprobe')
			}
		});
		expect(result.status).toBe(0);
	});

	test('refuses a package it has no check for', () => {
		const result = run(['postgres']);
		expect(result.status).toBe(2);
		expect(result.stderr).toContain("no check for a package named 'postgres'");
	});
});

describe('system-packages.sh on this machine', () => {
	test('finds everything npm start and npm test need, so it says nothing and installs nothing', () => {
		// The real check, no stand-ins: npm test ran it before the unit tests. With installing
		// switched off, a missing package would fail here instead of changing the machine.
		const result = spawnSync(
			'/bin/bash',
			[script, 'npm test', 'postgresql', 'chromium', 'ffmpeg'],
			{ env: { ...process.env, WRENCHROLL_INSTALL_PACKAGES: 'no' }, encoding: 'utf8' }
		);
		expect(result).toMatchObject({ status: 0, stdout: '', stderr: '' });
	});
});
