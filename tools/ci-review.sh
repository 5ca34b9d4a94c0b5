#!/usr/bin/env bash
# CI job for repositories that keep Caloris models (see docs/review.md).
#
#   tools/ci-review.sh [BASE_REV] [FOLDER...]
#
# 1. every *.heat file under the folders (default: the whole repository) is formatted,
#    checks cleanly and solves with every design limit holding;
# 2. with BASE_REV (e.g. origin/main in a pull request), writes caloris-review.md: for every
#    model changed since BASE_REV, the Markdown `caloris diff` to post as a review comment.
# Exit status: 0 all good, 1 something failed (the log says what).
set -u
caloris="${CALORIS:-caloris}"
base="${1:-}"
[ $# -gt 0 ] && shift
folders=("$@")
[ ${#folders[@]} -eq 0 ] && folders=(.)

mapfile -d '' models < <(find "${folders[@]}" -name '*.heat' -not -path '*/target/*' -not -path '*/.git/*' -print0 | sort -z)
status=0

if [ ${#models[@]} -gt 0 ]; then
    echo "== caloris fmt --check (${#models[@]} files)"
    "$caloris" fmt --check "${models[@]}" || status=1
fi

for m in "${models[@]}"; do
    echo "== $m"
    if ! "$caloris" check "$m"; then
        status=1
        continue
    fi
    "$caloris" solve "$m" >/dev/null
    code=$?
    if [ "$code" -eq 3 ]; then
        echo "design limit fails in $m:"
        "$caloris" solve "$m" | sed -n '/^Design limits/,/^$/p'
        status=1
    elif [ "$code" -ne 0 ]; then
        status=1
    fi
done

if [ -n "$base" ]; then
    out=caloris-review.md
    : >"$out"
    while IFS= read -r -d '' m; do
        if git cat-file -e "$base:$m" 2>/dev/null; then
            "$caloris" diff --rev "$base" "$m" --format markdown >>"$out"
        else
            printf '### New model: %s\n\n' "$m" >>"$out"
        fi
        printf '\n' >>"$out"
    done < <(git diff --name-only --diff-filter=AM -z "$base" -- '*.heat')
    echo "== review comment written to $out"
fi
exit "$status"
