#!/usr/bin/env bash
# Installs the given Debian packages when their programs are missing, so the README's test command does
# its own set-up on a fresh machine (as root there). All output goes to stderr.
#   deploy/ensure-packages.sh postgresql|chromium ...
set -euo pipefail
missing=()
for package in "$@"; do
  case "$package" in
    postgresql) ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || command -v initdb >/dev/null 2>&1 || missing+=(postgresql) ;;
    chromium) [ -x /usr/bin/chromium ] || missing+=(chromium) ;;
    *) dpkg -s "$package" >/dev/null 2>&1 || missing+=("$package") ;;
  esac
done
[ ${#missing[@]} -eq 0 ] && exit 0
if [ "$(id -u)" -ne 0 ] || ! command -v apt-get >/dev/null 2>&1; then
  echo "ensure-packages: missing ${missing[*]}; install them with: apt-get install -y ${missing[*]}" >&2
  exit 2
fi
echo "ensure-packages: installing ${missing[*]}" >&2
export DEBIAN_FRONTEND=noninteractive
apt-get update >&2
apt-get install -y "${missing[@]}" >&2
