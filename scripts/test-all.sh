#!/usr/bin/env bash
# npm test: install the Debian packages the tests need when missing, lint and format check,
# type-check, build the production server, then run every test (unit, integration, browser).
set -euo pipefail
cd "$(dirname "$0")/.."
# PostgreSQL for the throwaway test cluster, Chromium for the browser tests, ffmpeg for footage.
bash scripts/lib/system-packages.sh 'npm test' postgresql chromium ffmpeg
# The tests build into a folder of their own, so a server that npm start is running from build/
# keeps serving while the tests run in a second terminal.
export WRENCHROLL_BUILD_DIR=${WRENCHROLL_BUILD_DIR:-.build/test/build}
node node_modules/@sveltejs/kit/svelte-kit.js sync
npm run lint
node node_modules/svelte-check/bin/svelte-check --tsconfig ./tsconfig.json --threshold error --output human
node node_modules/typescript/bin/tsc -p scripts
node node_modules/vite/bin/vite.js build --logLevel warn
node node_modules/vitest/vitest.mjs run "$@"
