#!/usr/bin/env bash
# install-slurm.sh installs Debian's Slurm (slurm-wlm: slurmctld, slurmd and
# the client commands sbatch, squeue, scancel) and munge, only when they are
# missing. The sweep tests start a one-node cluster of their own on
# 127.0.0.1 from these programs; nothing is configured or started here, and
# the system's own munge and slurm services are left stopped.
#
# Run as root, or as a user who may use sudo.
set -euo pipefail

want=(slurm-wlm munge)
. "$(dirname "$0")/apt-lib.sh"
apt_missing "${want[@]}"
if [ ${#missing[@]} -eq 0 ]; then
	exit 0
fi
apt_root install-slurm || exit 1

echo "install-slurm: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
# Keep the packages' own services from starting: the tests run their own
# daemons with their own configuration.
policy=""
if [ ! -e /usr/sbin/policy-rc.d ]; then
	policy=/usr/sbin/policy-rc.d
	printf '#!/bin/sh\nexit 101\n' | $sudo tee "$policy" >/dev/null
	$sudo chmod 755 "$policy"
fi
cleanup() { if [ -n "$policy" ]; then $sudo rm -f "$policy"; fi; }
trap cleanup EXIT
$sudo apt-get update -qq
$sudo apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
echo "install-slurm: done"
