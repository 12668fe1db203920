# apt-lib.sh: what the install scripts share. Source it, then call
#   apt_missing PACKAGE...   sets the array missing to those not installed
#   apt_root NAME            sets sudo to "" (root) or "sudo"; returns 1,
#                            saying why as NAME, when neither is possible
# Debian's dpkg-query says what is installed.

apt_missing() {
	missing=()
	local p
	for p in "$@"; do
		if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed'; then
			missing+=("$p")
		fi
	done
}

apt_root() {
	sudo=""
	if [ "$(id -u)" -ne 0 ]; then
		if command -v sudo >/dev/null 2>&1; then
			sudo="sudo"
		else
			echo "$1: need root or sudo to install: ${missing[*]}" >&2
			return 1
		fi
	fi
}
