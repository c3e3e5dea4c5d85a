# Shared by tools/*: installs the Debian packages qftplan needs (only those missing) and configures
# and builds a CMake tree. Source it; do not run it.

# Packages for building the library, the program and the test suite.
QFTPLAN_BUILD_PACKAGES=(cmake g++ make pkg-config libboost-graph-dev libeigen3-dev libyaml-cpp-dev libcli11-dev
  libfmt-dev nlohmann-json3-dev
  pybind11-dev python3-dev)  # the Python module (skipped by the build when these are missing)
QFTPLAN_TEST_PACKAGES=(libgtest-dev libfftw3-dev nodejs libbenchmark-dev
  librsvg2-bin libxml2-utils  # independent SVG renderer and XML checker used by the drawing tests
  python3-pytest python3-numpy python3-jsonschema python3-yaml)  # the Python module's tests, the schema checks, tools/noise-sim

# ensure_packages PKG...: apt-get installs the ones not yet installed (we run as root).
ensure_packages() {
  local missing=()
  local p
  for p in "$@"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
  done
  if ((${#missing[@]})); then
    echo "== installing: ${missing[*]}"
    local sudo=""
    [ "$(id -u)" = 0 ] || sudo="sudo"
    $sudo apt-get update -qq
    DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
  fi
}

# build_tree DIR BUILD_TYPE [CMAKE ARGS...]: configures (once) and builds with two jobs.
build_tree() {
  local dir=$1 type=$2
  shift 2
  cmake -S "$QFTPLAN_ROOT" -B "$dir" -DCMAKE_BUILD_TYPE="$type" "$@" >/dev/null
  cmake --build "$dir" -j2
}
