#!/bin/sh
# verify.sh checks the echarts runtime committed in this folder against PROVENANCE.
#
#   verify.sh            check the committed files' sha256, then download the pinned npm
#                        package again (npm pack), check its sha512 against the registry's
#                        recorded integrity and check the committed files are byte-identical
#                        to the ones inside it
#   verify.sh --offline  only check the committed files' sha256 (no network)
#
# Exit status 0 when everything matches, 1 on any mismatch, 2 on a usage error.
set -eu

here=$(cd "$(dirname "$0")" && pwd)
prov="$here/PROVENANCE"

value() {
	v=$(grep -E "^$1=" "$prov" | head -n 1 | cut -d= -f2-)
	if [ -z "$v" ]; then
		echo "verify.sh: $prov: no value for $1" >&2
		exit 1
	fi
	printf '%s' "$v"
}

check_sum() { # file expected-sha256
	got=$(sha256sum "$1" | cut -d' ' -f1)
	if [ "$got" != "$2" ]; then
		echo "verify.sh: $1: sha256 $got, PROVENANCE says $2" >&2
		exit 1
	fi
}

offline=0
case "${1:-}" in
"") ;;
--offline) offline=1 ;;
*)
	echo "usage: verify.sh [--offline]" >&2
	exit 2
	;;
esac

for f in echarts.min.js LICENSE.echarts NOTICE.echarts; do
	check_sum "$here/$f" "$(value "$f.sha256")"
done
echo "verify.sh: committed files match PROVENANCE"
[ "$offline" = 1 ] && exit 0

pkg=$(value package)
ver=$(value version)
want=$(value integrity)
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
(cd "$tmp" && npm pack --silent "$pkg@$ver" >/dev/null)
tgz="$tmp/$pkg-$ver.tgz"
got="sha512-$(openssl dgst -sha512 -binary "$tgz" | base64 | tr -d '\n')"
if [ "$got" != "$want" ]; then
	echo "verify.sh: $pkg@$ver: downloaded integrity $got, PROVENANCE says $want" >&2
	exit 1
fi
tar -xzf "$tgz" -C "$tmp" package/dist/echarts.min.js package/LICENSE package/NOTICE
cmp "$tmp/package/dist/echarts.min.js" "$here/echarts.min.js"
cmp "$tmp/package/LICENSE" "$here/LICENSE.echarts"
cmp "$tmp/package/NOTICE" "$here/NOTICE.echarts"
echo "verify.sh: $pkg@$ver from the registry matches its integrity and the committed files"
