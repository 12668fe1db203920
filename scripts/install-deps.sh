#!/usr/bin/env bash
# install-deps.sh installs the Debian packages rollerbed builds and tests
# against, and only those that are missing. It says what it installs.
#
#   libfftw3-dev   FFTW 3, the default transform backend (cgo)
#   libhdf5-dev    HDF5, for fields.h5 and checkpoints (cgo)
#   pkg-config     finds the two libraries' compiler flags
#   hdf5-tools     h5dump/h5ls, independent readers used by the tests
#   python3-h5py   a second independent reader used by the tests
#   netcdf-bin     ncdump, a netCDF reader used by the tests (dimension names)
#
# Run as root, or as a user who may use sudo.
set -euo pipefail

want=(libfftw3-dev libhdf5-dev pkg-config hdf5-tools python3-h5py netcdf-bin)
. "$(dirname "$0")/apt-lib.sh"
apt_missing "${want[@]}"
if [ ${#missing[@]} -eq 0 ]; then
	exit 0
fi
apt_root install-deps || exit 1

echo "install-deps: installing ${missing[*]}"
export DEBIAN_FRONTEND=noninteractive
$sudo apt-get update -qq
$sudo apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
echo "install-deps: done"
