#!/bin/sh
# Install Rankwise into .venv inside this checkout, with what a bare Debian/Ubuntu lacks.
#   sh resources/install.sh          the program
#   sh resources/install.sh --test   the program and the test tools
set -eu
cd "$(dirname "$0")/.."

extras=""
case "${1:-}" in
  --test) extras="[test]" ;;
  "") ;;
  *) echo "install.sh: unknown option '$1' (use --test or nothing)" >&2; exit 2 ;;
esac

as_root() {
  if [ "$(id -u)" = 0 ]; then "$@";
  elif command -v sudo >/dev/null 2>&1; then sudo "$@";
  else echo "install.sh: please install as root: $*" >&2; return 1; fi
}

python=""
for candidate in python3.13 python3.12 python3.11 python3; do
  if command -v "$candidate" >/dev/null 2>&1 &&
     "$candidate" -c 'import sys; sys.exit(sys.version_info < (3, 11))' 2>/dev/null; then
    python="$candidate"; break
  fi
done
[ -n "$python" ] || { echo "install.sh: Rankwise needs Python 3.11 or newer." >&2; exit 1; }

# Debian packages: the libraries Qt loads (window and offscreen), the venv module, PDF tools.
missing=""
need_lib() { { ldconfig -p 2>/dev/null || /sbin/ldconfig -p 2>/dev/null; } | grep -q "$1" || missing="$missing $2"; }
need_lib libEGL.so.1 libegl1
need_lib libGL.so.1 libgl1
need_lib libxkbcommon.so.0 libxkbcommon0
need_lib libxkbcommon-x11.so.0 libxkbcommon-x11-0
need_lib libfontconfig.so.1 libfontconfig1
need_lib libdbus-1.so.3 libdbus-1-3
need_lib libglib-2.0.so.0 libglib2.0-0
need_lib libxcb-cursor.so.0 libxcb-cursor0
need_lib libxcb-icccm.so.4 libxcb-icccm4
need_lib libxcb-keysyms.so.1 libxcb-keysyms1
need_lib libxcb-shape.so.0 libxcb-shape0
need_lib libxcb-render-util.so.0 libxcb-render-util0
need_lib libxcb-image.so.0 libxcb-image0
"$python" -c 'import ensurepip, venv' 2>/dev/null || missing="$missing python3-venv"
[ -n "$extras" ] && { command -v pdftoppm >/dev/null 2>&1 || missing="$missing poppler-utils"; }
[ -n "$extras" ] && { command -v soffice >/dev/null 2>&1 || missing="$missing libreoffice-calc-nogui"; }
if [ -n "$missing" ] && command -v apt-get >/dev/null 2>&1; then
  echo "install.sh: installing system packages:$missing"
  as_root apt-get update -qq
  # shellcheck disable=SC2086
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq $missing >/dev/null
fi

[ -x .venv/bin/python ] || "$python" -m venv .venv
.venv/bin/python -m pip install -q --disable-pip-version-check --upgrade pip
.venv/bin/python -m pip install -q --disable-pip-version-check -e ".$extras"
echo "install.sh: Rankwise is installed in $(pwd)/.venv"
