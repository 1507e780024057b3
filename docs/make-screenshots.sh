#!/usr/bin/env bash
# Regenerates the README's screenshots from the bundled samples: real ImageJ windows under a virtual
# display (Xvfb), captured by org.noisewise.docs.Screenshots. Needs: apt-get install xvfb xauth.
set -euo pipefail
cd "$(dirname "$0")/.."
mvn -B -q test-compile dependency:build-classpath -Dmdep.outputFile=target/cp.txt -Dmdep.includeScope=test
xvfb-run -a -s "-screen 0 1600x1200x24" \
  java -cp "target/classes:target/test-classes:$(cat target/cp.txt)" org.noisewise.docs.Screenshots docs/images
