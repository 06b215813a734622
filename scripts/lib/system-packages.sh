#!/usr/bin/env bash
# Makes sure the Debian packages Wrenchroll needs are installed. As root it installs the missing
# ones with apt-get; otherwise it stops and prints the command to run as root. Used by npm start
# (scripts/start.ts) and npm test (scripts/test-all.sh), so the check is written once.
#
# Usage: bash scripts/lib/system-packages.sh "<command that needs them>" <package>...
# Packages: postgresql, chromium, ffmpeg. Exits 0 when all are there (or were just installed).
#
# Settings:
#   WRENCHROLL_INSTALL_PACKAGES=no  never run apt-get, even as root: only say what to install
#   WRENCHROLL_SYSTEM_ROOT=DIR      look for the packages' files under DIR instead of / (the tests
#                                   point it at a folder of their own to play a fresh machine)
#   CHROMIUM_PATH, FFPROBE_PATH     where Chromium and ffprobe are, as the tests and server read them
# Only shell builtins are used for the checks, so a test can run this with PATH set to one folder.
set -euo pipefail

if [ $# -lt 2 ]; then
	echo 'usage: system-packages.sh "<command>" <package>...' >&2
	exit 2
fi
needed_by=$1
shift
system_root=${WRENCHROLL_SYSTEM_ROOT:-}

# Why each package is needed, in one phrase.
reason() {
	case $1 in
	postgresql) echo 'the database server' ;;
	chromium) echo 'the headless browser for the browser tests' ;;
	ffmpeg) echo 'ffprobe reads the duration, frame rate and codec of footage' ;;
	esac
}

# Whether a package is installed: PostgreSQL as .ci/run always found it (pg_ctl on PATH or in
# Debian's versioned folders), the others by the files the tests and the server run.
installed() {
	case $1 in
	postgresql)
		command -v pg_ctl >/dev/null 2>&1 && return 0
		local pg_ctl
		for pg_ctl in "$system_root"/usr/lib/postgresql/*/bin/pg_ctl; do
			[ -x "$pg_ctl" ] && return 0
		done
		return 1
		;;
	chromium) [ -x "${CHROMIUM_PATH:-$system_root/usr/bin/chromium}" ] ;;
	ffmpeg) [ -x "${FFPROBE_PATH:-$system_root/usr/bin/ffprobe}" ] && [ -x "$system_root/usr/bin/ffmpeg" ] ;;
	*)
		echo "system-packages.sh: no check for a package named '$1'" >&2
		exit 2
		;;
	esac
}

missing=()
for package in "$@"; do
	installed "$package" || missing+=("$package")
done
[ ${#missing[@]} -eq 0 ] && exit 0

described=()
summary=''
for package in "${missing[@]}"; do
	described+=("$package ($(reason "$package"))")
	summary+="${summary:+, }$package ($(reason "$package"))"
done
install_command="apt-get update && apt-get install -y --no-install-recommends ${missing[*]}"

if [ "$EUID" -eq 0 ] && [ "${WRENCHROLL_INSTALL_PACKAGES:-yes}" != no ] &&
	command -v apt-get >/dev/null 2>&1; then
	echo "$needed_by: installing Debian packages with apt-get: $summary"
	export DEBIAN_FRONTEND=noninteractive
	apt-get update -qq
	apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
	for package in "${missing[@]}"; do
		if ! installed "$package"; then
			echo "$needed_by: apt-get installed $package, but it is still not found; see the output above." >&2
			exit 1
		fi
	done
	exit 0
fi

{
	echo
	echo "$needed_by needs Debian packages that are not installed:"
	for line in "${described[@]}"; do echo "  $line"; done
	if [ "$EUID" -eq 0 ] && ! command -v apt-get >/dev/null 2>&1; then
		echo "apt-get is not available here: install them with this system's package manager,"
		echo "then run $needed_by again."
	else
		echo "Install them as root, then run $needed_by again:"
		echo
		echo "  $install_command"
	fi
	echo
} >&2
exit 1
