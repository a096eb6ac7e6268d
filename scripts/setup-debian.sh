#!/usr/bin/env bash
# Installs everything lode needs to build and test on Debian 12 (bookworm),
# by package name from Debian's archive. Safe to run again.
set -euo pipefail

packages=(
  # build (python3 writes the manual page from the help text)
  build-essential cmake pkg-config python3
  # libraries
  libsqlite3-dev libcpp-httplib-dev nlohmann-json3-dev libstemmer-dev libicu-dev
  libcli11-dev libzstd-dev libxxhash-dev
  # screening: logistic regression
  liblinear-dev
  # document formats: PDF, HTML, zip containers (DOCX/ODT/EPUB), XML, mail, gzip
  libpoppler-cpp-dev libgumbo-dev libzip-dev libpugixml-dev libgmime-3.0-dev zlib1g-dev
  # tests: encrypted PDFs for the hostile-file set
  qpdf
  # tests: doctest, and outside references the tests compare against
  doctest-dev python3 python3-sklearn python3-scipy snowball-data
  # tests: the Debian package (dpkg-deb comes with dpkg; man renders the manual)
  man-db
  # tests: the web page in headless Chromium; bench: HTTP load generator
  chromium wrk
)

sudo=""
if [ "$(id -u)" -ne 0 ]; then sudo="sudo"; fi

missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -eq 0 ]; then
  echo "setup: all ${#packages[@]} Debian packages already installed"
  exit 0
fi
echo "setup: installing ${missing[*]}"
$sudo apt-get update -qq
DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "${missing[@]}"
