#!/bin/sh
# Installs the Debian packages listed in tests/setup/debian-packages.txt that are missing.
# Safe to run twice: when everything is present it does nothing (no apt-get update).
set -eu
here=$(cd "$(dirname "$0")" && pwd)
list="$here/debian-packages.txt"
missing=""
for pkg in $(grep -v '^[[:space:]]*#' "$list" | grep -v '^[[:space:]]*$'); do
  status=$(dpkg-query -W -f='${Status}' "$pkg" 2>/dev/null || true)
  case "$status" in
    *"install ok installed"*) ;;
    *) missing="$missing $pkg" ;;
  esac
done
if [ -z "$missing" ]; then
  exit 0
fi
echo "tidewright: installing missing Debian packages:$missing"
if [ "$(id -u)" -ne 0 ]; then
  echo "tidewright: error: packages missing:$missing; run this script as root (or install them with apt-get)" >&2
  exit 2
fi
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
# shellcheck disable=SC2086
apt-get install -y -qq --no-install-recommends $missing
